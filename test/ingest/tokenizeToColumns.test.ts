import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parse } from 'csv-parse/sync';
import { tokenizeToColumns } from '../../src/ingest/tokenizeToColumns.js';
import { parseDecimal } from '../../src/ingest/NumTextColumn.js';
import { tokenizeWhitespace } from '../../src/ingest/tokenizeWhitespace.js';

/**
 * The records of a header-less text of `width` fields per record, through the column tokenizer
 * (which ingest uses): a header of `width` names is put in front, and line numbers are given
 * back as they are in `text`.
 */
function rowsOf(text: string, width: number): { rows: (string | number)[][]; lines: number[]; pendingLine: number } {
  const header = Array.from({ length: width }, (_, k) => `h${k}`).join(',');
  const t = tokenizeToColumns(`${header}\n${text}`, ',');
  return { rows: t.lines.map((_, i) => t.columns.map((c) => c.at(i))), lines: t.lines.map((l) => l - 1), pendingLine: t.pendingLine ? t.pendingLine - 1 : 0 };
}

/** All cells of a text through the column tokenizer (header + cells as text or number). */
function columnsOf(text: string): { names: string[]; rows: (string | number)[][]; pendingLine: number } {
  const t = tokenizeToColumns(text, ',');
  const rows = t.lines.map((_, i) => t.columns.map((c) => c.at(i)));
  return { names: t.names, rows, pendingLine: t.pendingLine };
}

