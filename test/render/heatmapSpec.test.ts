import { describe, expect, it } from 'vitest';
import type { TopLevelSpec } from 'vega-lite';
import { facetHeatmapSpec, heatmapSpec, sharedDomain } from '../../src/render/heatmapSpec.js';
import { slicesSpec, pickSliceRows } from '../../src/render/slicesSpec.js';
import { compileSpec, renderSpec } from '../../src/render/renderSpec.js';
import { fixtureMap, fixtureRidge } from './mapFixture.js';
import { vegaLiteValidator } from './specSchema.js';

const gappy = () => {
  const map = fixtureMap({ missing: [[2, 3], [7, 5], [8, 5]], diverged: [[4, 6], [7, 5]] });
  return { map, ridge: fixtureRidge(map, { noPeak: [0, 4], weak: [6] }) };
};

/** The `<g class="mark-… role-mark NAME_marks">` groups of a layer, with their contents. */
function markGroups(svg: string, name: string): string[] {
  const out: string[] = [];
  const re = new RegExp(`<g class="mark-[a-z]+ role-mark ${name}_marks"[^>]*>(.*?)</g>`, 'g');
  for (const m of svg.matchAll(re)) out.push(m[1]);
  return out;
}

/** Points of an SVG path made of M/L commands. */
function pathPoints(d: string): [number, number][] {
  return [...d.matchAll(/[ML]([-\d.]+),([-\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
}

function specs(): Record<string, TopLevelSpec> {
  const { map, ridge } = gappy();
  const one = fixtureMap({ seeds: 1 });
  return {
    cells: heatmapSpec(map, ridge),
    raster: heatmapSpec(map, ridge, { raster: true, colors: 'cividis' }),
    noRidge: heatmapSpec(map, null),
    bigCells: heatmapSpec(fixtureMap({ nx: 60, ny: 60, rasterN: 10 }), null),
    facets: facetHeatmapSpec([
      { map, ridge, label: 'label noise 0.2' },
      { map: one, ridge: fixtureRidge(one, { curve: true }), label: 'label noise 0' },
    ]),
    slices: slicesSpec(map, ridge, { rows: [1, 100, 4000] }),
  };
}

describe('heatmap and slices specs', () => {
  const all = specs();

  it('every spec validates against the vega-lite JSON schema', () => {
    const validate = vegaLiteValidator();
    for (const [name, spec] of Object.entries(all)) {
      const ok = validate(JSON.parse(JSON.stringify(spec)));
      expect({ name, errors: ok ? null : validate.errors?.slice(0, 3) }).toEqual({ name, errors: null });
    }
    // The validator rejects a broken spec, so the check above can fail.
    expect(validate({ mark: 'no-such-mark' })).toBe(false);
  }, 60_000);

  it('every spec compiles without warnings', async () => {
    for (const [name, spec] of Object.entries(all)) {
      expect({ name, warnings: (await compileSpec(spec)).warnings }).toEqual({ name, warnings: [] });
    }
  });

  it('draws one shape per measured and missing cell, with titles, units and fixed values', async () => {
    const { map } = gappy();
    const svg = (await renderSpec(all.cells, { format: 'svg' })) as string;
    const cells = markGroups(svg, 'cells');
    expect(cells).toHaveLength(1);
    expect(cells[0].match(/<path/g)).toHaveLength(map.cells.length);
    expect(markGroups(svg, 'missing')[0].match(/<path/g)).toHaveLength(3);
    expect(markGroups(svg, 'missingMarks')[0].match(/<path/g)).toHaveLength(3);
    expect(markGroups(svg, 'diverged')[0].match(/<path/g)).toHaveLength(2);
    expect(svg).toContain('width (model size, log scale)');
    expect(svg).toContain('epochs (log scale)');
    expect(svg).toContain('train size 4000 (most data) · label noise 0.2 · 3 seeds per cell · method gp');
    // Powers of two for width (the brief: readable ticks).
    for (const t of ['>2<', '>8<', '>32<', '>128<', '>512<']) expect(svg).toContain(t);
    // Key explains every mark drawn, and flags the weak peak (prominence 1.4 SE in row 6).
    expect(svg).toContain('missing cell, no finished run (3)');
    expect(svg).toContain('diverged run(s)');
    expect(svg).toContain('warning: not significant (prominence &lt; 2 standard errors)');
    expect(svg).toContain('epochs 1248');
  });

  it('draws the ridge through the analysis peaks, with a gap where a row has none', async () => {
    const { map, ridge } = gappy();
    const svg = (await renderSpec(all.cells, { format: 'svg' })) as string;
    // Rows 0 and 4 have no peak: rows 1–3 and 5–7 form two separate paths.
    const groups = markGroups(svg, 'ridge');
    const paths = groups.flatMap((g) => [...g.matchAll(/ d="([^"]+)"/g)].map((m) => pathPoints(m[1])));
    expect(paths.map((p) => p.length).sort()).toEqual([3, 3]);
    // Pixel position of each peak on the log2 axes (plot 460 × 340, domain = outer cell edges).
    const W = 460;
    const H = 340;
    const lx = (v: number) => (W * (Math.log2(v) - Math.log2(map.x.edges[0]))) / (Math.log2(map.x.edges.at(-1)!) - Math.log2(map.x.edges[0]));
    const ly = (v: number) => H - (H * (Math.log2(v) - Math.log2(map.y.edges[0]))) / (Math.log2(map.y.edges.at(-1)!) - Math.log2(map.y.edges[0]));
    const expected = ridge.rows.filter((r) => r.peak).map((r) => [lx(r.peak!.x), ly(r.y)]);
    const drawn = paths.flat().sort((a, b) => b[1] - a[1]);
    expect(drawn).toHaveLength(expected.length);
    drawn.forEach(([x, y], k) => {
      expect(x).toBeCloseTo(expected[k][0], 1);
      expect(y).toBeCloseTo(expected[k][1], 1);
    });
  });

  it('puts a raster into SVG as one embedded image, not a path per cell', async () => {
    const svg = (await renderSpec(all.raster, { format: 'svg' })) as string;
    expect(markGroups(svg, 'cells')).toHaveLength(0);
    expect(markGroups(svg, 'image')[0].match(/<image/g)).toHaveLength(1);
    expect(svg).toContain('hatched: interpolated by gp');
    const big = (await renderSpec(all.bigCells, { format: 'svg' })) as string;
    expect(markGroups(big, 'image')[0].match(/<image/g)).toHaveLength(1);
    expect(big.length).toBeLessThan(2_000_000);
  });

  it('shares one colour domain across facets and warns about curve-noise intervals', async () => {
    const { map } = gappy();
    const one = fixtureMap({ seeds: 1 });
    const expected = sharedDomain([{ map, ridge: null, label: '' }, { map: one, ridge: null, label: '' }], false);
    const json = JSON.stringify(all.facets);
    expect(json).toContain(`"domain":[${expected[0]},${expected[1]}]`);
    const lo = Math.min(...[...map.cells, ...one.cells].map((c) => c.cell.stats.mean));
    expect(expected[0]).toBe(lo);
    const svg = (await renderSpec(all.facets, { format: 'svg' })) as string;
    expect(svg).toContain('label noise 0.2');
    expect(svg).toContain('label noise 0');
    expect(svg).toMatch(/warning: one seed per cell: peak interval from curve noise/);
    expect(markGroups(svg, 'cells')).toHaveLength(2);
    expect(svg).toContain('1–3 seeds per cell');
  });

  it('says when no ridge was computed', async () => {
    const svg = (await renderSpec(all.noRidge, { format: 'svg' })) as string;
    expect(svg).toContain('warning: ridge not computed');
    expect(markGroups(svg, 'ridge')).toHaveLength(0);
  });

  it('slices: one test and one train line per row, a band per row, peaks marked', async () => {
    const { map, ridge } = gappy();
    const rows = pickSliceRows(map, [1, 100, 4000]);
    expect(rows).toEqual([map.y.values[0], map.y.values[4], map.y.values[7]]);
    const svg = (await renderSpec(all.slices, { format: 'svg' })) as string;
    // Rows 0 and 4 have no peak in the fixture: only row 7's peak is marked.
    const peaks = ridge.rows.filter((r) => rows.includes(r.y) && r.peak).length;
    expect(markGroups(svg, 'peaks')[0].match(/<path/g)).toHaveLength(peaks);
    expect(svg).toContain('train error');
    expect(svg).toContain('band: 95% Student-t interval');
  });

  it('slices: a smoothed-curve row draws its smooth beside the points and says the peak rests on one seed and a smooth', async () => {
    const { map, ridge } = gappy();
    const rows = pickSliceRows(map, [4000]);
    const r = ridge.rows.find((x) => x.y === rows[0])!;
    expect(r.peak).not.toBeNull();
    r.model = 'smoothed-curve';
    r.noiseFrom = 'curve';
    r.smooth = { x: map.x.values.slice(), y: map.x.values.map((_, i) => 0.3 + 0.01 * i) };
    const spec = slicesSpec(map, ridge, { rows });
    expect(vegaLiteValidator()(JSON.parse(JSON.stringify(spec)))).toBe(true);
    const svg = (await renderSpec(spec, { format: 'svg' })) as string;
    const smooth = markGroups(svg, 'smooth');
    expect(smooth).toHaveLength(1);
    expect(pathPoints(smooth[0].match(/d="([^"]+)"/)![1])).toHaveLength(map.x.values.length);
    expect(svg).toContain('thick pale line: the curve smoothed on the log axis');
    expect(svg).toContain('peak rests on one seed and a smoothed curve');
  });
});
