import type { Cell, SeedStats } from '../../src/cells/Cell.js';
import type { MapAxis, MapCell, SweepMap } from '../../src/grid/SweepMap.js';
import type { Metric } from '../../src/store/RowTable.js';
import { mulberry32 } from '../../src/random/mulberry32.js';

/** Seed statistics computed directly (test-side, independent of src/cells). */
export function stats(values: readonly number[]): SeedStats {
  const v = values.filter(Number.isFinite);
  const n = v.length;
  const mean = n ? v.reduce((a, b) => a + b, 0) / n : NaN;
  const sd = n > 1 ? Math.sqrt(v.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1)) : NaN;
  const s = [...v].sort((a, b) => a - b);
  const median = n ? (n % 2 ? s[n >> 1] : (s[n / 2 - 1] + s[n / 2]) / 2) : NaN;
  return { n, mean, median, sd, se: sd / Math.sqrt(n), low: null, high: null };
}

/** A cell with the given seed values of the metric (and optional train errors, one per seed). */
export function makeCell(
  key: Partial<Pick<Cell, 'condition' | 'label_noise' | 'width' | 'train_size' | 'epochs'>>,
  values: readonly number[],
  train?: readonly number[],
  metric: Metric = 'test_error',
): Cell {
  return {
    condition: key.condition ?? '',
    label_noise: key.label_noise ?? 0,
    width: key.width ?? 1,
    train_size: key.train_size ?? 1,
    epochs: key.epochs ?? 1,
    metric,
    stats: stats(values),
    train: train ? stats(train) : null,
    seeds: values.map((_, i) => i),
    values: [...values],
    trainValues: train ? [...train] : values.map(() => NaN),
    runs: values.map((_, i) => `r${i}`),
    diverged: 0,
  };
}

function axis(name: string, values: number[], scale: 'log2' | 'linear'): MapAxis {
  const v = [...new Set(values)].sort((a, b) => a - b);
  const edges = [v[0], ...v.slice(1).map((b, i) => (scale === 'log2' ? Math.sqrt(v[i] * b) : (v[i] + b) / 2)), v[v.length - 1]];
  return { name, scale, values: v, edges };
}

/** A map (the fields findRidge reads) from rows of cells: rows[y] = cells along x. */
export function makeMap(opts: {
  kind?: SweepMap['kind'];
  x?: string;
  y?: string;
  xs: number[];
  rows: { y: number; cells: Cell[] }[];
  xScale?: 'log2' | 'linear';
}): Pick<SweepMap, 'kind' | 'x' | 'y' | 'cells' | 'fixed' | 'metric'> {
  const cells: MapCell[] = [];
  for (const r of opts.rows) r.cells.forEach((c, i) => cells.push({ x: opts.xs[i], y: r.y, cell: c }));
  return {
    kind: opts.kind ?? 'model',
    x: axis(opts.x ?? 'width', opts.xs, opts.xScale ?? 'log2'),
    y: axis(opts.y ?? 'epochs', opts.rows.map((r) => r.y), 'log2'),
    cells,
    fixed: { label_noise: 0.1 },
    metric: opts.rows[0]?.cells[0]?.metric ?? 'test_error',
  };
}

/** mulberry32 + Box–Muller, test-side, so the tests do not reuse the code under test for their data. */
export function testRng(seed: number): { u: () => number; z: () => number } {
  const u = mulberry32(seed);
  const z = () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
  return { u, z };
}
