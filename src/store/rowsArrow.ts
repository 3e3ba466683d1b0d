import { createRequire } from 'node:module';
import type * as Flechette from '@uwdata/flechette';
import { emptyTable, NUMERIC_COLUMNS, STRING_COLUMNS } from './RowTable.js';
import type { RowTable, RunStatus, TextCodes, TextColumn } from './RowTable.js';
import { dictionaryEncode } from './dictionaryEncode.js';
import { attachTextCodes, lazyProperty } from './textCodes.js';
import { pieceWriter } from './concatTable.js';
import type { PieceWriter } from './concatTable.js';

// flechette (~50 ms to load) only once rows are encoded or decoded: `datlas ingest` of unchanged
// files, which reads just the manifest, never pays for it.
const requireHere = createRequire(import.meta.url);
let flechette: typeof Flechette | null = null;
const fl = (): typeof Flechette => (flechette ??= requireHere('@uwdata/flechette') as typeof Flechette);

/** Column order in rows.arrow: run, seed, the axes, condition, metrics, status, provenance, extras. */
export const STORE_COLUMNS = ['run', 'seed', 'width', 'epochs', 'train_size', 'label_noise', 'condition', 'test_error', 'train_error',
  'test_loss', 'train_loss', 'wall_seconds', 'status', 'source', 'source_line'] as const;

/**
 * Encodes a RowTable as an Arrow IPC file (readable by pyarrow, pandas.read_feather, polars,
 * DuckDB). Numbers are float64 (NaN for missing), text columns are dictionary-encoded utf8,
 * source_line is int32. With a sink, the file streams to it; `sink.write` must be done with the
 * bytes when it returns (buffers are reused).
 */
