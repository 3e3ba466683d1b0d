import { describe, expect, it } from 'vitest';
import { buildMap } from '../../src/grid/buildMap.js';
import { mapToJson } from '../../src/grid/mapJson.js';
import { ORIGIN_INTERPOLATED, ORIGIN_MEASURED, ORIGIN_OUTSIDE } from '../../src/grid/SweepMap.js';
import type { RowRecord } from '../../src/store/tableFromRows.js';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import { UserError } from '../../src/UserError.js';
import { fixedLine } from '../../src/render/axisText.js';

const WIDTHS = [4, 8, 16, 32, 64, 128];
const EPOCHS = [1, 10, 100, 1000];
/** A smooth model-wise surface with a bump at width 16 that grows with epochs (own toy function). */
const surface = (w: number, e: number, noise: number) => 0.4 - 0.03 * Math.log2(w) + (0.05 + noise) * Math.log10(e) * Math.exp(-((Math.log2(w) - 4) ** 2));

function sweep(opts: { noises?: number[]; seeds?: number; skip?: (w: number, e: number) => boolean; sizes?: number[] } = {}): Partial<RowRecord>[] {
  const rows: Partial<RowRecord>[] = [];
  let r = 0;
  for (const noise of opts.noises ?? [0, 0.2])
    for (const n of opts.sizes ?? [1000])
      for (const w of WIDTHS)
        for (let s = 0; s < (opts.seeds ?? 3); s++) {
          r++;
          for (const e of EPOCHS) {
            if (opts.skip?.(w, e)) continue;
            rows.push({ run: `r${r}`, seed: s, width: w, epochs: e, train_size: n, label_noise: noise, test_error: surface(w, e, noise) + 0.004 * (s - 1), train_error: 0.01 });
          }
        }
  return rows;
}

