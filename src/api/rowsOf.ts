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

/** A column's values as an indexable array: arquero keeps plain arrays and typed arrays as they are; other column kinds (Arrow) are read out once. */
function rawColumn(t: ArqueroTable, name: string): ArrayLike<unknown> {
  const col = t.column(name) as unknown;
  if (Array.isArray(col) || ArrayBuffer.isView(col)) return col as ArrayLike<unknown>;
  const c = col as { toArray?: () => unknown; [Symbol.iterator](): Iterator<unknown> };
  const arr = c.toArray?.();
  if (Array.isArray(arr) || ArrayBuffer.isView(arr)) return arr as ArrayLike<unknown>;
  return Array.from(c as Iterable<unknown>);
}

/**
 * arquero → RowTable: numbers as Float64Array (NaN for null), text as string arrays. Only the
 * active rows, in the table's order. An unfiltered, unordered Float64Array column is shared, not
 * copied (the analyses never write to their input); every other column is gathered by row index
 * in one pass (arquero's own per-value readers cost about a second per million rows).
 */
export function fromArquero(t: ArqueroTable): RowTable {
  const names = new Set(t.columnNames());
  const missing = ['run', 'width', 'epochs', 'train_size'].filter((c) => !names.has(c));
  if (missing.length) throw new UserError(apiText.arqueroColumns(missing));
  const length = t.numRows();
  const idx: Uint32Array | null = t.isFiltered() || t.isOrdered() ? t.indices(true) : null;
  const numbers = (name: string): Float64Array => {
    const raw = rawColumn(t, name);
    if (raw instanceof Float64Array && !idx) return raw;
    const out = new Float64Array(length);
    if (ArrayBuffer.isView(raw)) {
      const src = raw as unknown as ArrayLike<number>;
      for (let k = 0; k < length; k++) out[k] = src[idx ? idx[k] : k];
    } else {
      for (let k = 0; k < length; k++) {
        const v = raw[idx ? idx[k] : k];
        out[k] = v === null || v === undefined ? NaN : Number(v);
      }
    }
    return out;
  };
  const text = (name: string): string[] => {
    const raw = rawColumn(t, name);
    const out = new Array<string>(length);
    for (let k = 0; k < length; k++) {
      const v = raw[idx ? idx[k] : k];
      out[k] = typeof v === 'string' ? v : v === null || v === undefined ? '' : String(v);
    }
    return out;
  };
  const extraNames = [...names].filter((n) => !(STORE_COLUMNS as readonly string[]).includes(n) && isNumberColumn(rawColumn(t, n)));
  const out = emptyTable(0) as { -readonly [K in keyof RowTable]: RowTable[K] };
  out.length = length;
  // Defaults only for the columns the table lacks.
  let defaults: RowTable | null = null;
  const dflt = (): RowTable => (defaults ??= emptyTable(length));
  for (const c of NUMERIC_COLUMNS) out[c] = names.has(c) ? numbers(c) : dflt()[c];
  for (const c of STRING_COLUMNS) out[c] = names.has(c) ? text(c) : dflt()[c];
  out.status = names.has('status') ? text('status').map((s): RunStatus => (s === 'diverged' ? 'diverged' : 'ok')) : dflt().status;
  out.source_line = names.has('source_line') ? Int32Array.from(numbers('source_line')) : dflt().source_line;
  out.extra = {};
  for (const e of extraNames) out.extra[e] = numbers(e);
  return out;
}

/** Whether a column holds numbers (a typed array, or a plain array whose first non-null value is a number). */
function isNumberColumn(raw: ArrayLike<unknown>): boolean {
  if (ArrayBuffer.isView(raw)) return true;
  for (let i = 0; i < raw.length; i++) if (raw[i] !== null && raw[i] !== undefined) return typeof raw[i] === 'number';
  return false;
}
