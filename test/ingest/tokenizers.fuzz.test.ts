import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { tokenizeToColumns } from '../../src/ingest/tokenizeToColumns.js';
import { tokenizeJsonLines } from '../../src/ingest/tokenizeJsonLines.js';
import { depthOverAt, JsonTooDeep, parseJsonLenient } from '../../src/ingest/parseJsonLenient.js';
import { rawFromBytes } from '../../src/ingest/readSource.js';
import { cellAt, flattenRecord } from '../../src/ingest/RawTable.js';
import type { RawTable, RawValue } from '../../src/ingest/RawTable.js';
import { MAX_DEPTH } from '../../src/ingest/ReadLimits.js';
import type { ReadLimits } from '../../src/ingest/ReadLimits.js';
import { ingestText } from '../../src/messages.js';

// Property-based checks of the three tokenizers on random structure (records built first, then
// written as RFC 4180 CSV, JSON Lines or JSON, so every expected row, value, line and rejection
// is known) and on random bytes (no crash, no hang, every row accounted for). A fixed seed and a
// bounded number of runs keep the suite deterministic; raise RUNS locally to search harder.
const SEED = 19;
const RUNS = 150;

/** A cell as the CSV tokenizer reads it (RFC 4180 text; numbers where JavaScript's Number reads one). */
function csvCell(s: string): string | number {
  const v = s.trim() === '' ? NaN : +s;
  return v === v ? v : s;
}

const sameCell = (a: RawValue, b: RawValue) => (typeof a === 'number' && typeof b === 'number' ? a === b || (a !== a && b !== b) : a === b);

/** Structural facts every tokenizer result must satisfy, whatever the input. */
function checkShape(raw: { names: string[]; columns: { length: number }[]; lines: number[]; rowErrors: Map<number, unknown>; pendingLine: number }, rows: number, physicalLines: number) {
  expect(raw.columns.length).toBe(raw.names.length);
  for (const c of raw.columns) expect(c.length).toBe(rows);
  expect(raw.lines.length).toBe(rows);
  for (let i = 1; i < rows; i++) expect(raw.lines[i]).toBeGreaterThan(raw.lines[i - 1]);
  for (const l of raw.lines) expect(l >= 1 && l <= physicalLines).toBe(true);
  for (const r of raw.rowErrors.keys()) expect((r as number) >= 0 && (r as number) < rows).toBe(true);
  if (raw.pendingLine) expect(raw.pendingLine).toBeGreaterThan(raw.lines.at(-1) ?? 0);
}

const physical = (text: string) => text.split('\n').length;

// Small limits, so random records cross them often.
const limitsArb = fc.record({ maxLine: fc.integer({ min: 30, max: 300 }), maxFields: fc.integer({ min: 6, max: 12 }), maxText: fc.constant(1 << 20) });

