import type { ColumnTable } from 'arquero';
import { emptyTable, NUMERIC_COLUMNS, STRING_COLUMNS } from '../store/RowTable.js';
import type { RowTable, RunStatus } from '../store/RowTable.js';
import { STORE_COLUMNS } from '../store/rowsArrow.js';
import { apiText } from '../messages.js';
import { UserError } from '../UserError.js';
import type { Store } from './Store.js';

/** An arquero table: the store's rows after arquero verbs (filter, derive, join ...). */
export type ArqueroTable = ColumnTable;

/**
 * What the functions that read rows accept: a store (openStore), an arquero table with the
 * canonical columns (store.toArquero() after any verbs), or a RowTable (the typed-array table inside).
 */
export type RowsInput = Store | ArqueroTable | RowTable;

function isArquero(x: object): x is ArqueroTable {
  const t = x as Partial<ArqueroTable>;
  return typeof t.columnNames === 'function' && typeof t.numRows === 'function' && typeof t.array === 'function';
}

function isStore(x: object): x is Store {
  return 'table' in x && 'manifest' in x && typeof (x as Store).toArquero === 'function';
}

/**
 * The typed-array RowTable behind any accepted input. An arquero table is converted once, here at
 * the boundary (its active rows in its order: filters and orderby are honoured); everything past
 * this point runs on typed arrays. Columns it lacks take the store's defaults (NaN, "", "ok"), but
 * it must have the axes a sweep is keyed by.
 */
export function rowsOf(input: RowsInput): RowTable {
  if (input === null || typeof input !== 'object') throw new UserError(apiText.notRows(typeof input));
  if (isStore(input)) return input.table;
  if (isArquero(input)) return fromArquero(input);
  if ('length' in input && input.width instanceof Float64Array) return input;
  throw new UserError(apiText.notRows('an object without rows'));
}

/** arquero → RowTable: numbers as Float64Array (NaN for null), text as string arrays. */
export function fromArquero(t: ArqueroTable): RowTable {
  const names = new Set(t.columnNames());
  const missing = ['run', 'width', 'epochs', 'train_size'].filter((c) => !names.has(c));
  if (missing.length) throw new UserError(apiText.arqueroColumns(missing));
  const length = t.numRows();
  const extraNames = [...names].filter((n) => !(STORE_COLUMNS as readonly string[]).includes(n) && typeof firstValue(t, n) === 'number');
  const out = emptyTable(length, extraNames) as { -readonly [K in keyof RowTable]: RowTable[K] };
  const numbers = (name: string): Float64Array => {
    const v = t.array(name, Float64Array) as Float64Array;
    // Arrow-backed columns with nulls come through as 0 in a Float64Array: read them as values instead.
    const col = t.column(name) as { nullCount?: number } | undefined;
    if (col && typeof col.nullCount === 'number' && col.nullCount > 0) {
      const vals = t.array(name) as ArrayLike<unknown>;
      return Float64Array.from({ length }, (_, i) => (vals[i] === null || vals[i] === undefined ? NaN : Number(vals[i])));
    }
    return v;
  };
  const text = (name: string): string[] => {
    const vals = t.array(name) as ArrayLike<unknown>;
    const a = new Array<string>(length);
    for (let i = 0; i < length; i++) a[i] = vals[i] === null || vals[i] === undefined ? '' : String(vals[i]);
    return a;
  };
  for (const c of NUMERIC_COLUMNS) if (names.has(c)) out[c] = numbers(c);
  for (const c of STRING_COLUMNS) if (names.has(c)) out[c] = text(c);
  if (names.has('status')) out.status = text('status').map((s): RunStatus => (s === 'diverged' ? 'diverged' : 'ok'));
  if (names.has('source_line')) out.source_line = Int32Array.from(t.array('source_line', Float64Array) as Float64Array);
  for (const e of extraNames) out.extra[e] = numbers(e);
  return out;
}

function firstValue(t: ArqueroTable, name: string): unknown {
  return t.numRows() > 0 ? t.get(name, 0) : undefined;
}
