import { NUMERIC_COLUMNS } from './RowTable.js';
import type { NumericColumn, RowTable, TextCodes, TextColumn } from './RowTable.js';
import { attachTextCodes, lazyProperty, TEXT_COLUMNS } from './textCodes.js';

/** Rows of one table, in order: all of them (`rows` null) or those listed. */
export interface TablePiece {
  table: RowTable;
  rows: Int32Array | null;
}

/** A text column over all pieces: one dictionary, and per piece its codes in it or the one code all its rows hold. */
export interface ConcatText {
  dict: readonly string[];
  codes: (Int32Array | number)[];
}

/** The rows of several tables one after another. */
export interface Concatenation {
  length: number;
  pieces: TablePiece[];
  extraNames: readonly string[];
  text: Record<TextColumn, ConcatText>;
}

/** A number column: canonical, source_line, or an extra. */
export type ConcatColumn = NumericColumn | 'source_line' | { extra: string };

const CONCAT = Symbol('concatenation');

/**
 * The rows of several tables one after another, made without copying them: each column is built
 * only when first read, and a writer takes the pieces instead (`pieceWriter`). An ingest's merge
 * hands its result to the store writer this way: building the 100 MB of merged columns first,
 * only to write them out, cost ~0.2 s of fresh memory. Reading a column fixes it; the pieces'
 * tables must not change after the concatenation is made.
 */
export function concatTable(c: Concatenation): RowTable {
  const t = { length: c.length, extra: {} } as { -readonly [K in keyof RowTable]: RowTable[K] };
  for (const name of NUMERIC_COLUMNS) lazyProperty(t, name, () => gather(c, name) as Float64Array);
  lazyProperty(t, 'source_line', () => gather(c, 'source_line') as Int32Array);
  for (const e of c.extraNames) lazyProperty(t.extra, e, () => gather(c, { extra: e }) as Float64Array);
  const codes: Partial<Record<TextColumn, TextCodes>> = {};
  for (const name of TEXT_COLUMNS) {
    const x = c.text[name];
    const coded = { dict: x.dict } as { dict: readonly string[]; codes: Int32Array };
    lazyProperty(coded, 'codes', () => gatherCodes(c, x));
    codes[name] = coded;
  }
  attachTextCodes(t, codes);
  Object.defineProperty(t, CONCAT, { value: c, enumerable: false });
  return t;
}

/** Whether `obj[key]` is still to be built (never read). */
function pending(obj: object, key: PropertyKey): boolean {
  return Object.getOwnPropertyDescriptor(obj, key)?.get !== undefined;
}

function valuesOf(t: RowTable, col: ConcatColumn): Float64Array | Int32Array | undefined {
  if (typeof col === 'object') return t.extra[col.extra];
  return col === 'source_line' ? t.source_line : t[col];
}

/** The one value every row of piece p holds in `col`, when its table knows one (no read of the column). */
function constantOf(p: TablePiece, col: ConcatColumn): number | undefined {
  if (typeof col === 'object' || col === 'source_line') return undefined;
  return p.table.constants?.[col];
}

type Values = Float64Array | Int32Array;

/**
 * Hands over a number column piece by piece, in order: a piece's own array when it is kept
 * whole, else its values gathered (or its constant, or NaN for an extra it lacks) into a scratch
 * array reused for the next piece. Building a column and writing one both go through here.
 */
function eachPiece(c: Concatenation, col: ConcatColumn, take: (values: Values) => void): void {
  const int = col === 'source_line';
  let scratch: Values = int ? new Int32Array(0) : new Float64Array(0);
  const room = (n: number): Values => {
    if (scratch.length < n) scratch = int ? new Int32Array(n) : new Float64Array(n);
    return scratch.subarray(0, n);
  };
  for (const p of c.pieces) {
    const n = p.rows ? p.rows.length : p.table.length;
    const v = p.rows ? undefined : constantOf(p, col);
    const src = v === undefined ? valuesOf(p.table, col) : undefined;
    if (v !== undefined || !src) take(room(n).fill(v ?? NaN));
    else if (!p.rows) take(src);
    else {
      const out = room(n);
      for (let r = 0; r < n; r++) out[r] = src[p.rows[r]];
      take(out);
    }
  }
}

/** The same for a text column's codes: a piece's own codes, or its one code repeated. */
function eachCodes(c: Concatenation, x: ConcatText, take: (codes: Int32Array) => void): void {
  let scratch = new Int32Array(0);
  c.pieces.forEach((p, i) => {
    const n = p.rows ? p.rows.length : p.table.length;
    const codes = x.codes[i];
    if (typeof codes !== 'number') return take(codes);
    if (scratch.length < n) scratch = new Int32Array(n);
    take(scratch.fill(codes, 0, n).subarray(0, n));
  });
}

/** Copies what `each` hands over into one array of the concatenation's length. */
function gatherInto<A extends Values>(out: A, each: (take: (values: Values) => void) => void): A {
  let k = 0;
  each((values) => {
    out.set(values, k);
    k += values.length;
  });
  return out;
}

function gather(c: Concatenation, col: ConcatColumn): Values {
  const out = col === 'source_line' ? new Int32Array(c.length) : new Float64Array(c.length);
  return gatherInto(out, (take) => eachPiece(c, col, take));
}

function gatherCodes(c: Concatenation, x: ConcatText): Int32Array {
  return gatherInto(new Int32Array(c.length), (take) => eachCodes(c, x, take));
}

/** Bytes of a column for a writer: `emit` must be done with each array when it returns (it is reused). */
export type PieceWriter = (emit: (bytes: Uint8Array) => void) => void;

/**
 * Writes one column of a concatenation piece by piece, or null when `t` is not one or the column
 * was read (then the table's own column is the truth). `column` is a number column or a text
 * column's codes.
 */
export function pieceWriter(t: RowTable, column: ConcatColumn | { codes: TextColumn }): PieceWriter | null {
  const c = (t as unknown as { [CONCAT]?: Concatenation })[CONCAT];
  if (!c) return null;
  if (typeof column === 'object' && 'codes' in column) {
    const coded = t.codes?.[column.codes];
    if (!coded || !pending(coded, 'codes')) return null;
    const x = c.text[column.codes];
    return (emit) => eachCodes(c, x, (codes) => emitView(emit, codes));
  }
  const owner = typeof column === 'object' ? t.extra : t;
  const key = typeof column === 'object' ? column.extra : column;
  if (!pending(owner, key)) return null;
  return (emit) => eachPiece(c, column, (values) => emitView(emit, values));
}

function emitView(emit: (bytes: Uint8Array) => void, a: Values): void {
  if (a.length > 0) emit(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
}