// RFC 4180, section 2 (Definition of the CSV Format), rules 1-7 and their examples.
describe('RFC 4180 section 2', () => {
  it('rule 1: records separated by CRLF', () => {
    // RFC 4180 §2.1: aaa,bbb,ccc CRLF zzz,yyy,xxx CRLF
    expect(rowsOf('aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n', 3).rows).toEqual([['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]);
  });

  it('rule 2: the last record may lack a line break (we count it pending: a log still being written)', () => {
    // RFC 4180 §2.2: aaa,bbb,ccc CRLF zzz,yyy,xxx — DESIGN.md §4 makes that last line pending.
    const r = rowsOf('aaa,bbb,ccc\r\nzzz,yyy,xxx', 3);
    expect(r.rows).toEqual([['aaa', 'bbb', 'ccc']]);
    expect(r.pendingLine).toBe(2);
  });

  it('rule 3: an optional header line with the same format', () => {
    // RFC 4180 §2.3: field_name,field_name,field_name CRLF aaa,bbb,ccc CRLF zzz,yyy,xxx CRLF
    const c = columnsOf('field_name_1,field_name_2,field_name_3\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n');
    expect(c.names).toEqual(['field_name_1', 'field_name_2', 'field_name_3']);
    expect(c.rows).toEqual([['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]);
  });

  it('rule 4: fields separated by commas, spaces are part of a field, no comma after the last field', () => {
    // RFC 4180 §2.4: aaa,bbb,ccc; "Spaces are considered part of a field and should not be ignored."
    expect(rowsOf('aaa, bbb ,ccc\n', 3).rows).toEqual([['aaa', ' bbb ', 'ccc']]);
  });

  it('rule 5: fields may be enclosed in double quotes', () => {
    // RFC 4180 §2.5: "aaa","bbb","ccc" CRLF zzz,yyy,xxx
    expect(rowsOf('"aaa","bbb","ccc"\r\nzzz,yyy,xxx\r\n', 3).rows).toEqual([['aaa', 'bbb', 'ccc'], ['zzz', 'yyy', 'xxx']]);
  });

  it('rule 6: line breaks, double quotes and commas inside quoted fields', () => {
    // RFC 4180 §2.6: "aaa","b CRLF bb","ccc" CRLF zzz,yyy,xxx
    const text = '"aaa","b\r\nbb","ccc"\r\nzzz,yyy,xxx\r\n';
    expect(rowsOf(text, 3).rows).toEqual([['aaa', 'b\r\nbb', 'ccc'], ['zzz', 'yyy', 'xxx']]);
    expect(rowsOf('"a,b",c\n', 2).rows).toEqual([['a,b', 'c']]);
    // The second record starts on physical line 3 (the quoted field spans two lines).
    expect(rowsOf(text, 3).lines).toEqual([1, 3]);
  });

  it('rule 7: a double quote inside a quoted field is escaped by another double quote', () => {
    // RFC 4180 §2.7: "aaa","b""bb","ccc"
    expect(rowsOf('"aaa","b""bb","ccc"\r\n', 3).rows).toEqual([['aaa', 'b"bb', 'ccc']]);
    expect(columnsOf('h1,h2,h3\n"aaa","b""bb","ccc"\n').rows).toEqual([['aaa', 'b"bb', 'ccc']]);
  });

  it('a byte-order mark is not part of the first header name; an unterminated quote is pending', () => {
    // Unicode BOM U+FEFF at the start of UTF-8 files written by spreadsheet tools (common practice).
    expect(columnsOf('\uFEFFwidth,epoch\n1,2\n').names).toEqual(['width', 'epoch']);
    const c = columnsOf('a,b\n1,"still\nbeing written');
    expect(c.rows).toEqual([]);
    expect(c.pendingLine).toBe(2);
  });
});

// Cross-check against csv-parse (an independent, widely used RFC 4180 parser) on random tables.
describe('the column tokenizer agrees with csv-parse', () => {
  const field = fc.oneof(
    fc.string({ unit: fc.constantFrom('a', 'b', ',', '"', '\n', '\r\n', ' ', '1', '.', 'e', '-'), maxLength: 8 }),
    fc.double({ noNaN: true, noDefaultInfinity: true }).map(String),
    fc.integer().map(String),
  );
  const quoteField = (s: string) => (/[",\r\n]/.test(s) || s === '' ? `"${s.replace(/"/g, '""')}"` : s);

  it('column tokenizer = csv-parse on random quoted tables of 1 to 4 columns (numbers read as Number() reads them)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 4 }).chain((w) => fc.array(fc.array(field, { minLength: w, maxLength: w }), { minLength: 1, maxLength: 6 })), (table) => {
        const text = `${table.map((r) => r.map(quoteField).join(',')).join('\r\n')}\r\n`;
        const ref = (parse(text, { relax_quotes: false, skip_empty_lines: false }) as string[][]).map((r) => r.map((s) => (s.trim() !== '' && !Number.isNaN(+s) ? +s : s)));
        expect(rowsOf(text, table[0].length).rows).toEqual(ref);
      }),
      { numRuns: 300 },
    );
  });

  it('column tokenizer reads numbers exactly as Number() does and keeps other text', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(field, field), { minLength: 1, maxLength: 6 }), (rows) => {
        const text = `x,y\n${rows.map((r) => r.map(quoteField).join(',')).join('\n')}\n`;
        const ref = (parse(text, { from_line: 2 }) as string[][]).map((r) => r.map((s) => (s.trim() !== '' && !Number.isNaN(+s) ? +s : s)));
        expect(columnsOf(text).rows).toEqual(ref);
      }),
      { numRuns: 300 },
    );
  });
});

describe('parseDecimal', () => {
  // IEEE 754 correct rounding: Clinger's fast path must agree with Number() to the last bit.
  it('agrees with Number() on random decimals', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 0, max: 17 }), (x, digits) => {
        for (const s of [String(x), x.toFixed(Math.min(digits, 17)), x.toExponential(Math.min(digits, 16))]) {
          const v = parseDecimal(s, 0, s.length);
          if (!Number.isNaN(v)) expect(Object.is(v, Number(s))).toBe(true);
        }
      }),
      { numRuns: 2000 },
    );
  });

  it('declines what it cannot parse exactly (the caller falls back to Number())', () => {
    for (const s of ['', '-', '.', 'e5', '1e', '1.2.3', '0x10', ' 1', 'nan', '12345678901234567890']) expect(parseDecimal(s, 0, s.length)).toBeNaN();
    expect(parseDecimal('-0.125', 0, 6)).toBe(-0.125);
    expect(parseDecimal('3e-5', 0, 4)).toBe(3e-5);
  });
});

describe('tokenizeWhitespace', () => {
  it('splits on runs of spaces and tabs, skips blank and # lines, and keeps a last line without newline pending', () => {
    const rows: string[][] = [];
    const end = tokenizeWhitespace('# a comment\nepoch  width\ttest_err\n\n1 64   0.5\r\n2\t64 0.4\n3 64', (f, n, line) => rows.push([String(line), ...f.slice(0, n)]));
    expect(rows).toEqual([['2', 'epoch', 'width', 'test_err'], ['4', '1', '64', '0.5'], ['5', '2', '64', '0.4']]);
    expect(end.pendingLine).toBe(6);
  });
});