describe('CSV tokenizer (tokenizeToColumns) under fuzzing', () => {
  // RFC 4180 §2: fields holding commas, quotes or line breaks are quoted, quotes doubled.
  const fieldChar = fc.constantFrom('a', 'b', 'é', '𝛼', '0', '1', '5', '.', '-', 'e', ' ', ',', '"', '\n', '\r', '\r\n', '\t');
  const field = fc.array(fieldChar, { maxLength: 12 }).map((cs) => cs.join(''));
  const record = fc.tuple(fc.array(field, { minLength: 1, maxLength: 14 }), fc.array(fc.boolean(), { minLength: 14, maxLength: 14 }));

  it('random records written as CSV: every record one row with its values and line, or rejected for exactly the limit it passes', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 6 }), fc.array(record, { maxLength: 25 }), limitsArb, fc.boolean(), (width, records, limits, crlf) => {
        const eol = crlf ? '\r\n' : '\n';
        const names = Array.from({ length: width }, (_, k) => `c${k}`);
        const quote = (s: string, force: boolean) => (force || /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
        let text = `${names.join(',')}${eol}`;
        let line = 2;
        const expected: { line: number; fields: string[]; content: string }[] = [];
        for (const [fields, force] of records) {
          // A lone empty field is a blank line (not a row): quote it.
          const content = fields.map((f, k) => quote(f, force[k] || (fields.length === 1 && f === ''))).join(',');
          expected.push({ line, fields, content });
          text += content + eol;
          // Line numbers count line feeds (a lone CR inside a quoted field does not start a line).
          line += (content.match(/\n/g) ?? []).length + 1;
        }
        const t = tokenizeToColumns(text, ',', limits as ReadLimits);
        checkShape(t, expected.length, physical(text));
        expect(t.pendingLine).toBe(0);
        expect(t.lines).toEqual(expected.map((e) => e.line));
        expected.forEach((e, row) => {
          const err = t.rowErrors.get(row);
          const long = e.content.length > limits.maxLine;
          const many = e.fields.length > limits.maxFields;
          if (long || many) {
            const reasons = [...(long ? [ingestText.lineTooLong(limits.maxLine)] : []), ...(many ? [ingestText.tooManyFields(limits.maxFields)] : [])];
            expect(reasons).toContain(err?.reason);
          } else if (e.fields.length !== width) expect(err?.reason).toBe(ingestText.fieldCount(width, e.fields.length));
          else {
            expect(err).toBeUndefined();
            e.fields.forEach((f, k) => expect(sameCell(t.columns[k].at(row), csvCell(f)), `row ${row} field ${k}: ${JSON.stringify(f)}`).toBe(true));
          }
        });
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('random bytes: no crash, rows aligned with their lines, a header over a limit the only refusal', () => {
    const chunk = fc.oneof(fc.string({ unit: 'binary', maxLength: 40 }), fc.constantFrom(',', '"', '""', '\n', '\r', '\r\n', '\uFEFF', 'x,y\n', '1,2\n', '"a\nb"'));
    fc.assert(
      fc.property(fc.array(chunk, { maxLength: 60 }), limitsArb, (parts, limits) => {
        const text = parts.join('');
        let t: ReturnType<typeof tokenizeToColumns>;
        try {
          t = tokenizeToColumns(text, ',', limits as ReadLimits);
        } catch (err) {
          expect([ingestText.headerQuote, ingestText.headerTooLong(limits.maxLine), ingestText.headerTooManyFields(limits.maxFields)]).toContain((err as Error).message);
          return;
        }
        checkShape(t, t.lines.length, physical(text) + (text.match(/\r(?!\n)/g) ?? []).length);
        for (const c of t.columns) for (const v of c.texts.values()) expect(v.length).toBeLessThanOrEqual(text.length);
      }),
      { seed: SEED, numRuns: RUNS * 2 },
    );
  });
});

/** Levels of nested objects and arrays in a JSON value (a scalar: 0). */
function depthOf(v: unknown): number {
  if (v === null || typeof v !== 'object') return 0;
  let d = 0;
  for (const x of Object.values(v as object)) d = Math.max(d, depthOf(x));
  return d + 1;
}

/** A JSON value wrapped in `levels` random arrays and objects (deep structure fast-check's own generator does not reach). */
const nested = fc.tuple(fc.jsonValue({ maxDepth: 3 }), fc.array(fc.boolean(), { maxLength: 80 })).map(([leaf, wraps]) => wraps.reduce<unknown>((v, asArray) => (asArray ? [v] : { k: v }), leaf));

describe('JSON Lines tokenizer (tokenizeJsonLines) under fuzzing', () => {
  const key = fc.oneof(fc.constantFrom('width', 'epoch', 'test_error', 'a"b', 'é', 'x\\y', 'run'), fc.string({ maxLength: 6 }).map((s) => `k${s}`));
  const scalar = fc.oneof(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer(), fc.string({ maxLength: 10 }), fc.boolean(), fc.constant(null));
  const value = fc.oneof({ weight: 6, arbitrary: scalar }, { weight: 1, arbitrary: nested });
  const rec = fc.dictionary(key, value, { maxKeys: 14 });

  it('random records written as JSON Lines: every line one row with the values JSON.parse gives, or rejected for the limit it passes', () => {
    fc.assert(
      fc.property(fc.array(fc.oneof({ weight: 9, arbitrary: rec }, { weight: 1, arbitrary: nested }), { maxLength: 25 }), limitsArb, fc.boolean(), (records, limits, spaced) => {
        const lines = records.map((r) => JSON.stringify(r, null, spaced ? 1 : undefined).replace(/\n/g, ' '));
        const text = lines.map((l) => `${l}\n`).join('');
        const raw = tokenizeJsonLines(text, limits as ReadLimits);
        checkShape(raw, lines.length, physical(text));
        expect(raw.lines).toEqual(lines.map((_, i) => i + 1));
        records.forEach((r, row) => {
          const err = raw.rowErrors.get(row);
          const isRecord = r !== null && typeof r === 'object' && !Array.isArray(r);
          if (lines[row].length > limits.maxLine) return expect(err?.reason).toBe(ingestText.lineTooLong(limits.maxLine));
          if (depthOf(r) > MAX_DEPTH) return expect(err?.reason).toBe(ingestText.tooDeep(MAX_DEPTH));
          if (!isRecord) return expect(err?.reason).toBe(ingestText.notARecord);
          const flat = flattenRecord(r as Record<string, unknown>);
          const keys = Object.keys(r as object);
          if (Object.keys(flat).length > limits.maxFields || keys.length > limits.maxFields) {
            // The scan counts a line's own keys, JSON.parse's path the flattened ones: either passes the limit.
            if (err) return expect(err.reason).toBe(ingestText.tooManyFields(limits.maxFields));
          }
          expect(err).toBeUndefined();
          const col = new Map(raw.names.map((n, j) => [n, j]));
          for (const [k, v] of Object.entries(flat)) {
            const want = typeof v === 'number' ? v : v === null || v === undefined ? '' : String(v);
            expect(sameCell(cellAt(raw.columns[col.get(k)!], row), want), `row ${row} key ${k}`).toBe(true);
          }
        });
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('random bytes: no crash, one row per non-blank complete line', () => {
    const chunk = fc.oneof(fc.string({ unit: 'binary', maxLength: 30 }), fc.constantFrom('{', '}', '[', ']', '"', '\\', ':', ',', '\n', '{"a":1}\n', 'NaN', '[[[[[[[[', '{"a":{"b":'));
    fc.assert(
      fc.property(fc.array(chunk, { maxLength: 60 }), limitsArb, (parts, limits) => {
        const text = parts.join('');
        const raw = tokenizeJsonLines(text, limits as ReadLimits);
        const complete = text.split('\n').slice(0, -1).filter((l) => l.trim() !== '' && l !== '\uFEFF');
        // A byte-order mark at the very start is skipped (its line may then be blank).
        const first = text.startsWith('\uFEFF') && text.slice(1).split('\n')[0].trim() === '' ? 1 : 0;
        expect(raw.length).toBe(complete.length - (first && complete[0]?.startsWith('\uFEFF') ? 1 : 0));
        checkShape(raw, raw.length, physical(text));
      }),
      { seed: SEED, numRuns: RUNS * 2 },
    );
  });
});

describe('JSON parse stage (parseJsonLenient) under fuzzing', () => {
  it('random values, deep ones included: equal to JSON.parse within the depth limit, refused past it at the right place', () => {
    fc.assert(
      fc.property(fc.oneof(fc.jsonValue(), nested), fc.integer({ min: 0, max: 2 }), (v, indent) => {
        const text = JSON.stringify(v, null, indent || undefined);
        const depth = depthOf(v);
        expect(depthOverAt(text, MAX_DEPTH) >= 0).toBe(depth > MAX_DEPTH);
        if (depth > MAX_DEPTH) {
          expect(() => parseJsonLenient(text)).toThrow(JsonTooDeep);
          const at = depthOverAt(text, MAX_DEPTH);
          expect('[{').toContain(text[at]);
        } else expect(parseJsonLenient(text)).toEqual(JSON.parse(text));
      }),
      { seed: SEED, numRuns: RUNS * 2 },
    );
  });

  it('random bytes as a JSON document: a value, or one Error with a one-line message, never a crash', () => {
    const chunk = fc.oneof(fc.string({ unit: 'binary', maxLength: 30 }), fc.constantFrom('{', '}', '[', ']', '"', '\\"', ':', ',', '\n', '{"a":[1,2]}', 'NaN', '['.repeat(70), ']'.repeat(70)));
    fc.assert(
      fc.property(fc.array(chunk, { maxLength: 40 }), (parts) => {
        const text = parts.join('');
        try {
          parseJsonLenient(text);
        } catch (err) {
          expect(err instanceof SyntaxError || err instanceof JsonTooDeep).toBe(true);
        }
        let raw: RawTable | null = null;
        try {
          raw = rawFromBytes(Buffer.from(text, 'utf8'), 'json');
        } catch (err) {
          expect(err).toBeInstanceOf(Error);
          expect((err as Error).message).not.toContain('\n');
          expect((err as Error).message).not.toMatch(/Maximum call stack/);
        }
        if (raw) for (const c of raw.columns) expect(c.length).toBe(raw.length);
      }),
      { seed: SEED, numRuns: RUNS * 2 },
    );
  });
});