export function rowsToArrow(t: RowTable, sink?: { write(bytes: Uint8Array): void }, metadata?: Record<string, string>): Uint8Array | null {
  const data: [string, unknown[] | Float64Array | Int32Array | TextCodes][] = [];
  const { columnFromArray, dictionary, float64, int32, tableFromArrays, tableFromColumns, tableToIPC, utf8 } = fl();
  const types: Record<string, ReturnType<typeof dictionary>> = {};
  // Columns of a concatenation (a merged ingest) that were never built are streamed from their
  // pieces: flechette lays out the file around a stand-in array of the right size, and the sink
  // writes the pieces where the stand-in's bytes would go. All stand-ins of one type share one
  // uninitialised buffer, never touched (so never given memory; zeroed ones cost ~20 ms each):
  // flechette writes the columns in schema order, so each write of it is the next column queued.
  const standIns = new Map<ArrayBufferLike, PieceWriter[]>();
  let f64: Float64Array | null = null;
  let i32: Int32Array | null = null;
  const piecewise = <A extends Float64Array | Int32Array>(real: () => A, kind: 'f64' | 'i32', writer: PieceWriter | null): A => {
    if (!sink || !writer || t.length === 0) return real();
    const standIn = (kind === 'f64' ? (f64 ??= new Float64Array(Buffer.allocUnsafeSlow(t.length * 8).buffer, 0, t.length)) : (i32 ??= new Int32Array(Buffer.allocUnsafeSlow(t.length * 4).buffer, 0, t.length))) as A;
    const queue = standIns.get(standIn.buffer) ?? [];
    queue.push(writer);
    standIns.set(standIn.buffer, queue);
    return standIn;
  };
  for (const c of STORE_COLUMNS) {
    // Typed arrays without a declared type take flechette's zero-copy path (Int32 → int32, Float64 → float64).
    if (c === 'source_line') {
      data.push([c, piecewise(() => t.source_line, 'i32', pieceWriter(t, c))]);
    } else if ((NUMERIC_COLUMNS as readonly string[]).includes(c)) {
      const name = c as (typeof NUMERIC_COLUMNS)[number];
      data.push([c, piecewise(() => t[name], 'f64', pieceWriter(t, name))]);
    } else {
      // Coded columns (a store read back, a merged ingest) go out as they are, never decoded.
      const coded = t.length > 0 ? t.codes?.[c as TextColumn] : undefined;
      const keys = coded && piecewise(() => coded.codes, 'i32', pieceWriter(t, { codes: c as TextColumn }));
      data.push([c, coded ? { dict: coded.dict, codes: keys! } : c === 'status' ? t.status : t[c as (typeof STRING_COLUMNS)[number]]]);
      types[c] = dictionary(utf8(), int32());
    }
  }
  for (const name of Object.keys(t.extra)) {
    if ((STORE_COLUMNS as readonly string[]).includes(name)) continue;
    data.push([name, piecewise(() => t.extra[name], 'f64', pieceWriter(t, { extra: name }))]);
  }
  // An empty typed array has no batch to take its type from: declare it.
  if (t.length === 0) {
    for (const [name, col] of data) {
      if (col instanceof Float64Array) types[name] = float64() as never;
      else if (col instanceof Int32Array) types[name] = int32() as never;
    }
  }
  // Text columns are dictionary-encoded here (keys looked up once per stretch of equal values),
  // number columns passed zero-copy; flechette's per-value builder took ~0.5 s per million rows.
  // An empty table takes flechette's builder, which declares the types of empty columns.
  const table =
    t.length > 0
      ? tableFromColumns(data.map(([name, col]) => [name, name in types ? dictionaryColumn(col as readonly string[] | TextCodes) : columnFromArray(col as Float64Array)] as [string, Flechette.Column<unknown>]))
      : // flechette's typings want plain arrays or typed arrays; ours are exactly that.
        tableFromArrays(data as [string, unknown[]][], { types });
  // Schema metadata (the store's commit id) is written into the file's schema and footer.
  if (metadata) table.schema.metadata = new Map(Object.entries(metadata));
  if (!sink) return tableToIPC(table, { format: 'file' })!;
  // Stream the encoded batches to the sink (a file) instead of assembling one big buffer.
  const emit = (b: Uint8Array) => sink.write(b);
  const s = {
    write: (b: Uint8Array) => {
      const queue = b.byteOffset === 0 ? standIns.get(b.buffer) : undefined;
      if (queue && b.byteLength === b.buffer.byteLength) queue.shift()!(emit);
      else sink.write(b);
    },
    pad: (n: number) => sink.write(new Uint8Array(n)),
    finish: () => null,
  };
  // flechette's typings omit the sink option that encodeIPC accepts.
  tableToIPC(table, { format: 'file', sink: s } as Parameters<typeof tableToIPC>[1]);
  return null;
}

/** A dictionary-encoded utf8 column (int32 keys, no nulls: a missing text is ""). */
function dictionaryColumn(values: readonly string[] | TextCodes): Flechette.Column<unknown> {
  const { batchType, Column, columnFromValues, dictionary, int32, utf8 } = fl();
  const { dict, codes: keys } = Array.isArray(values) ? dictionaryEncode(values as readonly string[]) : (values as TextCodes);
  const type = dictionary(utf8(), int32());
  // flechette types batchType's result as any: it is the DictionaryBatch class for this type.
  const DictBatch = batchType(type);
  const batch = new DictBatch({ length: keys.length, nullCount: 0, type, validity: new Uint8Array(0), values: keys });
  // The dictionary column must carry the very value-type object of `type`: the IPC writer finds ids by it.
  batch.setDictionary(columnFromValues(dict as string[], type.dictionary));
  return new Column([batch], type);
}

/** Schema metadata key of the commit id shared by rows.arrow and manifest.json. */
export const COMMIT_KEY = 'datlas.commit';

/** Decodes rows.arrow back into a RowTable (columns beyond the canonical ones become extras). */
export function rowsFromArrow(bytes: Uint8Array): RowTable {
  return readRowsArrow(bytes).table;
}

/** Decodes rows.arrow with the commit id it carries (null for files without one). */
export function readRowsArrow(bytes: Uint8Array): { table: RowTable; commit: string | null } {
  const table = fl().tableFromIPC(bytes, { useBigInt: false });
  const commit = table.schema.metadata?.get(COMMIT_KEY) ?? null;
  return { table: rowsOf(table), commit };
}

