import type { Metric, RowTable } from '../store/RowTable.js';
import { defaultMetric, textReader } from '../store/RowTable.js';
import { rowConfigKey } from '../store/rowKeys.js';
import type { Cell } from './Cell.js';
import { seedStats } from './seedStats.js';

export interface BuildCellsOptions {
  /** The value aggregated over seeds; default test_error, or test_loss when no row has an error. */
  metric?: Metric;
  /**
   * Align every run to these epochs by interpolation along its own curve in log-epoch space.
   * Default: each run contributes at the epochs it logged.
   */
  epochs?: number[];
  /** Only these rows of the table (default all): saves copying the rows a map selects out of a store. */
  rows?: ArrayLike<number>;
}

/** One run's curve: finite points of a value, epochs ascending. */
interface Curve {
  e: number[];
  v: number[];
}

/**
 * The value of a run's curve at epoch `t`: exact at a logged epoch, interpolated between the two
 * logged epochs around it (linear in log epoch when both are positive, else linear in epoch), and
 * undefined outside [first, last] logged epoch: runs are never extrapolated.
 */
export function curveAt(curve: Curve, t: number): number | undefined {
  const { e, v } = curve;
  const n = e.length;
  if (n === 0 || !(t >= e[0] && t <= e[n - 1])) return undefined;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (e[mid] <= t) lo = mid;
    else hi = mid;
  }
  if (e[lo] === t) return v[lo];
  if (e[hi] === t) return v[hi];
  const a = e[lo];
  const b = e[hi];
  const w = a > 0 ? Math.log(t / a) / Math.log(b / a) : (t - a) / (b - a);
  return v[lo] + w * (v[hi] - v[lo]);
}

function curveOf(epochs: number[], values: number[]): Curve {
  const e: number[] = [];
  const v: number[] = [];
  for (let k = 0; k < epochs.length; k++) {
    if (!Number.isFinite(values[k]) || !Number.isFinite(epochs[k])) continue;
    // A repeated epoch inside one run keeps its last row (ingest normally removed duplicates).
    if (e.length > 0 && e[e.length - 1] === epochs[k]) v[v.length - 1] = values[k];
    else {
      e.push(epochs[k]);
      v.push(values[k]);
    }
  }
  return { e, v };
}

interface Entry {
  seed: number;
  run: string;
  value: number;
  train: number;
}

interface Acc {
  condition: string;
  label_noise: number;
  width: number;
  train_size: number;
  epochs: number;
  entries: Entry[];
  divergedRuns: string[];
}

/**
 * Groups rows into cells (condition, label_noise, width, train_size, epochs) and aggregates the
 * seeds of each. A run marked diverged is counted (`diverged`) at every epoch from its first
 * diverged row on — divergence is terminal — and its values there are never averaged.
 */
