import type { Peak, RidgeResult, RidgeRow } from '../../src/analysis/Ridge.js';
import type { Cell } from '../../src/cells/Cell.js';
import type { MapAxis, SweepMap } from '../../src/grid/SweepMap.js';
import { ORIGIN_INTERPOLATED, ORIGIN_MEASURED, ORIGIN_OUTSIDE } from '../../src/grid/SweepMap.js';

/** Hand-built model-wise map: a double-descent bump along width whose peak moves with epochs. */
export interface FixtureOptions {
  nx?: number;
  ny?: number;
  seeds?: number;
  /** Grid points (i, j) with no data. */
  missing?: [number, number][];
  diverged?: [number, number][];
  rasterN?: number;
  /** Name and values of the x axis (default width, 2 … 2048 geometric). */
  xName?: string;
  xValues?: number[];
}

function logAxis(name: string, values: number[]): MapAxis {
  const edges = [values[0] / Math.sqrt(values[1] / values[0])];
  for (let i = 0; i + 1 < values.length; i++) edges.push(Math.sqrt(values[i] * values[i + 1]));
  edges.push(values[values.length - 1] * Math.sqrt(values[values.length - 1] / values[values.length - 2]));
  return { name, scale: 'log2', values, edges };
}

/** Smooth surface: falls with width, bump at width ≈ 2^(3 + 4·(log epochs share)), grows with epochs. */
export function surface(w: number, e: number): number {
  const lw = Math.log2(w);
  const le = Math.log2(e);
  const centre = 3 + 0.35 * le;
  const height = 0.04 + 0.22 / (1 + Math.exp(-(le - 5)));
  return 0.12 + 0.25 / (1 + lw) + height * Math.exp(-((lw - centre) ** 2) / 0.9);
}

function stats(values: number[]) {
  const n = values.length;
  const mean = values.reduce((a, b) => a + b, 0) / n;
  const sd = n > 1 ? Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1)) : NaN;
  const se = sd / Math.sqrt(n);
  const t = n > 1 ? [NaN, 12.706, 4.303, 3.182, 2.776][n - 1] ?? 2.262 : NaN; // Student t table, two-sided 95%
  return { n, mean, median: mean, sd, se, low: n > 1 ? mean - t * se : null, high: n > 1 ? mean + t * se : null };
}

