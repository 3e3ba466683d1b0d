// Long-form rows told apart by a split column (invented data; common practice in tidy logs).
import { describe, expect, it } from 'vitest';
import { splitLongRows } from '../../src/ingest/splitColumn.js';
import type { RawTable } from '../../src/ingest/RawTable.js';

const table = (names: string[], rows: unknown[][]): RawTable => ({
  format: 'csv', names, columns: names.map((_, j) => rows.map((r) => r[j])) as RawTable['columns'], length: rows.length,
  lines: rows.map((_, i) => i + 2), rowErrors: new Map(), constants: {}, pendingLine: 0,
});

describe('splitLongRows', () => {
  it('turns a bare metric into <split>_<metric> on its own rows and drops the split column', () => {
    const raw = table(['epoch', 'split', 'error'], [[1, 'train', 0.3], [1, 'test', 0.5]]);
    expect(splitLongRows(raw)).toEqual({ column: 'split', splits: ['train', 'test'], metrics: ['error'] });
    expect(raw.names).toEqual(['epoch', 'train_error', 'test_error']);
    expect(raw.columns.map((c) => [...(c as unknown[])])).toEqual([[1, 1], [0.3, undefined], [undefined, 0.5]]);
  });

  it('leaves a table alone when the column holds other words (mode: sgd) or no metric lacks its split', () => {
    const a = table(['mode', 'error'], [['sgd', 0.3]]);
    expect(splitLongRows(a)).toBeNull();
    expect(a.names).toEqual(['mode', 'error']);
    expect(splitLongRows(table(['split', 'test_error'], [['test', 0.3]]))).toBeNull();
  });
});
