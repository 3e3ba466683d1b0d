/**
 * Rows in long form with a split column (`{"epoch": 1, "split": "test", "error": 0.5}` beside
 * `"split": "train"`): each metric becomes `<split>_<metric>` on its own rows, and the split
 * column goes. Read as they are, the train rows' `error` would be taken as the test error and
 * each split would be a condition of its own. The rows stay apart; merging joins a run's train
 * and test rows of one epoch (counted as duplicates that completed a row).
 */
import { cellAt } from './RawTable.js';
import type { RawColumn, RawTable, RawValue } from './RawTable.js';
import { splitPrefix } from './json/splitCurves.js';
import { matchTarget, METRIC_TARGETS, nameKey } from './synonyms.js';

const SPLIT_COLUMNS = new Set(['split', 'phase', 'mode', 'subset', 'stage', 'partition', 'set', 'dataset', 'datasplit', 'evalset', 'data']);
const BARE = new Set(['accuracy', 'acc', 'loss', 'error', 'err', 'mse', 'risk']);

/** Rewrites the metric columns of a long-form table in place; returns a note, or null when it has no split column. */
export function splitLongRows(raw: RawTable): { column: string; splits: string[]; metrics: string[] } | null {
  const j = raw.names.findIndex((n) => SPLIT_COLUMNS.has(nameKey(n)));
  if (j < 0) return null;
  const col = raw.columns[j];
  const n = raw.length;
  const prefixes: string[] = new Array(n);
  const seen = new Set<string>();
  for (let i = 0; i < n; i++) {
    const v = cellAt(col, i);
    if (v === undefined || v === null || v === '') continue;
    const p = typeof v === 'string' ? splitPrefix(v) : undefined;
    if (p === undefined) return null; // not a split column after all (`mode: "sgd"`)
    prefixes[i] = p;
    seen.add(p);
  }
  if (seen.size === 0) return null;
  const metrics: number[] = [];
  raw.names.forEach((name, k) => {
    if (k === j) return;
    const last = name.slice(name.lastIndexOf('.') + 1);
    if (splitPrefix(last.split(/[_\-. ]/)[0]) !== undefined) return; // already says its split
    const t = matchTarget(last)?.target;
    if (BARE.has(nameKey(last)) || (t !== undefined && (METRIC_TARGETS as readonly string[]).includes(t))) metrics.push(k);
  });
  if (metrics.length === 0) return null;
  const names = raw.names.slice();
  const columns = raw.columns.slice();
  const drop = new Set<number>([j, ...metrics]);
  for (const k of metrics) {
    const last = raw.names[k].slice(raw.names[k].lastIndexOf('.') + 1);
    const bare = last;
    for (const p of seen) {
      const out: RawValue[] = new Array(n);
      for (let i = 0; i < n; i++) if (prefixes[i] === p) out[i] = cellAt(raw.columns[k], i);
      names.push(`${p}_${bare}`);
      columns.push(out as RawColumn);
    }
  }
  const keep = names.map((_, k) => k).filter((k) => !drop.has(k));
  const column = raw.names[j];
  raw.names = keep.map((k) => names[k]);
  raw.columns = keep.map((k) => columns[k]);
  return { column, splits: [...seen], metrics: metrics.map((k) => names[k]) };
}
