import type { RowTable, TextColumn } from './RowTable.js';
import { NUMERIC_COLUMNS, textReader } from './RowTable.js';

/** A new table holding the rows at `indices` (in that order); columns are copied, never shared. */
export function selectRows(table: RowTable, indices: ArrayLike<number>): RowTable {
  const n = indices.length;
  // Text through the codes when the table has them: the whole columns need not be decoded.
  const pickS = <C extends TextColumn>(name: C): RowTable[C][number][] => {
    const at = textReader(table, name);
    const out = new Array<RowTable[C][number]>(n);
    for (let k = 0; k < n; k++) out[k] = at(indices[k]);
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
    run: pickS('run'),
    condition: pickS('condition'),
    source: pickS('source'),
    source_line: sourceLine,
    status: pickS('status'),
    ...numeric,
    extra,
  };
}
