import { describe, expect, it } from 'vitest';
import { buildCells, curveAt } from '../../src/cells/buildCells.js';
import type { RowRecord } from '../../src/store/tableFromRows.js';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import { selectRows } from '../../src/store/selectRows.js';
import { readRowsArrow, rowsToArrow } from '../../src/store/rowsArrow.js';

const base = { width: 64, train_size: 1000, label_noise: 0.1, condition: '' };

/** A run logging `f(epoch)` at the given epochs. */
function run(id: string, seed: number, epochs: number[], f: (e: number) => number, extra: Partial<RowRecord> = {}): Partial<RowRecord>[] {
  return epochs.map((e) => ({ ...base, run: id, seed, epochs: e, test_error: f(e), train_error: f(e) / 2, ...extra }));
}
const range = (a: number, b: number, step: number) => Array.from({ length: Math.floor((b - a) / step) + 1 }, (_, k) => a + k * step);

describe('buildCells', () => {
  it('groups seeds into cells with their statistics', () => {
    const t = tableFromRows([...run('a', 0, [10, 20], () => 0.2), ...run('b', 1, [10, 20], () => 0.4), ...run('c', 0, [10], () => 0.5, { width: 128 })]);
    const cells = buildCells(t);
    expect(cells.map((c) => [c.width, c.epochs, c.stats.n])).toEqual([
      [64, 10, 2],
      [64, 20, 2],
      [128, 10, 1],
    ]);
    expect(cells[0].stats.mean).toBeCloseTo(0.3, 12);
    expect(cells[0].seeds).toEqual([0, 1]);
    expect(cells[0].runs).toEqual(['a', 'b']);
    expect(cells[0].train!.mean).toBeCloseTo(0.15, 12);
    expect(cells[2].stats.low).toBeNull();
  });

  it('a run logged every 100 epochs and one logged every epoch give the same cell values at shared epochs (alignment along each run)', () => {
    // Same underlying curve, two logging cadences; the cell at a shared epoch must hold the curve's value twice.
    const g = (e: number) => 0.3 + 0.2 * Math.exp(-e / 300);
    const t = tableFromRows([...run('dense', 0, range(1, 1000, 1), g), ...run('sparse', 1, range(100, 1000, 100), g)]);
    const cells = buildCells(t, { epochs: [100, 200, 500, 1000] });
    for (const c of cells) {
      expect(c.stats.n).toBe(2);
      expect(c.values[0]).toBe(g(c.epochs));
      expect(c.values[1]).toBe(g(c.epochs));
      expect(c.stats.sd).toBe(0);
    }
  });

  it('interpolates in log epoch along the run’s own curve, not across runs', () => {
    // A curve linear in log(epoch) is reproduced exactly between logged epochs; interpolating linearly
    // in epoch would give 0.2441 instead of f(300) = 0.2148 (own arithmetic).
    const f = (e: number) => 0.5 - 0.05 * Math.log(e);
    const t = tableFromRows([...run('a', 0, [100, 1000], f), ...run('b', 1, [300], () => 0.9)]);
    const cells = buildCells(t, { epochs: [300] });
    expect(cells).toHaveLength(1);
    const k = cells[0].seeds.indexOf(0);
    expect(cells[0].values[k]).toBeCloseTo(f(300), 12);
    expect(cells[0].values[1 - k]).toBe(0.9);
  });

  it('never extrapolates past a run’s last logged epoch (or before its first)', () => {
    const t = tableFromRows([...run('long', 0, [1, 10, 100, 1000], () => 0.2), ...run('short', 1, [10, 100, 500], () => 0.4)]);
    const cells = buildCells(t, { epochs: [1, 500, 600, 1000, 5000] });
    const byEpoch = Object.fromEntries(cells.map((c) => [c.epochs, c.runs]));
    expect(byEpoch[1]).toEqual(['long']);
    expect(byEpoch[500]).toEqual(['long', 'short']);
    expect(byEpoch[600]).toEqual(['long']);
    expect(byEpoch[1000]).toEqual(['long']);
    expect(byEpoch[5000]).toBeUndefined();
  });

  it('counts diverged runs at and after divergence and never averages them', () => {
    const t = tableFromRows([
      ...run('ok', 0, [10, 100, 1000], () => 0.2),
      ...run('bad', 1, [10], () => 0.3),
      { ...base, run: 'bad', seed: 1, epochs: 100, test_error: NaN, status: 'diverged' },
    ]);
    const cells = buildCells(t, { epochs: [10, 100, 1000] });
    const at = (e: number) => cells.find((c) => c.epochs === e)!;
    expect(at(10).stats.n).toBe(2);
    expect(at(10).diverged).toBe(0);
    expect(at(100)).toMatchObject({ diverged: 1, divergedRuns: ['bad'] });
    expect(at(100).stats).toMatchObject({ n: 1, mean: 0.2 });
    expect(at(1000).diverged).toBe(1);
    expect(at(1000).values).toEqual([0.2]);
  });

  it('uses test_loss when asked and skips rows without the metric', () => {
    const t = tableFromRows([
      { ...base, run: 'a', seed: 0, epochs: 1, test_loss: 2 },
      { ...base, run: 'a', seed: 0, epochs: 2, test_loss: 1 },
      { ...base, run: 'b', seed: 1, epochs: 1 },
    ]);
    const cells = buildCells(t, { metric: 'test_loss' });
    expect(cells.map((c) => [c.epochs, c.stats.n, c.stats.mean])).toEqual([
      [1, 1, 2],
      [2, 1, 1],
    ]);
    expect(cells[0].train).toBeNull();
  });

  it('curveAt: exact at knots, undefined outside, linear in epoch from epoch 0', () => {
    const c = { e: [0, 10, 100], v: [1, 0.5, 0.3] };
    expect(curveAt(c, 10)).toBe(0.5);
    expect(curveAt(c, 5)).toBeCloseTo(0.75, 12);
    expect(curveAt(c, 101)).toBeUndefined();
    expect(curveAt(c, -1)).toBeUndefined();
    expect(curveAt(c, Math.sqrt(1000))).toBeCloseTo(0.4, 12); // midpoint in log epoch
  });

  it('over a subset of rows (rows option, through a store table\'s codes) equals the cells of those rows copied out', () => {
    const t = tableFromRows([
      ...run('a', 0, [10, 20, 40], (e) => 1 / e),
      ...run('b', 1, [10, 20, 40], (e) => 2 / e, { status: 'diverged' }),
      ...run('c', 2, [10, 40], (e) => 3 / e, { width: 128, condition: 'optimizer=adam' }),
      ...run('d', 3, [20, 40], (e) => 4 / e),
    ]);
    const stored = readRowsArrow(rowsToArrow(t)!).table; // as a map reads it: text kept as codes
    const rows = Int32Array.from([0, 1, 2, 4, 6, 7, 9, 10]);
    for (const epochs of [undefined, [10, 30, 40]]) {
      const copied = buildCells(selectRows(t, rows), { epochs });
      expect(buildCells(t, { epochs, rows })).toEqual(copied);
      expect(buildCells(stored, { epochs, rows })).toEqual(copied);
    }
  });
});
