import { describe, expect, it } from 'vitest';
import { tableFromIPC } from 'apache-arrow';
import { concatTable } from '../../src/store/concatTable.js';
import type { Concatenation } from '../../src/store/concatTable.js';
import { rowsToArrow } from '../../src/store/rowsArrow.js';
import { tableFromRows, tableToRows } from '../../src/store/tableFromRows.js';
import { NUMERIC_COLUMNS } from '../../src/store/RowTable.js';
import type { RowTable } from '../../src/store/RowTable.js';
import { packTable, unpackTable } from '../../src/ingest/readSourceFile.js';
import { DictionaryBuilder, TEXT_COLUMNS } from '../../src/store/textCodes.js';

// Three sources: one with constant columns as a worker sends it, one with an extra column and
// varying text, one of which only some rows are kept.
const rowsA = Array.from({ length: 40 }, (_, i) => ({ run: 'a', source: '/a.jsonl', source_line: i + 1, seed: 1, width: 64, train_size: 500, epochs: i + 1, test_error: 0.5 - i / 100 }));
const rowsB = Array.from({ length: 30 }, (_, i) => ({ run: `b${i % 3}`, condition: i % 2 ? 'opt=sgd' : '', source: '/b.csv', source_line: i + 2, seed: i % 3, width: 8, train_size: 200, epochs: i, test_error: i / 30, status: (i === 7 ? 'diverged' : 'ok') as 'ok' | 'diverged', extra: { sigma2: i * 0.5 } }));
const rowsC = Array.from({ length: 20 }, (_, i) => ({ run: 'c', source: '/c.csv', source_line: i + 2, seed: 0, width: 16, train_size: 100, epochs: i, train_error: 1 / (i + 1) }));

function build(): { concat: RowTable; expected: RowTable } {
  const a = unpackTable(structuredClone(packTable(tableFromRows(rowsA)).packed));
  const b = tableFromRows(rowsB);
  const c = tableFromRows(rowsC);
  const keepC = Int32Array.from([0, 3, 4, 19]);
  const pieces = [
    { table: a, rows: null },
    { table: b, rows: null },
    { table: c, rows: keepC },
  ];
  const text = {} as Concatenation['text'];
  for (const name of TEXT_COLUMNS) {
    const builder = new DictionaryBuilder();
    const codes = pieces.map(({ table, rows }) => {
      const values = table[name] as readonly string[];
      const picked = rows ? Array.from(rows, (r) => values[r]) : values;
      return Int32Array.from(picked, (v) => builder.code(v));
    });
    text[name] = { dict: builder.dict, codes: codes.map((x) => (new Set(x).size === 1 ? x[0] : x)) };
  }
  const concat = concatTable({ length: 40 + 30 + 4, pieces, extraNames: ['sigma2'], text });
  const expected = tableFromRows([...rowsA, ...rowsB, ...[0, 3, 4, 19].map((i) => rowsC[i])]);
  return { concat, expected };
}

/** rows.arrow streamed through a sink, as the store writer does, read back by apache-arrow. */
function viaSink(t: RowTable) {
  const parts: Uint8Array[] = [];
  // The sink copies: the writer reuses its buffers once write returns.
  rowsToArrow(t, { write: (b) => void parts.push(b.slice()) });
  return tableFromIPC(Buffer.concat(parts));
}

describe('concatTable', () => {
  it('reads as the rows of its pieces one after another', () => {
    const { concat, expected } = build();
    expect(tableToRows(concat)).toEqual(tableToRows(expected));
  });

  it('streams to rows.arrow from its pieces what the copied table would hold (checked by apache-arrow)', () => {
    const { concat, expected } = build();
    const ref = viaSink(concat);
    const want = viaSink(expected);
    expect(ref.numRows).toBe(74);
    for (const f of want.schema.fields) {
      const got = Array.from(ref.getChild(f.name)!.toArray() as ArrayLike<unknown>);
      expect(got, f.name).toEqual(Array.from(want.getChild(f.name)!.toArray() as ArrayLike<unknown>));
    }
    // The streamed columns were never built.
    expect(Object.getOwnPropertyDescriptor(concat, 'width')?.get).toBeDefined();
  });

  it('a column read and changed before writing is written as changed', () => {
    const { concat } = build();
    concat.width[0] = 4096;
    concat.extra.sigma2[40] = -1;
    const ref = viaSink(concat);
    expect(ref.getChild('width')!.get(0)).toBe(4096);
    expect(ref.getChild('sigma2')!.get(40)).toBe(-1);
    for (const c of NUMERIC_COLUMNS) expect(ref.getChild(c)!.length).toBe(74);
  });
});