function rowsOf(table: ReturnType<typeof Flechette.tableFromIPC>): RowTable {
  const names = table.schema.fields.map((f) => f.name);
  const canonical = new Set<string>(STORE_COLUMNS);
  const extraNames = names.filter((n) => !canonical.has(n));
  const length = table.numRows;
  // Defaults only for columns the file lacks (allocating all of them costs ~100 MB per million rows).
  let defaults: RowTable | null = null;
  const dflt = () => (defaults ??= emptyTable(length, extraNames));
  const num = (name: string): Float64Array => {
    const v = table.getChild(name).toArray() as ArrayLike<number | null>;
    return v instanceof Float64Array ? v : Float64Array.from(v, (x) => (x === null ? NaN : Number(x)));
  };
  const out = { length, extra: {} as Record<string, Float64Array> } as { -readonly [K in keyof RowTable]: RowTable[K] };
  for (const c of NUMERIC_COLUMNS) (out as Record<string, unknown>)[c] = names.includes(c) ? num(c) : dflt()[c];
  // Text columns are kept as the file's dictionary codes and decoded on first use: a map never
  // builds the million-element string arrays (nor looks at `source` at all).
  const codes: Partial<Record<TextColumn, TextCodes>> = {};
  const asStatus = (s: string): RunStatus => (s === 'diverged' ? 'diverged' : 'ok');
  for (const c of [...STRING_COLUMNS, 'status'] as const) {
    if (!names.includes(c)) {
      (out as Record<string, unknown>)[c] = dflt()[c];
      continue;
    }
    const col = table.getChild(c);
    const f = c === 'status' ? asStatus : (s: string) => s;
    const coded = dictionaryCodes(col, f);
    if (coded) codes[c] = coded;
    else lazyProperty(out, c, () => textColumn(col, f));
  }
  attachTextCodes(out, codes);
  if (names.includes('source_line')) {
    const v = table.getChild('source_line').toArray() as ArrayLike<number>;
    out.source_line = v instanceof Int32Array ? v : Int32Array.from(v);
  } else out.source_line = dflt().source_line;
  for (const e of extraNames) out.extra[e] = num(e);
  return out;
}

/** Dictionary batch internals flechette exposes: the keys and the decoded dictionary. */
interface DictBatch {
  length: number;
  nullCount: number;
  values: ArrayLike<number>;
  cache?: ArrayLike<string | null>;
  at(i: number): unknown;
}

/** A text column's codes and dictionary, when it is one dictionary batch without nulls (as our writer makes it). */
function dictionaryCodes(col: ReturnType<ReturnType<typeof Flechette.tableFromIPC>['getChild']>, f: (s: string) => string): TextCodes | null {
  const batches = col.data as unknown as DictBatch[];
  if (batches.length !== 1) return null;
  const b = batches[0];
  if (b.nullCount !== 0 || !b.cache || !(b.values instanceof Int32Array) || b.values.length < b.length) return null;
  return { codes: b.values.subarray(0, b.length), dict: Array.from(b.cache, (s) => f(s ?? '')) };
}

/**
 * A text column as strings ("" for null), each passed through `f`. Dictionary batches without
 * nulls are decoded straight from their keys, `f` applied once per dictionary entry (one array
 * lookup per row instead of a method call per row).
 */
function textColumn<S extends string>(col: ReturnType<ReturnType<typeof Flechette.tableFromIPC>['getChild']>, f: (s: string) => S): S[] {
  const out = new Array<S>(col.length);
  let k = 0;
  for (const b of col.data as unknown as DictBatch[]) {
    const keys = b.values;
    const dict = b.cache;
    if (b.nullCount === 0 && dict && keys && keys.length >= b.length) {
      const mapped = Array.from(dict, (s) => f(s ?? ''));
      for (let i = 0; i < b.length; i++) out[k++] = mapped[keys[i]] ?? f('');
    } else {
      for (let i = 0; i < b.length; i++) {
        const v = b.at(i);
        out[k++] = f(v === null || v === undefined ? '' : String(v));
      }
    }
  }
  return out;
}
