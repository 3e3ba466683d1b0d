import { describe, expect, it } from 'vitest';
import { tableFromIPC } from 'apache-arrow';
import { readRowsArrow, rowsToArrow } from '../../src/store/rowsArrow.js';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import { textReader, textValues } from '../../src/store/RowTable.js';
import type { RowTable } from '../../src/store/RowTable.js';
import { selectRows } from '../../src/store/selectRows.js';

// A store read keeps its text columns as the Arrow dictionary codes (Arrow columnar format,
// "Dictionary-encoded Layout") and decodes them only when asked; both views must agree row by row.
const rows = Array.from({ length: 300 }, (_, i) => ({
  run: `r${i % 7}`,
  condition: i % 3 === 0 ? 'optimizer=adam' : '',
  source: `/logs/f${i % 5}.csv`,
  source_line: i + 2,
  status: (i % 11 === 0 ? 'diverged' : 'ok') as 'ok' | 'diverged',
  seed: i % 4,
  width: 2 ** (i % 6),
  epochs: i,
  test_error: i / 300,
}));

function roundTrip(): RowTable {
  const bytes = rowsToArrow(tableFromRows(rows))!;
  return readRowsArrow(bytes).table;
}

describe('rows.arrow text columns as codes', () => {
  it('reads codes whose values equal the decoded columns and an independent reader (apache-arrow)', () => {
    const bytes = rowsToArrow(tableFromRows(rows))!;
    const t = readRowsArrow(bytes).table;
    const ref = tableFromIPC(bytes);
    for (const name of ['run', 'condition', 'source', 'status'] as const) {
      expect(t.codes?.[name]).toBeDefined();
      const at = textReader(t, name);
      const independent = Array.from(ref.getChild(name)!.toArray() as ArrayLike<string>);
      for (let i = 0; i < t.length; i++) {
        expect(at(i)).toBe(independent[i]);
        expect(t[name][i]).toBe(independent[i]);
      }
      expect(textValues(t, name).sort()).toEqual([...new Set(independent)].sort());
    }
  });

  it('selects the same rows through codes as through decoded columns', () => {
    const coded = roundTrip();
    const picked = [5, 0, 299, 33, 33, 150];
    const viaCodes = selectRows(coded, picked);
    // The same table without codes (decoded arrays only).
    const plain = { ...roundTrip(), codes: undefined };
    const viaArrays = selectRows(plain, picked);
    expect(viaCodes).toEqual(viaArrays);
    expect(viaCodes.run).toEqual(picked.map((i) => rows[i].run));
    expect(viaCodes.status).toEqual(picked.map((i) => rows[i].status));
    expect(viaCodes.codes).toBeUndefined();
  });

  it('leaves tables built in memory without codes (readers fall back to the arrays)', () => {
    const t = tableFromRows(rows);
    expect(t.codes).toBeUndefined();
    expect(textReader(t, 'condition')(3)).toBe('optimizer=adam');
    expect(textValues(t, 'run')).toHaveLength(7);
  });
});
