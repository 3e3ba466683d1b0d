import type { RowTable } from './RowTable.js';
import { NUMERIC_COLUMNS } from './RowTable.js';

/** A new table holding the rows at `indices` (in that order); columns are copied, never shared. */
export function selectRows(table: RowTable, indices: ArrayLike<number>): RowTable {
  const n = indices.length;
  const pickS = <T>(col: readonly T[]): T[] => {
    const out = new Array<T>(n);
    for (let k = 0; k < n; k++) out[k] = col[indices[k]];
    return out;
  };
  const pickF = (col: Float64Array): Float64Array => {
    const out = new Float64Array(n);
    for (let k = 0; k < n; k++) out[k] = col[indices[k]];
    return out;
  };
  const sourceLine = new Int32Array(n);
  for (let k = 0; k < n; k++) sourceLine[k] = table.source_line[indices[k]];
  const extra: Record<string, Float64Array> = {};
  for (const [name, col] of Object.entries(table.extra)) extra[name] = pickF(col);
  const numeric = Object.fromEntries(NUMERIC_COLUMNS.map((c) => [c, pickF(table[c])])) as Record<(typeof NUMERIC_COLUMNS)[number], Float64Array>;
  return {
    length: n,
    run: pickS(table.run),
    condition: pickS(table.condition),
    source: pickS(table.source),
    source_line: sourceLine,
    status: pickS(table.status),
    ...numeric,
    extra,
  };
}