export function fixtureMap(opts: FixtureOptions = {}): SweepMap {
  const { ny = 8, seeds = 3, missing = [], diverged = [], rasterN = 40, xName = 'width' } = opts;
  const nx = opts.xValues?.length ?? opts.nx ?? 10;
  const widths = opts.xValues ?? Array.from({ length: nx }, (_, i) => 2 ** (1 + (i * 10) / Math.max(1, nx - 1)));
  const epochs = Array.from({ length: ny }, (_, j) => 2 ** ((j * 12) / Math.max(1, ny - 1)));
  const x = logAxis(xName, widths.map((v) => Number(v.toPrecision(6))));
  const y = logAxis('epochs', epochs.map((v) => Number(v.toPrecision(6))));
  const miss = new Set(missing.map(([i, j]) => `${i},${j}`));
  const div = new Set(diverged.map(([i, j]) => `${i},${j}`));
  const cells: SweepMap['cells'] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      if (miss.has(`${i},${j}`)) continue;
      const m = surface(x.values[i], y.values[j]);
      // Deterministic seed spread: ±1% around the surface.
      const values = Array.from({ length: seeds }, (_, s) => m + 0.01 * Math.sin(1 + i * 7 + j * 3 + s * 11));
      const trainValues = values.map(() => Math.max(0, 0.3 - 0.1 * Math.log2(x.values[i]) * Math.log10(10 * y.values[j]) / 4));
      const cell: Cell = {
        condition: '', label_noise: 0.2, width: x.values[i], train_size: 4000, epochs: y.values[j], metric: 'test_error',
        stats: stats(values), train: stats(trainValues), seeds: values.map((_, s) => s), values, trainValues,
        runs: values.map((_, s) => `w${i}-s${s}`), diverged: div.has(`${i},${j}`) ? 1 : 0,
      };
      cells.push({ x: x.values[i], y: y.values[j], cell });
    }
  }
  const rx = Array.from({ length: rasterN }, (_, i) => 2 ** (Math.log2(x.values[0]) + (i * (Math.log2(x.values[nx - 1]) - Math.log2(x.values[0]))) / (rasterN - 1)));
  const ry = Array.from({ length: rasterN }, (_, j) => 2 ** (Math.log2(y.values[0]) + (j * (Math.log2(y.values[ny - 1]) - Math.log2(y.values[0]))) / (rasterN - 1)));
  const value = new Float64Array(rasterN * rasterN);
  const origin = new Uint8Array(rasterN * rasterN);
  const nearest = (vals: number[], v: number) => vals.reduce((b, c, k) => (Math.abs(Math.log2(c / v)) < Math.abs(Math.log2(vals[b] / v)) ? k : b), 0);
  for (let j = 0; j < rasterN; j++) {
    for (let i = 0; i < rasterN; i++) {
      const ci = nearest(x.values, rx[i]);
      const cj = nearest(y.values, ry[j]);
      const k = j * rasterN + i;
      value[k] = surface(rx[i], ry[j]);
      origin[k] = miss.has(`${ci},${cj}`) ? ORIGIN_INTERPOLATED : ORIGIN_MEASURED;
      // A corner outside the data, as a hull-limited interpolator leaves it.
      if (i + j < rasterN / 8) {
        value[k] = NaN;
        origin[k] = ORIGIN_OUTSIDE;
      }
    }
  }
  return {
    kind: 'model', x, y, metric: 'test_error',
    fixed: { train_size: 4000, label_noise: 0.2, condition: '' }, picked: ['train_size'],
    method: 'gp', loo: { method: 'gp', rmse: 0.0123, tried: { gp: 0.0123, linear: 0.02 } },
    cells,
    missing: missing.map(([i, j]) => ({ x: x.values[i], y: y.values[j] })),
    diverged: diverged.map(([i, j]) => ({ x: x.values[i], y: y.values[j], count: 1 })),
    raster: { nx: rasterN, ny: rasterN, xs: rx, ys: ry, value, sd: null, origin },
  };
}

/** A ridge over the fixture: the measured argmax per row, no peak where `noPeak` says. */
export function fixtureRidge(map: SweepMap, opts: { noPeak?: number[]; weak?: number[]; curve?: boolean } = {}): RidgeResult {
  const rows: RidgeRow[] = map.y.values.map((y, j) => {
    const row = map.cells.filter((c) => c.y === y).sort((a, b) => a.x - b.x);
    let best = 1;
    for (let k = 1; k + 1 < row.length; k++) if (row[k].cell.stats.mean > row[best].cell.stats.mean) best = k;
    const c = row[best];
    const peak: Peak = {
      x: c.x * 1.1, low: c.x / 1.5, high: c.x * 1.6, error: c.cell.stats.mean, prominence: 0.05,
      prominenceSe: opts.weak?.includes(j) ? 1.4 : 6, cellX: c.x,
    };
    const thr = map.x.values.find((xv) => (map.cells.find((cc) => cc.x === xv && cc.y === y)?.cell.train?.mean ?? 1) <= 0.01) ?? null;
    return {
      y, peak: opts.noPeak?.includes(j) ? null : peak, others: [], threshold: thr,
      ratio: thr ? peak.x / thr : null, noiseFrom: opts.curve ? 'curve' : 'seeds',
    };
  });
  return { map: 'model', x: 'width', y: 'epochs', metric: 'test_error', fixed: map.fixed, minProminence: 2, epsilon: 0.01, rows };
}
