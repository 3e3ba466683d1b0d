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

function gather(c: Concatenation, col: ConcatColumn): Float64Array | Int32Array {
  const out = col === 'source_line' ? new Int32Array(c.length) : new Float64Array(c.length);
  let k = 0;
  for (const p of c.pieces) {
    const n = p.rows ? p.rows.length : p.table.length;
    const v = p.rows ? undefined : constantOf(p, col);
    if (v !== undefined) out.fill(v, k, k + n);
    else {
      const src = valuesOf(p.table, col);
      if (!src) out.fill(NaN, k, k + n);
      else if (!p.rows) out.set(src, k);
      else for (let r = 0; r < n; r++) out[k + r] = src[p.rows[r]];
    }
    k += n;
  }
  return out;
}

function gatherCodes(c: Concatenation, x: ConcatText): Int32Array {
  const out = new Int32Array(c.length);
  let k = 0;
  c.pieces.forEach((p, i) => {
    const n = p.rows ? p.rows.length : p.table.length;
    const codes = x.codes[i];
    if (typeof codes === 'number') out.fill(codes, k, k + n);
    else out.set(codes, k);
    k += n;
  });
  return out;
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
    return (emit) => {
      let scratch = new Int32Array(0);
      c.pieces.forEach((p, i) => {
        const n = p.rows ? p.rows.length : p.table.length;
        const codes = x.codes[i];
        if (typeof codes !== 'number') return emitView(emit, codes);
        if (scratch.length < n) scratch = new Int32Array(n);
        emitView(emit, scratch.fill(codes, 0, n).subarray(0, n));
      });
    };
  }
  const owner = typeof column === 'object' ? t.extra : t;
  const key = typeof column === 'object' ? column.extra : column;
  if (!pending(owner, key)) return null;
  const int = column === 'source_line';
  return (emit) => {
    let scratch: Float64Array | Int32Array = int ? new Int32Array(0) : new Float64Array(0);
    const room = (n: number) => {
      if (scratch.length < n) scratch = int ? new Int32Array(n) : new Float64Array(n);
      return scratch.subarray(0, n);
    };
    for (const p of c.pieces) {
      const n = p.rows ? p.rows.length : p.table.length;
      const v = p.rows ? undefined : constantOf(p, column);
      const src = v === undefined ? valuesOf(p.table, column) : undefined;
      if (v !== undefined || !src) emitView(emit, room(n).fill(v ?? NaN));
      else if (!p.rows) emitView(emit, src);
      else {
        const out = room(n);
        for (let r = 0; r < n; r++) out[r] = src[p.rows[r]];
        emitView(emit, out);
      }
    }
  };
}

function emitView(emit: (bytes: Uint8Array) => void, a: Float64Array | Int32Array): void {
  if (a.length > 0) emit(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
}