describe('buildMap', () => {
  it('model map: axes, log2 scales, geometric edges, picked fixed values (most data, ties to the largest)', () => {
    const map = buildMap(tableFromRows(sweep()), { kind: 'model', method: 'linear', raster: { nx: 20, ny: 10 } });
    expect(map.kind).toBe('model');
    expect(map.x).toMatchObject({ name: 'width', scale: 'log2', values: WIDTHS });
    expect(map.y).toMatchObject({ name: 'epochs', scale: 'log2', values: EPOCHS });
    expect(map.x.edges[1]).toBeCloseTo(Math.sqrt(4 * 8), 12);
    expect(map.fixed).toEqual({ label_noise: 0.2, train_size: 1000 });
    // train_size has a single value (1000): it is fixed, but nothing was picked.
    expect(map.picked).toEqual(['label_noise']);
    // Noise 0 and 0.2 hold as many rows: 0.2 is only the tie-break, and the map says so.
    expect(map.pickedTies).toEqual({ label_noise: 2 });
    expect(fixedLine(map)).toContain('label noise 0.2 (largest of 2 levels with equal data)');
    expect(fixedLine(map)).toMatch(/train size 1000(?! \()/);
    expect(fixedLine(map)).not.toContain('most data');
    expect(map.cells).toHaveLength(24);
    expect(map.missing).toEqual([]);
    expect(map.raster.value).toHaveLength(200);
    expect(map.raster.xs[0]).toBeCloseTo(4, 12);
    expect(map.raster.xs[19]).toBeCloseTo(128, 12);
    // Every raster point of a complete grid lies in a measured cell.
    expect([...map.raster.origin].every((o) => o === ORIGIN_MEASURED)).toBe(true);
    const c = map.cells.find((m) => m.x === 16 && m.y === 1000)!;
    expect(c.cell.stats.mean).toBeCloseTo(surface(16, 1000, 0.2), 12);
    expect(c.cell.stats.n).toBe(3);
  });

  it('respects --at values, which are then not "picked"; prefers the value with most rows', () => {
    const rows = sweep({ noises: [0, 0.2] }).filter((r) => !(r.label_noise === 0.2 && r.width === 4));
    const t = tableFromRows(rows);
    expect(buildMap(t, { method: 'linear' }).fixed.label_noise).toBe(0);
    const given = buildMap(t, { method: 'linear', at: { label_noise: 0.2 } });
    expect(given.fixed.label_noise).toBe(0.2);
    expect(given.picked).toEqual([]);
    // A real majority is no tie.
    expect(buildMap(t, { method: 'linear' }).pickedTies).toEqual({});
  });

  it('lists missing grid points and diverged points, and marks the raster over them as interpolated', () => {
    // Width-16 runs stopped at epoch 100: (16, 1000) is missing (a gap inside a run would be aligned instead).
    const rows = sweep({ noises: [0.2], skip: (w, e) => w === 16 && e === 1000 });
    rows.push({ run: 'bad', seed: 9, width: 32, epochs: 10, train_size: 1000, label_noise: 0.2, test_error: NaN, status: 'diverged' });
    const map = buildMap(tableFromRows(rows), { kind: 'model', method: 'thin-plate', raster: { nx: 64, ny: 64 } });
    expect(map.missing).toEqual([{ x: 16, y: 1000 }]);
    // Divergence is terminal: the run counts as diverged at every later epoch of the map too.
    expect(map.diverged).toEqual([
      { x: 32, y: 10, count: 1 },
      { x: 32, y: 100, count: 1 },
      { x: 32, y: 1000, count: 1 },
    ]);
    const cell = map.cells.find((m) => m.x === 32 && m.y === 10)!;
    expect(cell.cell.stats.n).toBe(3);
    expect(cell.cell.diverged).toBe(1);
    // The raster point nearest (16, 1000) is inside the missing cell: interpolated, with a finite value.
    const i = map.raster.xs.reduce((b, x, k) => (Math.abs(Math.log2(x / 16)) < Math.abs(Math.log2(map.raster.xs[b] / 16)) ? k : b), 0);
    const j = map.raster.ys.reduce((b, y, k) => (Math.abs(Math.log2(y / 1000)) < Math.abs(Math.log2(map.raster.ys[b] / 1000)) ? k : b), 0);
    expect(map.raster.origin[j * 64 + i]).toBe(ORIGIN_INTERPOLATED);
    expect(Number.isFinite(map.raster.value[j * 64 + i])).toBe(true);
  });

  it('linear leaves the raster outside the hull empty and says so in the origin codes', () => {
    const rows = sweep({ noises: [0.2], skip: (w, e) => w === 128 && e === 1000 });
    const map = buildMap(tableFromRows(rows), { method: 'linear', raster: { nx: 32, ny: 32 } });
    const k = 31 * 32 + 31; // corner (128, 1000): the missing cell, outside the hull of the rest
    expect(map.raster.value[k]).toBeNaN();
    expect(map.raster.origin[k]).toBe(ORIGIN_OUTSIDE);
  });

  it('auto reports the leave-one-out error of every method tried and uses the lowest', () => {
    const map = buildMap(tableFromRows(sweep({ noises: [0.2] })), { raster: { nx: 16, ny: 16 } });
    const tried = map.loo.tried;
    expect(Object.keys(tried).sort()).toEqual(['gp', 'linear', 'thin-plate']);
    const best = Math.min(...Object.values(tried).map(Number));
    expect(map.loo.rmse).toBe(best);
    expect(tried[map.method]).toBe(best);
    expect(map.raster.sd === null).toBe(map.method !== 'gp');
  });

  it('gp gives a standard-deviation field', () => {
    const map = buildMap(tableFromRows(sweep({ noises: [0.2] })), { method: 'gp', raster: { nx: 16, ny: 16 } });
    expect(map.raster.sd).not.toBeNull();
    expect([...map.raster.sd!].every((s) => Number.isFinite(s) && s >= 0)).toBe(true);
    expect(map.fit?.lx).toBeGreaterThan(0);
  });

  it('lists an axis as picked only when the slice offers more than one value of it', () => {
    const one = buildMap(tableFromRows(sweep({ noises: [0.1] })), { method: 'linear' });
    expect(one.fixed).toEqual({ label_noise: 0.1, train_size: 1000 });
    expect(one.picked).toEqual([]);
    expect(one.pickedTies).toEqual({});
    expect(fixedLine(one)).not.toMatch(/most data|largest of/);
    // Two train sizes, the larger with more runs: now a real pick, by most data.
    const two = buildMap(tableFromRows([...sweep({ noises: [0.1], sizes: [500] }).filter((r) => r.width !== 4).map((r) => ({ ...r, run: `n500-${r.run}` })), ...sweep({ noises: [0.1] })]), { method: 'linear' });
    expect(two.fixed.train_size).toBe(1000);
    expect(two.picked).toEqual(['train_size']);
    expect(fixedLine(two)).toContain('train size 1000 (most data)');
  });

  it('any pair of axes: width × label_noise with epochs picked, label_noise linear', () => {
    const map = buildMap(tableFromRows(sweep({ noises: [0, 0.1, 0.2] })), { x: 'width', y: 'label_noise', method: 'linear', raster: { nx: 8, ny: 8 } });
    expect(map.kind).toBe('custom');
    expect(map.y).toMatchObject({ name: 'label_noise', scale: 'linear', values: [0, 0.1, 0.2] });
    expect(map.fixed).toEqual({ train_size: 1000, epochs: 1000 });
  });

  it('aligns runs logged at different epochs to the map’s epochs, never past their ends', () => {
    const rows = sweep({ noises: [0.2], seeds: 1 }).filter((r) => !(r.width === 64 && r.epochs === 1000));
    const map = buildMap(tableFromRows(rows), { method: 'linear', at: { epochs: 1000 }, x: 'width', y: 'label_noise' });
    expect(map.x.values).toEqual([4, 8, 16, 32, 128]);
    expect(map.notes!.join(' ')).toMatch(/1 run\(s\) end before epoch 1000/);
    const mid = buildMap(tableFromRows(rows), { method: 'linear', at: { epochs: 300 }, x: 'width', y: 'train_size' });
    // 300 lies between logged 100 and 1000: log-epoch interpolation along each run.
    const c = mid.cells.find((m) => m.x === 8)!;
    const w = Math.log(3);
    const expected = surface(8, 100, 0.2) + (w / Math.log(10)) * (surface(8, 1000, 0.2) - surface(8, 100, 0.2)) - 0.004;
    expect(c.cell.stats.mean).toBeCloseTo(expected, 12);
  });

  it('keeps epoch 0 off a log2 epochs axis and says so', () => {
    const rows = sweep({ noises: [0.2] });
    for (const r of sweep({ noises: [0.2] }).filter((x) => x.epochs === 1)) rows.push({ ...r, epochs: 0, test_error: 0.5 });
    const map = buildMap(tableFromRows(rows), { method: 'linear' });
    expect(map.y.scale).toBe('log2');
    expect(map.y.values[0]).toBe(1);
    expect(map.notes!.join(' ')).toMatch(/epochs <= 0 left out/);
  });

  it('rejects bad requests with clear errors', () => {
    const t = tableFromRows(sweep());
    expect(() => buildMap(t, { at: { width: 8 } })).toThrow(/axis of this map/);
    expect(() => buildMap(t, { at: { width: 8 } })).toThrow(UserError);
    expect(() => buildMap(t, { at: { label_noise: 0.5 } })).toThrow(/no rows with label_noise=0.5; values present: 0, 0.2/);
    expect(() => buildMap(t, { x: 'depth' })).toThrow(/unknown axis 'depth'/);
    expect(() => buildMap(t, { x: 'epochs', y: 'epochs' })).toThrow(/two different axes/);
    expect(() => buildMap(t, { metric: 'test_loss' })).toThrow(/no row has a finite test_loss/);
  });

  it('serialises to JSON with typed arrays as arrays and NaN as null (CONTRACTS.md map file)', () => {
    const rows = sweep({ noises: [0.2], skip: (w, e) => w === 128 && e === 1000 });
    const map = buildMap(tableFromRows(rows), { method: 'linear', raster: { nx: 8, ny: 8 } });
    const back = JSON.parse(mapToJson(map, { ridge: null }));
    expect(back.raster.value).toHaveLength(64);
    expect(back.raster.value[63]).toBeNull();
    expect(back.raster.origin[0]).toBe(ORIGIN_MEASURED);
    expect(back.ridge).toBeNull();
    expect(back.x.values).toEqual(WIDTHS);
  });
});

describe('buildMap with condition keys (ingest writes conditions as sorted key=value pairs)', () => {
  // Own toy sweep: error falls with weight decay; two optimizers.
  const rows: Partial<RowRecord>[] = [];
  let r = 0;
  for (const opt of ['adam', 'sgd'])
    for (const wd of [0, 0.001, 0.01, 0.1])
      for (const w of [8, 16, 32, 64])
        for (const seed of [0, 1]) {
          r++;
          rows.push({ run: `c${r}`, seed, width: w, epochs: 100, train_size: 1000, condition: `optimizer=${opt},weight_decay=${wd}`, test_error: 0.3 - wd - 0.01 * Math.log2(w) + (opt === 'sgd' ? 0.05 : 0) + 0.001 * seed });
        }
  const t = tableFromRows(rows);

  it('maps a numeric condition key as an axis, fixing the rest of the condition', () => {
    const map = buildMap(t, { x: 'width', y: 'weight_decay', at: { condition: 'optimizer=sgd' }, method: 'linear', raster: { nx: 8, ny: 8 } });
    expect(map.y).toMatchObject({ name: 'weight_decay', scale: 'linear', values: [0, 0.001, 0.01, 0.1] });
    expect(map.fixed.condition).toBe('optimizer=sgd');
    expect(map.cells).toHaveLength(16);
    const c = map.cells.find((m) => m.x === 16 && m.y === 0.01)!;
    expect(c.cell.stats.mean).toBeCloseTo(0.3 - 0.01 - 0.04 + 0.05 + 0.0005, 12);
  });

  it('fixes a condition key with --at and picks the rest', () => {
    const map = buildMap(t, { x: 'width', y: 'label_noise', at: { weight_decay: 0.1 }, method: 'linear' });
    expect(map.fixed.weight_decay).toBe(0.1);
    expect(map.fixed.condition).toBe('optimizer=adam'); // a tie on rows between names goes to the first in sort order
    expect(map.picked).toContain('condition');
    expect(map.picked).not.toContain('weight_decay');
    expect(() => buildMap(t, { x: 'optimizer' })).toThrow(/unknown axis 'optimizer'; map axes are width, epochs, train_size, label_noise, weight_decay/);
    expect(() => buildMap(t, { at: { weight_decay: 0.5 } })).toThrow(/no rows with weight_decay=0.5/);
  });
});

describe('buildMap at absurd axis values', () => {
  // Widths of 1e308 (next to the largest double) and 5e-324 (the smallest): the cell edges, and
  // the map's JSON, stay finite (an overflowed edge used to print as null).
  for (const widths of [[1e306, 1e307, 1e308], [5e-324, 1e-323, 4, 8]]) {
    it(`widths ${widths.join(', ')}: finite cell edges on both axes`, () => {
      const rows: Partial<RowRecord>[] = [];
      let r = 0;
      for (const w of widths)
        for (let s = 0; s < 2; s++) {
          r++;
          for (const e of [1, 10, 100]) rows.push({ run: `r${r}`, seed: s, width: w, epochs: e, train_size: 100, label_noise: 0, test_error: 0.3 + 0.01 * s + 0.001 * e, train_error: 0.1 });
        }
      const map = buildMap(tableFromRows(rows), { kind: 'model', method: 'linear', raster: { nx: 8, ny: 4 } });
      for (const v of [...map.x.edges, ...map.y.edges]) expect(Number.isFinite(v)).toBe(true);
      const json = JSON.parse(mapToJson(map)) as { x: { edges: unknown[] }; y: { edges: unknown[] } };
      for (const v of [...json.x.edges, ...json.y.edges]) expect(typeof v).toBe('number');
    });
  }
});
