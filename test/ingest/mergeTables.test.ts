import { describe, expect, it } from 'vitest';
import { mergeTables } from '../../src/ingest/mergeTables.js';
import { readRowsArrow, rowsToArrow } from '../../src/store/rowsArrow.js';
import { tableFromRows, tableToRows } from '../../src/store/tableFromRows.js';
import type { RowTable } from '../../src/store/RowTable.js';
import { packTable, unpackTable } from '../../src/ingest/readSourceFile.js';

// DESIGN.md §4: a row is one run at one epoch; equal rows are duplicates, different ones conflict
// and the newer source wins. The merge must give the same answer whether text columns arrive as
// strings (a file parsed on this thread) or as dictionary codes (a worker's result, a store read).
const row = (run: string, epochs: number, test_error: number, source: string, extra: Record<string, unknown> = {}) => ({
  run, epochs, test_error, source, source_line: epochs + 1, width: 64, train_size: 1000, seed: 0, condition: 'optimizer=adam', ...extra,
});

const existing = tableFromRows([row('r1', 1, 0.5, '/old.csv'), row('r1', 2, 0.4, '/old.csv'), row('r2', 1, 0.9, '/old.csv')]);
const a = tableFromRows([row('r1', 2, 0.4, '/a.csv'), row('r1', 3, 0.3, '/a.csv'), row('r3', 1, 0.7, '/a.csv', { status: 'diverged' })]);
const b = tableFromRows([row('r2', 1, 0.8, '/b.csv'), row('r3', 1, 0.7, '/b.csv', { status: 'diverged' }), row('r4', 5, 0.2, '/b.csv', { condition: '' })]);

const viaStore = (t: RowTable) => readRowsArrow(rowsToArrow(t)!).table;
const viaWorker = (t: RowTable) => unpackTable(structuredClone(packTable(t).packed));

function merge(wrap: (t: RowTable) => RowTable) {
  return mergeTables({
    existing: wrap(existing),
    existingMtime: () => 1,
    incoming: [
      { table: wrap(a), mtime: 2 },
      { table: wrap(b), mtime: 3 },
    ],
  });
}

describe('mergeTables over coded and plain text columns', () => {
  const plain = merge((t) => t);

  it('keeps, drops and settles conflicts as DESIGN.md §4 says', () => {
    // a: r1@2 repeats a stored row (duplicate), r1@3 and r3@1 are new; b: r2@1 differs from the
    // stored row and is newer (wins), r3@1 repeats a's row (duplicate), r4@5 is new.
    expect(plain.accepted).toEqual([2, 2]);
    expect(plain.duplicates).toEqual([1, 1]);
    expect(plain.conflicts).toBe(1);
    expect(plain.displaced).toBe(1); // the stored r2@1 lost to the newer /b.csv
    expect(plain.rejects.map((r) => r.source)).toEqual(['/old.csv']);
  });

  for (const [name, wrap] of [['store reads', viaStore], ['worker results', viaWorker]] as const) {
    it(`gives the same rows, counts and rejections for ${name}`, () => {
      const coded = merge(wrap);
      expect(tableToRows(coded.table)).toEqual(tableToRows(plain.table));
      expect({ ...coded, table: null }).toEqual({ ...plain, table: null });
    });
  }

  it('writes the merged codes to rows.arrow unchanged, and reads them back as the same strings', () => {
    const coded = merge(viaStore);
    expect(coded.table.codes?.run).toBeDefined();
    const back = viaStore(coded.table);
    expect(tableToRows(back)).toEqual(tableToRows(plain.table));
    // Every dictionary entry is used by some row (no value of a dropped row survives).
    for (const name of ['run', 'condition', 'source', 'status'] as const) {
      const c = coded.table.codes![name]!;
      expect(new Set(c.codes).size).toBe(c.dict.length);
    }
  });
});

describe('worker tables with constant columns', () => {
  it('sends a column holding one value as that value, and gives back the same table', () => {
    const t = tableFromRows([
      { ...row('r9', 1, 0.5, '/c.csv'), test_loss: -0 },
      { ...row('r9', 2, 0.4, '/c.csv'), test_loss: 0 },
    ]);
    const { packed } = packTable(t);
    // width, train_size and seed repeat; test_error varies; -0 and 0 are not one value.
    expect(packed.numeric.width).toBe(64);
    expect(Number.isNaN(packed.numeric.train_loss)).toBe(true);
    expect(packed.numeric.test_error).toBeInstanceOf(Float64Array);
    expect(packed.numeric.test_loss).toBeInstanceOf(Float64Array);
    expect(packed.text.run.codes).toBeNull();
    const back = unpackTable(structuredClone(packed));
    expect(tableToRows(back)).toEqual(tableToRows(t));
    expect(Object.is(back.test_loss[0], -0)).toBe(true);
  });

  it('a row completing a constant column of an earlier table is kept in the merged rows', () => {
    // Train and test metrics logged on separate lines of two files (DESIGN.md §4: one row per run
    // and epoch): the second file's test_loss completes the first file's rows.
    const first = tableFromRows([row('r5', 1, 0.5, '/train.csv'), row('r5', 2, 0.4, '/train.csv')]);
    const second = tableFromRows([
      { ...row('r5', 1, 0.5, '/test.csv'), test_loss: 1.25 },
      { ...row('r5', 2, 0.4, '/test.csv'), test_loss: 1.5 },
    ]);
    const m = mergeTables({
      existing: tableFromRows([]),
      existingMtime: () => 0,
      incoming: [
        { table: viaWorker(first), mtime: 1 },
        { table: viaWorker(second), mtime: 2 },
      ],
    });
    expect(m.merged).toBe(2);
    expect([...m.table.test_loss]).toEqual([1.25, 1.5]);
  });
});
