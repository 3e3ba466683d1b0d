import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { tokenizeJsonLines } from '../../src/ingest/tokenizeJsonLines.js';
import { cellAt, flattenRecord } from '../../src/ingest/RawTable.js';
import type { RawTable, RawValue } from '../../src/ingest/RawTable.js';
import { isNumericColumn, parseColumn } from '../../src/ingest/parseNumbers.js';

/**
 * The reference reading of JSON Lines: JSON.parse (ECMA-404 / RFC 8259, as the engine implements
 * it) on each trimmed line, nested keys flattened, the same lenient NaN/Infinity as ingest.
 * Cells as ingest compares them: null and absent keys are "", booleans their text.
 */
function reference(text: string): { names: string[]; rows: (string | number)[][]; lines: number[]; errors: number[]; pendingLine: number } {
  const names: string[] = [];
  const recs: (Record<string, RawValue> | null)[] = [];
  const lines: number[] = [];
  let pendingLine = 0;
  const parts = text.replace(/^\uFEFF/, '').split('\n');
  parts.forEach((part, k) => {
    if (k === parts.length - 1) {
      if (part.trim() !== '') pendingLine = k + 1;
      return;
    }
    const body = part.trim();
    if (body === '') return;
    let rec: unknown = null;
    try {
      rec = JSON.parse(body.replace(/([:[,]\s*)(-?Infinity|NaN)(?=\s*[,\]}])/g, '$1"$2"'));
    } catch {
      rec = null;
    }
    const flat = rec !== null && typeof rec === 'object' && !Array.isArray(rec) ? flattenRecord(rec as Record<string, unknown>) : null;
    if (flat) for (const key in flat) if (!names.includes(key)) names.push(key);
    recs.push(flat);
    lines.push(k + 1);
  });
  const cell = (v: RawValue): string | number => (typeof v === 'number' ? v : v === null || v === undefined ? '' : String(v));
  return {
    names,
    rows: recs.map((r) => names.map((n) => (r ? cell(r[n]) : ''))),
    lines,
    errors: recs.flatMap((r, i) => (r ? [] : [i])),
    pendingLine,
  };
}

function read(text: string) {
  const raw: RawTable = tokenizeJsonLines(text);
  return {
    names: raw.names,
    rows: Array.from({ length: raw.length }, (_, i) => raw.columns.map((c) => cellAt(c, i) as string | number)),
    lines: raw.lines,
    errors: [...raw.rowErrors.keys()],
    pendingLine: raw.pendingLine,
  };
}

/** The tokenizer's reading of `text` equals the JSON.parse reference: rows, errors, lines, pending. */
function expectAsJsonParse(text: string): void {
  const got = read(text);
  const want = reference(text);
  expect(got.lines).toEqual(want.lines);
  expect(got.errors).toEqual(want.errors);
  expect(got.pendingLine).toBe(want.pendingLine);
  expect(got.names).toEqual(want.names);
  expect(got.rows).toEqual(want.rows);
}

