import { createRequire } from 'node:module';
import type * as Flechette from '@uwdata/flechette';
import { emptyRaw } from './RawTable.js';
import type { RawTable, RawValue } from './RawTable.js';

// flechette is loaded when an Arrow log is read, not whenever ingest starts (~50 ms).
const requireHere = createRequire(import.meta.url);

/** An Arrow IPC file or stream: each column as read (numbers stay typed, 64-bit integers become numbers). */
export function rawFromArrow(bytes: Uint8Array): RawTable {
  const { tableFromIPC } = requireHere('@uwdata/flechette') as typeof Flechette;
  const table = tableFromIPC(bytes, { useBigInt: false });
  const raw = emptyRaw('arrow');
  raw.length = table.numRows;
  raw.lines = Array.from({ length: table.numRows }, (_, i) => i + 1);
  for (const field of table.schema.fields) {
    const values = table.getChild(field.name).toArray() as ArrayLike<unknown>;
    raw.names.push(field.name);
    // Copied: the bytes are a buffer the next file is read into, and flechette's columns can be views of them.
    if (values instanceof Float64Array) raw.columns.push(values.slice());
    else if (ArrayBuffer.isView(values)) raw.columns.push(Float64Array.from(values as ArrayLike<number>));
    else raw.columns.push(Array.from(values as ArrayLike<unknown>, (v) => (typeof v === 'bigint' ? Number(v) : (v as RawValue))));
  }
  return raw;
}
