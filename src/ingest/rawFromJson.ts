import { emptyRaw } from './RawTable.js';
import type { RawTable } from './RawTable.js';
import { ingestText } from '../messages.js';
import { JsonTooDeep, jsonWhy, parseJsonLenient } from './parseJsonLenient.js';
import { tokenizeJsonLines } from './tokenizeJsonLines.js';
import { DEFAULT_LIMITS } from './ReadLimits.js';
import type { ReadLimits } from './ReadLimits.js';
import { JsonRows, jsonRows } from './jsonRows.js';

export interface JsonReadOptions {
  /** Names of the value-key levels of a nested document, outermost first (`--keys`). */
  keys?: string[];
  /** What one line may hold (JSON Lines read by the tokenizer). */
  limits?: ReadLimits;
}

/** 1-based line of a character offset. */
function lineAt(text: string, offset: number): number {
  let line = 1;
  for (let p = text.indexOf('\n'); p >= 0 && p < offset; p = text.indexOf('\n', p + 1)) line++;
  return line;
}

/**
 * JSON Lines: one record per line; a bad line is a row error, a last line without newline is
 * pending. Rows that hold arrays (a record's own curve, `{"width": 8, "history": [...]}`) are
 * walked like a document, every row of a line keeping its line number; flat rows take the
 * tokenizer's fast path.
 */
export function rawFromJsonLines(text: string, opts: JsonReadOptions = {}): RawTable {
  if (!text.includes('[')) return tokenizeJsonLines(text, opts.limits ?? DEFAULT_LIMITS);
  const walk = new JsonRows({ keys: opts.keys, format: 'jsonl' });
  const { maxLine, maxFields } = opts.limits ?? DEFAULT_LIMITS;
  let start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  let pendingLine = 0;
  while (start < text.length) {
    const end = text.indexOf('\n', start);
    if (end < 0) {
      if (text.slice(start).trim() !== '') pendingLine = line;
      break;
    }
    if (end - start > maxLine) {
      // Over the line limit: rejected unread, as the tokenizer does.
      walk.addError(line, ingestText.lineTooLong(maxLine));
      line++;
      start = end + 1;
      continue;
    }
    const body = text.slice(start, end).trim();
    if (body !== '') {
      let rec: unknown;
      try {
        rec = parseJsonLenient(body);
      } catch (err) {
        walk.addError(line, err instanceof JsonTooDeep ? ingestText.tooDeep(err.limit) : ingestText.badJsonLineWhy(jsonWhy(err)));
        rec = undefined;
      }
      if (rec !== undefined && rec !== null && typeof rec === 'object' && !Array.isArray(rec) && Object.keys(rec).length > maxFields) {
        walk.addError(line, ingestText.tooManyFields(maxFields));
        rec = undefined;
      }
      if (rec !== undefined) {
        if (rec === null || typeof rec !== 'object' || Array.isArray(rec)) walk.addError(line, ingestText.notARecord);
        else walk.add(rec, line);
      }
    }
    line++;
    start = end + 1;
  }
  const raw = walk.finish();
  raw.pendingLine = pendingLine;
  return raw;
}

/**
 * A JSON file: any document of records, however nested (see jsonRows). Several JSON values one
 * per line (JSON Lines saved as .json) are read as JSON Lines.
 */
export function rawFromJson(text: string, opts: JsonReadOptions = {}): RawTable {
  let value: unknown;
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (body.trim() === '') return emptyRaw('json');
  try {
    value = parseJsonLenient(body);
  } catch (err) {
    const trimmed = text.trim();
    if (trimmed.startsWith('{') && trimmed.includes('\n')) {
      const jl = rawFromJsonLines(text, opts);
      if (jl.length > 0 && jl.rowErrors.size < jl.length) return jl;
    }
    const at = /at position (\d+)/.exec((err as Error).message);
    if (at) throw new Error(ingestText.badJsonAt(jsonWhy(err), lineAt(body, Number(at[1]))));
    throw new Error(ingestText.badJson(jsonWhy(err)));
  }
  if (value === null || typeof value !== 'object') throw new Error(ingestText.badJson('not an array or object'));
  return jsonRows(value, { keys: opts.keys, format: 'json' });
}