describe('tokenizeJsonLines', () => {
  it('reads flat records as typed columns: numbers as numbers, text as text, null as missing', () => {
    const t = tokenizeJsonLines('{"width": 64, "test_error": 0.25, "opt": "sgd", "ok": true, "note": null}\n{"width":128,"test_error":1.5e-3,"opt":"adam","ok":false}\n');
    expect(t.names).toEqual(['width', 'test_error', 'opt', 'ok', 'note']);
    expect([...(t.columns[0] as { values: Float64Array }).values]).toEqual([64, 128]);
    expect(cellAt(t.columns[1], 1)).toBe(0.0015);
    expect(cellAt(t.columns[2], 0)).toBe('sgd');
    expect(cellAt(t.columns[3], 1)).toBe('false');
    expect(cellAt(t.columns[4], 0)).toBe('');
    expect(cellAt(t.columns[4], 1)).toBe('');
    expect(t.lines).toEqual([1, 2]);
  });

  it('numbers follow the ECMA-404 grammar: 01, 1., .5 and +1 are not JSON (row errors)', () => {
    // ECMA-404 §8 (numbers): no leading zeros, digits required after the point, no plus sign.
    for (const bad of ['01', '1.', '.5', '+1', '1e', '-']) {
      const t = tokenizeJsonLines(`{"a":${bad}}\n`);
      expect(t.rowErrors.size, bad).toBe(1);
    }
    const ok = tokenizeJsonLines('{"a":-0.5e+2}\n{"a":0}\n{"a":-0}\n{"a":1E400}\n{"a":123456789012345678901234567890}\n');
    expect(ok.rowErrors.size).toBe(0);
    // Same doubles as JSON.parse (Number() on the literal): from memory of IEEE 754 rounding.
    expect([0, 1, 2, 3, 4].map((i) => cellAt(ok.columns[0], i))).toEqual([-50, 0, -0, Infinity, 1.2345678901234568e29]);
  });

  it('a JSON string of a number reads as that number in a numeric column, as a plain array does', () => {
    const t = tokenizeJsonLines('{"lr":"0.1"}\n{"lr":0.2}\n');
    expect(isNumericColumn(t.columns[0], 2)).toBe(true);
    expect([...parseColumn(t.columns[0], 2).values]).toEqual([0.1, 0.2]);
    // A label column stays text.
    expect(isNumericColumn(tokenizeJsonLines('{"o":"sgd"}\n{"o":3}\n').columns[0], 2)).toBe(false);
  });

  it('gives what JSON.parse gives on random lines: any mix of fast and slow lines', () => {
    const key = fc.constantFrom('a', 'b', 'width', '10', '2', '__proto__', 'x.y', 'q"uote', 'back\\slash', 'é', 'tab\t');
    const num = fc.oneof(
      fc.double({ noNaN: true, noDefaultInfinity: true }).map((x) => JSON.stringify(x)),
      fc.integer({ min: -1e6, max: 1e6 }).map(String),
      fc.constantFrom('-0', '0', '1e400', '-1.5E-7', '01', '1.', '.5', '+1', '1e', '12345678901234567890', 'NaN', 'Infinity', '-Infinity', '0x10'),
    );
    const str = fc.oneof(fc.string({ maxLength: 6 }).map((s) => JSON.stringify(s)), fc.constantFrom('"plain"', '"a\\nb"', '"\\u0041"', '"12"', '"nan"', '"bad'));
    const scalar = fc.oneof(num, str, fc.constantFrom('true', 'false', 'null', 'tru', 'nul'));
    const value = fc.oneof({ weight: 6, arbitrary: scalar }, { weight: 1, arbitrary: fc.constantFrom('{"k":1}', '{"k":{"j":"v"}}', '[1,2]', '{}', '[]') });
    const ws = fc.constantFrom('', '', ' ', '\t', '  ', '\u00a0');
    const record = fc.array(fc.tuple(key, value, ws, ws), { maxLength: 5 }).chain((fields) =>
      fc.tuple(ws, ws, fc.constantFrom('', '', ',', '}', 'x', '\r')).map(([a, b, tail]) => {
        const body = fields.map(([k, v, w1, w2]) => `${w1}${JSON.stringify(k)}${w2}:${w1}${v}${w2}`).join(',');
        return `${a}{${body}}${tail}${b}`;
      }),
    );
    const lineArb = fc.oneof({ weight: 8, arbitrary: record }, { weight: 1, arbitrary: fc.constantFrom('', '   ', 'garbage', '[1]', '5', '"s"', 'null', '{"a":1} {"b":2}') });
    fc.assert(
      fc.property(fc.array(lineArb, { maxLength: 12 }), fc.boolean(), (lines, lastNewline) => {
        expectAsJsonParse(lines.join('\n') + (lastNewline ? '\n' : ''));
      }),
      { numRuns: 3000, seed: 20261202 },
    );
  });

  it('gives what JSON.parse gives on logs that repeat one layout (the matched-layout path), bad values included', () => {
    const value = fc.oneof(
      { weight: 6, arbitrary: fc.double({ noNaN: true, noDefaultInfinity: true }).map((x) => JSON.stringify(x)) },
      { weight: 3, arbitrary: fc.integer({ min: -1e6, max: 1e6 }).map(String) },
      { weight: 2, arbitrary: fc.constantFrom('-0', '0.0', '1e400', '1e-400', '123456789012345678', '9007199254740993', '0.1e-22', '5e22', '5e23', '-1.5E+3') },
      { weight: 1, arbitrary: fc.constantFrom('01', '1.', '-', '1e', '+1', 'NaN', '"x"', '"a\\"b"', '"12"', 'true', 'null', 'nul', '{"k":1}', '[1]', '"', '1 2') },
    );
    const layout = fc.record({
      keys: fc.shuffledSubarray(['width', 'train_size', 'seed', 'epoch', 'test_error', 'note'], { minLength: 1 }),
      colon: fc.constantFrom(':', ': ', ' : '),
      comma: fc.constantFrom(',', ', '),
    });
    fc.assert(
      fc.property(layout, fc.array(fc.tuple(fc.array(value, { minLength: 6, maxLength: 6 }), fc.nat(9)), { maxLength: 15 }), ({ keys, colon, comma }, rows) => {
        const text = rows
          .map(([vals, twist]) => {
            // Mostly the layout; now and then a key missing, an extra key or trailing garbage.
            const ks = twist === 0 ? keys.slice(1) : twist === 1 ? [...keys, 'extra'] : keys;
            const body = `{${ks.map((k, j) => `"${k}"${colon}${vals[j % 6]}`).join(comma)}}`;
            return twist === 2 ? `${body} x` : twist === 3 ? `${body}\r` : body;
          })
          .join('\n');
        expectAsJsonParse(`${text}\n`);
      }),
      { numRuns: 2000, seed: 7 },
    );
  });
});
