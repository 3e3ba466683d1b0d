import type { Cell } from '../../src/cells/Cell.js';
import type { MapAxis, SweepMap } from '../../src/grid/SweepMap.js';
import type { RidgeResult } from '../../src/analysis/Ridge.js';

/** Geometric-midpoint edges of a log2 axis (DESIGN.md §5). */
export function logAxis(name: string, values: number[]): MapAxis {
  const edges = [values[0] / Math.sqrt(values[1] / values[0])];
  for (let i = 0; i + 1 < values.length; i++) edges.push(Math.sqrt(values[i] * values[i + 1]));
  const n = values.length;
  edges.push(values[n - 1] * Math.sqrt(values[n - 1] / values[n - 2]));
  return { name, scale: 'log2', values, edges };
}

/** A hand-made cell with explicit seed values (mean and interval computed here, t quantiles from a handbook table). */
export function cell(key: { width: number; epochs: number; train_size: number; label_noise: number }, values: number[], runs?: string[]): Cell {
  const n = values.length;
  const mean = values.reduce((a, b) => a + b, 0) / n;
  const sd = n > 1 ? Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1)) : NaN;
  const se = sd / Math.sqrt(n);
  // Student-t 97.5% quantiles, df 1..4 (any statistics handbook table; REFERENCES.md §6).
  const t = [NaN, 12.706, 4.303, 3.182, 2.776][n - 1] ?? 2.776;
  const sorted = [...values].sort((a, b) => a - b);
  return {
    condition: '',
    ...key,
    metric: 'test_error',
    stats: { n, mean, median: sorted[Math.floor(n / 2)], sd, se, low: n > 1 ? mean - t * se : null, high: n > 1 ? mean + t * se : null },
    train: { n, mean: 0, median: 0, sd: 0, se: 0, low: 0, high: 0 },
    seeds: values.map((_, i) => i),
    values,
    trainValues: values.map(() => 0),
    runs: runs ?? values.map((_, i) => `w${key.width}-e${key.epochs}-s${i}`),
    diverged: 0,
  };
}

/**
 * A model-wise map (width × epochs) at train_size 64 whose error peaks at width 64 in the late
 * epochs only, like the simulator's runs; one grid point (width 256, epoch 10) is missing.
 */
export function modelMapFixture(opts: { label_noise?: number; runName?: string } = {}): { map: SweepMap; ridge: RidgeResult } {
  const noise = opts.label_noise ?? 0.2;
  const widths = [8, 16, 32, 64, 128, 256];
  const epochs = [10, 100, 1000];
  const cells = [];
  const missing = [];
  for (const e of epochs) {
    for (const w of widths) {
      if (w === 256 && e === 10) {
        missing.push({ x: w, y: e });
        continue;
      }
      const bump = e >= 100 ? (0.2 + noise) * Math.exp(-((Math.log2(w / 64)) ** 2)) : 0;
      const base = 0.4 - 0.03 * Math.log2(w / 8) + bump;
      const vals = [base - 0.01, base, base + 0.01];
      const runs = opts.runName && w === 64 && e === 1000 ? [opts.runName, 'b', 'c'] : undefined;
      cells.push({ x: w, y: e, cell: cell({ width: w, epochs: e, train_size: 64, label_noise: noise }, vals, runs) });
    }
  }
  const nx = widths.length;
  const ny = epochs.length;
  const map: SweepMap = {
    kind: 'model',
    x: logAxis('width', widths),
    y: logAxis('epochs', epochs),
    metric: 'test_error',
    fixed: { train_size: 64, label_noise: noise },
    picked: ['train_size'],
    method: 'linear',
    loo: { method: 'linear', rmse: 0.02, tried: { linear: 0.02 } },
    cells,
    missing,
    diverged: [],
    raster: { nx, ny, xs: widths, ys: epochs, value: new Float64Array(nx * ny), sd: null, origin: new Uint8Array(nx * ny) },
  };
  const ridge: RidgeResult = {
    map: 'model',
    x: 'width',
    y: 'epochs',
    metric: 'test_error',
    fixed: map.fixed,
    minProminence: 2,
    epsilon: 0.01,
    rows: epochs.map((e) => ({
      y: e,
      peak: e >= 100 ? { x: 64, low: 48, high: 80, error: 0.6, prominence: 0.3, prominenceSe: 30, cellX: 64 } : null,
      others: [],
      threshold: 40,
      ratio: e >= 100 ? 64 / 40 : null,
      noiseFrom: 'seeds' as const,
    })),
  };
  return { map, ridge };
}

/** A small report: facts, findings and the model-wise map at two label-noise values (a selector). */
export function reportModelFixture(opts: { runName?: string; title?: string } = {}): import('../../src/report/ReportModel.js').ReportModel {
  const a = modelMapFixture({ label_noise: 0.1, runName: opts.runName });
  const b = modelMapFixture({ label_noise: 0.2, runName: opts.runName });
  return {
    facts: {
      title: opts.title ?? 'Fixture sweep',
      runs: 102,
      rows: 306,
      seeds: { distinct: 3, perCellMin: 3, perCellMax: 3 },
      axes: [
        { name: 'width', values: [8, 16, 32, 64, 128, 256] },
        { name: 'epochs', values: [10, 100, 1000] },
        { name: 'train_size', values: [64] },
        { name: 'label_noise', values: [0.1, 0.2] },
      ],
      conditions: [''],
      metric: 'test_error',
      dataDate: '2026-12-01T00:00:00.000Z',
      storeHash: 'abc123',
      generatedAt: '2026-12-01T00:00:00.000Z',
      diverged: 0,
    },
    findings: ['The peak sits at width 64 ≈ train size 64.'],
    cautions: [],
    maps: [
      {
        kind: 'model',
        x: 'width',
        y: 'epochs',
        selector: ['label_noise'],
        main: 1,
        variants: [
          { label: 'label_noise 0.1 · train_size 64', map: a.map, ridge: a.ridge, cautions: [] },
          { label: 'label_noise 0.2 · train_size 64', map: b.map, ridge: b.ridge, cautions: ['a caution'] },
        ],
      },
    ],
    skipped: [{ kind: 'epoch', reason: 'one train size only' }],
    hurts: [],
    coverage: null,
    plan: null,
  };
}
