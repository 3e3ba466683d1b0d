import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { formatRejected, parseRejected, REJECTED_HEADER } from '../../src/store/rejectedCsv.js';
import type { Reject } from '../../src/store/Reject.js';

// rejected.csv is RFC 4180 CSV (§2.6–2.7: quotes around fields holding commas, quotes or line
// breaks; a quote doubled inside), read back when a later ingest replaces a source's rejections.
const hostile: Reject[] = [
  { source: '/logs/a,b.csv', line: 3, field: 'test_error', reason: 'not a number: "n/a"' },
  { source: '/logs/new\nline.jsonl', line: 0, field: '', reason: 'unreadable (EACCES)' },
  { source: '-', line: 12, field: 'width', reason: 'conflict: kept /logs/b.csv, line 7' },
  { source: '/logs/ü €.csv', line: 1, field: 'epoch "x"', reason: '' },
];

describe('rejected.csv', () => {
  it('round-trips every field, whatever it holds', () => {
    expect(parseRejected(formatRejected(hostile))).toEqual(hostile);
  });

  it('is read the same by an independent RFC 4180 parser (csv-parse)', () => {
    const rows = parse(formatRejected(hostile)) as string[][];
    expect(rows[0]).toEqual([...REJECTED_HEADER]);
    expect(rows.slice(1)).toEqual(hostile.map((r) => [r.source, String(r.line), r.field, r.reason]));
  });

  it('an empty file has the header only', () => {
    expect(formatRejected([])).toBe('source,line,field,reason\n');
    expect(parseRejected(formatRejected([]))).toEqual([]);
  });
});
