import { RecordColumns, emptyRaw, flattenRecord } from './RawTable.js';
import type { RawTable, RawValue } from './RawTable.js';
import { ingestText } from '../messages.js';
import { jsonWhy, parseJsonLenient } from './parseJsonLenient.js';
import { tokenizeJsonLines } from './tokenizeJsonLines.js';

/** 1-based line of a character offset. */
function lineAt(text: string, offset: number): number {
  let line = 1;
  for (let p = text.indexOf('\n'); p >= 0 && p < offset; p = text.indexOf('\n', p + 1)) line++;
  return line;
}

function asRecord(v: unknown): Record<string, unknown> | null {
  return v !== null && typeof v === 'object' && !Array.isArray(v) ? (v as Record<string, unknown>) : null;
}

/** JSON Lines: one record per line; a bad line is a row error, a last line without newline is pending. */
export function rawFromJsonLines(text: string): RawTable {
  return tokenizeJsonLines(text);
}

function fromRecords(records: unknown[], format: string): RawTable {
  const rc = new RecordColumns(format);
  records.forEach((r, i) => {
    const rec = asRecord(r);
    if (rec) rc.add(flattenRecord(rec), i + 1);
    else rc.addError(i + 1, ingestText.notARecord);
  });
  return rc.finish();
}

/** Columnar history `{"epoch":[...],"test_error":[...]}`: arrays of one length become columns. */
function fromColumnar(obj: Record<string, unknown>, format: string): RawTable | null {
  const arrays = Object.entries(obj).filter(([, v]) => Array.isArray(v) && (v as unknown[]).every((x) => x === null || typeof x !== 'object')) as [string, unknown[]][];
  if (arrays.length < 2) return null;
  const len = Math.max(...arrays.map(([, v]) => v.length));
  const cols = arrays.filter(([, v]) => v.length === len);
  if (cols.length < 2 || len === 0) return null;
  const raw = emptyRaw(format);
  raw.names = cols.map(([k]) => k);
  raw.columns = cols.map(([, v]) => v as RawValue[]);
  raw.length = len;
  raw.lines = Array.from({ length: len }, (_, i) => i + 1);
  return raw;
}

/**
 * A JSON file: an array of records, or one object per file. An object holding an array of
 * records (`{"config":{...},"history":[...]}`) or a columnar history gives one row per entry, its
 * other keys apply to every row; a flat object is a single row. Several JSON values one per
 * line (JSON Lines saved as .json) are read as JSON Lines.
 */
export function rawFromJson(text: string): RawTable {
  let value: unknown;
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (body.trim() === '') return emptyRaw('json');
  try {
    value = parseJsonLenient(body);
  } catch (err) {
    const trimmed = text.trim();
    if (trimmed.startsWith('{') && trimmed.includes('\n')) {
      const jl = rawFromJsonLines(text);
      if (jl.length > 0 && jl.rowErrors.size < jl.length) return jl;
    }
    const at = /at position (\d+)/.exec((err as Error).message);
    if (at) throw new Error(ingestText.badJsonAt(jsonWhy(err), lineAt(body, Number(at[1]))));
    throw new Error(ingestText.badJson(jsonWhy(err)));
  }
  if (Array.isArray(value)) return fromRecords(value, 'json');
  const obj = asRecord(value);
  if (!obj) throw new Error(ingestText.badJson('not an array or object'));
  // The longest array of records, or the largest columnar block, holds the rows.
  let best: { key: string; raw: RawTable } | null = null;
  for (const [key, v] of Object.entries(obj)) {
    let raw: RawTable | null = null;
    if (Array.isArray(v) && v.length > 0 && v.every((x) => asRecord(x))) raw = fromRecords(v, 'json');
    else if (asRecord(v)) raw = fromColumnar(v as Record<string, unknown>, 'json');
    if (raw && (!best || raw.length > best.raw.length)) best = { key, raw };
  }
  if (!best) {
    const top = fromColumnar(obj, 'json');
    if (top) {
      const rest: Record<string, unknown> = {};
      for (const [k, v] of Object.entries(obj)) if (!top.names.includes(k)) rest[k] = v;
      top.constants = flattenRecord(rest);
      return top;
    }
    return fromRecords([obj], 'json');
  }
  const rest: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(obj)) if (k !== best.key) rest[k] = v;
  best.raw.constants = flattenRecord(rest);
  return best.raw;
}
