import { describe, expect, it } from 'vitest';
import { heatmapSpec } from '../../src/render/heatmapSpec.js';
import { pickSliceRows, slicesSpec } from '../../src/render/slicesSpec.js';
import { renderSpec } from '../../src/render/renderSpec.js';
import { thresholdText } from '../../src/report/reportTables.js';
import type { SweepMap } from '../../src/grid/SweepMap.js';
import type { RidgeResult } from '../../src/analysis/Ridge.js';
import { fixtureMap, fixtureRidge } from './mapFixture.js';

/** The fixture read as a sample-wise map: x = train size, where the threshold is the largest n that fits. */
function sampleWise(): { map: SweepMap; ridge: RidgeResult } {
  const m = fixtureMap();
  const map: SweepMap = { ...m, kind: 'sample', x: { ...m.x, name: 'train_size' } };
  const r = fixtureRidge(m, { noPeak: [0, 1, 2, 3, 4, 5, 6] });
  return { map, ridge: { ...r, x: 'train_size' } };
}

/** The key's lines (wrapped to the figure's width) joined back into one text. */
const keyText = (spec: string) => [...spec.matchAll(/"text":"([^"]*)"/g)].map((m) => m[1]).join(' ').replace(/\s+/g, ' ');

describe('the threshold along train size', () => {
  it('is named the largest train size that fits, and a bound at the edge is not drawn as measured', async () => {
    const { map, ridge } = sampleWise();
    const edgeAt = map.x.values[map.x.values.length - 1];
    // Every row but two reaches epsilon only at the sweep's edge (Nakkiran et al. 2019, EMC: the largest n fitted).
    const rows = ridge.rows.map((r, i) => (i < 2 ? { ...r, threshold: map.x.values[3] } : { ...r, threshold: edgeAt, thresholdAtEdge: true }));
    // The key's text (it wraps over lines in the image, so read it from the spec); the figure renders.
    const spec = JSON.stringify(heatmapSpec(map, { ...ridge, rows }));
    expect(keyText(spec)).toContain('largest train size with mean train error ≤ 1%');
    expect(keyText(spec)).not.toContain('smallest train size');
    expect(keyText(spec)).toContain(`lies at or beyond the sweep's edge (≥ ${edgeAt}): not drawn`);
    expect(((await renderSpec(heatmapSpec(map, { ...ridge, rows }), { format: 'svg' })) as string).length).toBeGreaterThan(1000);
    // Only the two measured thresholds are drawn (one line of two points).
    expect((spec.match(/"layer":"threshold"/g) ?? []).length).toBe(2);
    // All at the edge: nothing drawn, the key says why.
    const allEdge = rows.map((r) => ({ ...r, threshold: edgeAt, thresholdAtEdge: true }));
    expect(keyText(JSON.stringify(heatmapSpec(map, { ...ridge, rows: allEdge })))).toContain("at or beyond the sweep's edge in");
    expect(JSON.stringify(heatmapSpec(map, { ...ridge, rows: allEdge }))).not.toContain('"layer":"threshold');
  });

  it('tables print the bound: "≥ 512 (at the edge)"', () => {
    expect(thresholdText({ threshold: 512, thresholdAtEdge: true }, 'train_size')).toBe('≥ 512 (at the edge)');
    expect(thresholdText({ threshold: 4, thresholdAtEdge: true }, 'width')).toBe('≤ 4 (at the edge)');
    expect(thresholdText({ threshold: 300.4, thresholdAtEdge: false }, 'train_size')).toBe('300');
    expect(thresholdText({ threshold: null }, 'train_size')).toBe('–');
  });
});

describe('sample-wise slices', () => {
  it('go through the rows with peaks when none are asked for', () => {
    const m = fixtureMap();
    const ys = m.y.values;
    // Peaks only in rows 5..8 (the fixture's late epochs): the slices show those rows.
    const ridge = fixtureRidge(m, { noPeak: ys.map((_, i) => i).filter((i) => i < 5) });
    const peaked = ridge.rows.filter((r) => r.peak !== null).map((r) => r.y);
    const rows = pickSliceRows(m, undefined, ridge);
    expect(rows.length).toBeGreaterThanOrEqual(2);
    for (const y of rows) expect(peaked).toContain(y);
    // One peaked row: it is among the rows shown, topped up with spread rows.
    const one = fixtureRidge(m, { noPeak: ys.map((_, i) => i).filter((i) => i !== 3) });
    expect(pickSliceRows(m, undefined, one)).toContain(ys[3]);
    // Without a ridge: rows spread over the axis, as before.
    expect(pickSliceRows(m)).toHaveLength(4);
  });

  it('rows asked for that miss the peaks say where the peaks are, not that there are none', async () => {
    const m = fixtureMap();
    const ys = m.y.values;
    const ridge = fixtureRidge(m, { noPeak: [0, 1] });
    const svg = (await renderSpec(slicesSpec(m, ridge, { rows: [ys[0], ys[1]] }), { format: 'svg' })) as string;
    expect(svg).not.toContain('no significant peak in any row');
    expect(svg).toContain('no significant peak in the rows shown; the peaks are at epochs');
  });
});
