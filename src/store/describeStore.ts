/**
 * What a store holds and where each column came from: the shape `datlas describe --json` prints
 * (DESIGN.md §6). Pure: takes the table, manifest and rejections already read.
 */
import { METRICS, textReader } from './RowTable.js';
import type { RowTable } from './RowTable.js';
import type { Manifest } from './Manifest.js';
import type { Reject } from './Reject.js';

export interface StoreDescription {
  rows: number;
  runs: number;
  sources: number;
  /** canonical column → source column(s) (several layouts joined by ` | `). */
  columns: Record<string, string>;
  axes: {
    width: number[];
    train_size: number[];
    label_noise: number[];
    params?: number[];
    epochs: { min: number; max: number; distinct: number } | null;
  };
  seeds: number[];
  conditions: { condition: string; runs: number }[];
  metrics: string[];
  /** Extra per-run or per-row columns kept beside the canonical ones (outcomes, derived values). */
  extra: string[];
  rejected: Record<string, number>;
}

function distinctSorted(a: ArrayLike<number>): number[] {
  const s = new Set<number>();
  for (let i = 0; i < a.length; i++) if (Number.isFinite(a[i])) s.add(a[i]);
  return [...s].sort((x, y) => x - y);
}

/** A rejection's reason without the values in it (`not a number: 'abc'` and `'x'` count as one). */
export function reasonKind(reason: string): string {
  return reason.replace(/'[^']*'/g, "'…'").replace(/-?\d+(\.\d+)?(e[-+]?\d+)?/gi, 'N');
}

export function describeStore(table: RowTable, manifest: Manifest, rejects: readonly Reject[]): StoreDescription {
  const run = textReader(table, 'run');
  const cond = textReader(table, 'condition');
  const runs = new Set<string>();
  const byCondition = new Map<string, Set<string>>();
  for (let i = 0; i < table.length; i++) {
    const r = run(i);
    runs.add(r);
    const c = cond(i);
    let s = byCondition.get(c);
    if (!s) byCondition.set(c, (s = new Set()));
    s.add(r);
  }
  const columns: Record<string, string[]> = {};
  for (const e of Object.values(manifest.sources)) {
    for (const [t, from] of Object.entries(e.mapping ?? {})) if (!(columns[t] ??= []).includes(from)) columns[t].push(from);
  }
  const epochs = distinctSorted(table.epochs);
  const rejected: Record<string, number> = {};
  for (const r of rejects) rejected[reasonKind(r.reason)] = (rejected[reasonKind(r.reason)] ?? 0) + 1;
  const metrics = METRICS.filter((m) => table[m].some((v) => Number.isFinite(v)));
  const axes: StoreDescription['axes'] = {
    width: distinctSorted(table.width),
    train_size: distinctSorted(table.train_size),
    label_noise: distinctSorted(table.label_noise),
    epochs: epochs.length ? { min: epochs[0], max: epochs[epochs.length - 1], distinct: epochs.length } : null,
  };
  if (table.extra.params) axes.params = distinctSorted(table.extra.params);
  return {
    rows: table.length,
    runs: runs.size,
    sources: Object.keys(manifest.sources).length,
    columns: Object.fromEntries(Object.entries(columns).map(([t, s]) => [t, s.join(' | ')])),
    axes,
    seeds: distinctSorted(table.seed),
    conditions: [...byCondition].map(([condition, s]) => ({ condition, runs: s.size })).sort((a, b) => (a.condition < b.condition ? -1 : a.condition > b.condition ? 1 : 0)),
    metrics,
    extra: Object.keys(table.extra).sort(),
    rejected,
  };
}
