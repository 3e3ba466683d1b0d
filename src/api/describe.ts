import type { Manifest } from '../store/Manifest.js';
import type { Metric, RowTable } from '../store/RowTable.js';
import { METRICS, textReader } from '../store/RowTable.js';
import { sourceColumns } from '../store/sourceColumns.js';
import { readRejected } from '../store/rejectedCsv.js';
import type { Reject } from '../store/Reject.js';
import { readStore } from '../store/readStore.js';
import type { Store } from './Store.js';

/** What `datlas describe --json` prints (DESIGN.md §6). */
export interface DescribeResult {
  rows: number;
  runs: number;
  sources: number;
  /** canonical column → the source column (or path, or set: value) it came from. */
  columns: Record<string, string>;
  axes: {
    width: number[];
    train_size: number[];
    label_noise: number[];
    epochs: { min: number | null; max: number | null; distinct: number };
  };
  seeds: number[];
  conditions: { condition: string; runs: number }[];
  /** The metrics some row holds. */
  metrics: Metric[];
  /** Extra numeric columns kept beside the canonical ones. */
  extra: string[];
  /** Rejected rows in rejected.csv by kind of reason. */
  rejected: Record<string, number>;
}

/** Sorted distinct finite values of a column. */
function distinct(col: Float64Array): number[] {
  const s = new Set<number>();
  for (let i = 0; i < col.length; i++) if (col[i] === col[i]) s.add(col[i]);
  return [...s].sort((a, b) => a - b);
}

/** The kind of a rejection reason: its text before the first detail (": ..." or ", got ..."). */
export function reasonKind(reason: string): string {
  const cut = reason.search(/: |, got /);
  return (cut > 0 ? reason.slice(0, cut) : reason).trim() || 'unreadable';
}

/** The describe summary of a table, its manifest and its rejections (pure). */
export function describeTable(table: RowTable, manifest: Manifest, rejects: readonly Reject[]): DescribeResult {
  const run = textReader(table, 'run');
  const cond = textReader(table, 'condition');
  const runsOf = new Map<string, Set<string>>();
  const all = new Set<string>();
  for (let i = 0; i < table.length; i++) {
    const r = run(i);
    all.add(r);
    const c = cond(i);
    let set = runsOf.get(c);
    if (!set) runsOf.set(c, (set = new Set()));
    set.add(r);
  }
  const epochs = distinct(table.epochs);
  const rejected: Record<string, number> = {};
  for (const r of rejects) {
    const k = reasonKind(r.reason);
    rejected[k] = (rejected[k] ?? 0) + 1;
  }
  return {
    rows: table.length,
    runs: all.size,
    sources: Object.keys(manifest.sources).length,
    columns: sourceColumns(manifest),
    axes: {
      width: distinct(table.width),
      train_size: distinct(table.train_size),
      label_noise: distinct(table.label_noise),
      epochs: { min: epochs.length ? epochs[0] : null, max: epochs.length ? epochs[epochs.length - 1] : null, distinct: epochs.length },
    },
    seeds: distinct(table.seed),
    metrics: METRICS.filter((m) => table[m].some((v) => Number.isFinite(v))),
    extra: Object.keys(table.extra).sort(),
    conditions: [...runsOf].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).map(([condition, s]) => ({ condition, runs: s.size })),
    rejected,
  };
}

/** What a store holds, as `datlas describe --json`: a store directory or an opened store. */
export async function describe(store: string | Store): Promise<DescribeResult> {
  const { table, manifest, dir } = typeof store === 'string' ? { ...(await readStore(store)), dir: store } : store;
  return describeTable(table, manifest, readRejected(dir));
}
