import { describe, expect, it } from 'vitest';
import { compileSpec } from '../../src/render/renderSpec.js';
import { cellMapSpec, cellRecords } from '../../src/report/cellMapSpec.js';
import { modelMapFixture } from './fixtures.js';

type Layer = { data: { values: Record<string, number>[] }; mark: { type: string } };

describe('cellMapSpec', () => {
  it('compiles without vega-lite warnings', async () => {
    const { map, ridge } = modelMapFixture();
    const { warnings } = await compileSpec(cellMapSpec(map, ridge));
    expect(warnings).toEqual([]);
  });

  it('draws each measured cell between its geometric-midpoint edges and tags it with its record index', () => {
    const { map, ridge } = modelMapFixture();
    const spec = cellMapSpec(map, ridge) as unknown as { layer: Layer[] };
    const rects = spec.layer[0].data.values;
    const recs = cellRecords(map);
    expect(rects).toHaveLength(17);
    // Width 64 sits between √(32·64) and √(64·128) (DESIGN.md §5: cell edges at geometric midpoints).
    const r = recs.find((c) => c.x === 64 && c.y === 1000)!;
    expect(r.x0).toBeCloseTo(Math.sqrt(32 * 64), 12);
    expect(r.x1).toBeCloseTo(Math.sqrt(64 * 128), 12);
    expect(rects[r.cell]).toMatchObject({ cell: r.cell, x0: r.x0, x1: r.x1, mean: r.mean });
    expect(r.runs).toEqual(['w64-e1000-s0', 'w64-e1000-s1', 'w64-e1000-s2']);
  });

  it('names the colour scale with the metric\'s label and formats it as the static figures do', () => {
    const { map, ridge } = modelMapFixture();
    const spec = JSON.stringify(cellMapSpec(map, ridge));
    expect(spec).toContain('"title":"test error (mean of seeds)"');
    expect(spec).not.toContain('"title":"test_error"');
    expect(spec).toMatch(/"legend":\{"format":"\.[01]%"\}/);
  });

  it('breaks the ridge line where a row has no significant peak', () => {
    const { map, ridge } = modelMapFixture();
    // Peaks at epochs 100 and 1000 only; drop the middle one: two separate stretches.
    ridge.rows[1].peak = null;
    ridge.rows[0].peak = { ...ridge.rows[2].peak! };
    const spec = cellMapSpec(map, ridge) as unknown as { layer: Layer[] };
    const line = spec.layer.find((l) => l.mark.type === 'line' && l.data.values[0]?.low !== undefined)!;
    const runs = new Set(line.data.values.map((v) => v.run));
    expect(runs.size).toBe(2);
  });
});