export function buildCells(table: RowTable, opts: BuildCellsOptions = {}): Cell[] {
  const metric = opts.metric ?? defaultMetric(table);
  const targets = opts.epochs ? [...new Set(opts.epochs.filter((e) => Number.isFinite(e)))].sort((a, b) => a - b) : null;
  const metricCol = table[metric];
  // Text through the store's codes when it has them (no whole-column decoding).
  const runOf = textReader(table, 'run');
  const conditionOf = textReader(table, 'condition');
  const statusOf = textReader(table, 'status');
  const only = opts.rows;
  const count = only ? only.length : table.length;

  // Rows of each run: grouped by run id (strings are built once per run, not per row), then split
  // by configuration in the rare case a run id was reused across configurations.
  const byRun = new Map<string, number[]>();
  for (let r = 0; r < count; r++) {
    const i = only ? only[r] : r;
    const run = runOf(i);
    const id = run === '' ? `\u0000seed${table.seed[i]}` : run;
    let rows = byRun.get(id);
    if (!rows) byRun.set(id, (rows = []));
    rows.push(i);
  }
  const text = { run: runOf, condition: conditionOf };
  const configKey = (i: number) => rowConfigKey(table, text, i);
  const sameConfig = (i: number, j: number) =>
    conditionOf(i) === conditionOf(j) &&
    Object.is(table.label_noise[i], table.label_noise[j]) &&
    Object.is(table.width[i], table.width[j]) &&
    Object.is(table.train_size[i], table.train_size[j]);
  const runs: number[][] = [];
  for (const rows of byRun.values()) {
    if (rows.every((i) => sameConfig(i, rows[0]))) runs.push(rows);
    else {
      const split = new Map<string, number[]>();
      for (const i of rows) {
        const k = configKey(i);
        let g = split.get(k);
        if (!g) split.set(k, (g = []));
        g.push(i);
      }
      runs.push(...split.values());
    }
  }

  // Cells: configuration → epoch → accumulator (number keys inside, no per-row strings).
  const configs = new Map<string, Map<number, Acc>>();
  const accFor = (byEpoch: Map<number, Acc>, i: number, epoch: number): Acc => {
    let acc = byEpoch.get(epoch);
    if (!acc) {
      acc = {
        condition: conditionOf(i),
        label_noise: table.label_noise[i],
        width: table.width[i],
        train_size: table.train_size[i],
        epochs: epoch,
        entries: [],
        divergedRuns: [],
      };
      byEpoch.set(epoch, acc);
    }
    return acc;
  };

  for (const rows of runs) {
    // Logs are nearly always in epoch order already: check before sorting (a sort per run was a
    // good part of building a map's cells).
    let sorted = true;
    for (let k = 1; k < rows.length && sorted; k++) if (!(table.epochs[rows[k - 1]] <= table.epochs[rows[k]])) sorted = false;
    if (!sorted) rows.sort((a, b) => table.epochs[a] - table.epochs[b]);
    const first = rows[0];
    const ck = configKey(first);
    let byEpoch = configs.get(ck);
    if (!byEpoch) configs.set(ck, (byEpoch = new Map()));
    let divergedAt = Infinity;
    const epochs: number[] = [];
    const values: number[] = [];
    const trains: number[] = [];
    for (const i of rows) {
      if (statusOf(i) === 'diverged') {
        divergedAt = Math.min(divergedAt, table.epochs[i]);
        continue;
      }
      epochs.push(table.epochs[i]);
      values.push(metricCol[i]);
      trains.push(table.train_error[i]);
    }
    const curve = curveOf(epochs, values);
    const trainCurve = curveOf(epochs, trains);
    const runTargets = targets ?? [...new Set(rows.map((i) => table.epochs[i]).filter((e) => Number.isFinite(e)))];
    for (const t of runTargets) {
      if (t >= divergedAt) {
        accFor(byEpoch, first, t).divergedRuns.push(runOf(first));
        continue;
      }
      const value = curveAt(curve, t);
      if (value === undefined) continue;
      accFor(byEpoch, first, t).entries.push({ seed: table.seed[first], run: runOf(first), value, train: curveAt(trainCurve, t) ?? NaN });
    }
  }

  const out: Cell[] = [];
  for (const acc of [...configs.values()].flatMap((m) => [...m.values()])) {
    acc.entries.sort((a, b) => a.seed - b.seed || (a.run < b.run ? -1 : a.run > b.run ? 1 : 0));
    const trainValues = acc.entries.map((e) => e.train);
    const anyTrain = trainValues.some((x) => Number.isFinite(x));
    out.push({
      condition: acc.condition,
      label_noise: acc.label_noise,
      width: acc.width,
      train_size: acc.train_size,
      epochs: acc.epochs,
      metric,
      stats: seedStats(acc.entries.map((e) => e.value)),
      train: anyTrain ? seedStats(trainValues) : null,
      seeds: acc.entries.map((e) => e.seed),
      values: acc.entries.map((e) => e.value),
      trainValues,
      runs: acc.entries.map((e) => e.run),
      diverged: acc.divergedRuns.length,
      divergedRuns: acc.divergedRuns.sort(),
    });
  }
  out.sort(
    (a, b) =>
      (a.condition < b.condition ? -1 : a.condition > b.condition ? 1 : 0) ||
      a.label_noise - b.label_noise ||
      a.width - b.width ||
      a.train_size - b.train_size ||
      a.epochs - b.epochs,
  );
  return out;
}
