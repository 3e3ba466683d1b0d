import { emptyTable, NUMERIC_COLUMNS } from '../store/RowTable.js';
import type { RowTable } from '../store/RowTable.js';

/** Rows of several tables, in order, in one table (extra columns: union, NaN where absent). */
export function concatTables(parts: readonly RowTable[]): RowTable {
  const total = parts.reduce((s, t) => s + t.length, 0);
  const extraNames = [...new Set(parts.flatMap((t) => Object.keys(t.extra)))];
  const out = emptyTable(total, extraNames);
  let at = 0;
  for (const t of parts) {
    for (let i = 0; i < t.length; i++) {
      out.run[at + i] = t.run[i];
      out.condition[at + i] = t.condition[i];
      out.source[at + i] = t.source[i];
      out.status[at + i] = t.status[i];
    }
    out.source_line.set(t.source_line.subarray(0, t.length), at);
    for (const c of NUMERIC_COLUMNS) out[c].set(t[c].subarray(0, t.length), at);
    for (const [k, col] of Object.entries(t.extra)) out.extra[k].set(col.subarray(0, t.length), at);
    at += t.length;
  }
  return out;
}
