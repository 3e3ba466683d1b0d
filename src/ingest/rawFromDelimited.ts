import { cellAt, emptyRaw } from './RawTable.js';
import { NumTextColumn } from './NumTextColumn.js';
import { matchTarget } from './synonyms.js';
import type { RawTable, RawValue } from './RawTable.js';
import { tokenizeWhitespace } from './tokenizeWhitespace.js';
import { tokenizeToColumns } from './tokenizeToColumns.js';

import { ingestText } from '../messages.js';
import { DEFAULT_LIMITS } from './ReadLimits.js';
import type { ReadLimits } from './ReadLimits.js';

/**
 * Reads CSV (`,`), TSV (tab) or whitespace-separated text with a header line into columns.
 * Header names are trimmed; a row with a different number of fields than the header is kept
 * as a row error (rejected with its line), never silently padded.
 */
export function rawFromDelimited(text: string, delimiter: ',' | ';' | '\t' | 'whitespace', limits: ReadLimits = DEFAULT_LIMITS): RawTable {
  const format = delimiter === ',' || delimiter === ';' ? 'csv' : delimiter === '\t' ? 'tsv' : 'text';
  const raw = emptyRaw(format);
  if (delimiter !== 'whitespace') {
    const t = tokenizeToColumns(text, delimiter, limits);
    raw.names = t.names;
    raw.columns = t.columns;
    raw.lines = t.lines;
    raw.length = t.lines.length;
    raw.rowErrors = t.rowErrors;
    raw.pendingLine = t.pendingLine;
    markHeaderLines(raw);
    return raw;
  }
  let columns: RawValue[][] = [];
  let width = 0;
  const onReject = (line: number, reason: string) => {
    if (width === 0) throw new Error(reason === ingestText.lineTooLong(limits.maxLine) ? ingestText.headerTooLong(limits.maxLine) : ingestText.headerTooManyFields(limits.maxFields));
    const row = raw.length;
    raw.lines.push(line);
    raw.length = row + 1;
    raw.rowErrors.set(row, { field: '', reason });
    for (let j = 0; j < width; j++) columns[j][row] = '';
  };
  const end = tokenizeWhitespace(text, (fields, count, line) => {
    if (width === 0) {
      raw.names = fields.slice(0, count);
      width = count;
      columns = raw.names.map(() => []);
      return;
    }
    const row = raw.length;
    raw.lines.push(line);
    raw.length = row + 1;
    if (count !== width) raw.rowErrors.set(row, { field: count < width ? raw.names[count] : '', reason: ingestText.fieldCount(width, count) });
    for (let j = 0; j < width; j++) columns[j][row] = j < count ? fields[j] : '';
  }, { limits, onReject });
  raw.columns = columns;
  // A header still being written is not a row; only a data row can be pending.
  raw.pendingLine = width === 0 ? 0 : end.pendingLine;
  markHeaderLines(raw);
  return raw;
}

/**
 * Header lines inside the data, from logs joined end to end (`cat run*.csv > all.csv`): a line
 * repeating the header is skipped (it is not a row); a header with other columns is rejected and
 * so are the rows below it until the first header returns, since reading them with the first
 * header's columns would put values in the wrong places. Only rows whose first cell is text are
 * looked at, so numeric logs pay nothing.
 */
function markHeaderLines(raw: RawTable): void {
  const width = raw.names.length;
  if (width === 0 || raw.length === 0) return;
  const col0 = raw.columns[0];
  // Rows whose first cell is text, in row order (a column's texts are kept in the order read).
  let candidates: Iterable<number>;
  if (col0 instanceof NumTextColumn) {
    if (col0.texts.size === 0) return;
    candidates = col0.texts.keys();
  } else {
    const rows: number[] = [];
    for (let i = 0; i < raw.length; i++) if (typeof col0[i] === 'string') rows.push(i);
    candidates = rows;
  }
  const text = (j: number, i: number): string | null => {
    const v = cellAt(raw.columns[j], i);
    return typeof v === 'string' && v.trim() !== '' && Number.isNaN(Number(v)) ? v.trim() : null;
  };
  const headerNames = new Set(raw.names);
  const kind = (i: number): 'repeat' | 'other' | null => {
    // Any number in the row makes it a data row (checked first: the common, cheap answer).
    for (let j = 1; j < width; j++) {
      const v = cellAt(raw.columns[j], i);
      if (typeof v === 'number' ? !Number.isNaN(v) : v !== undefined && v !== null && String(v).trim() !== '' && !Number.isNaN(Number(v))) return null;
    }
    if (text(0, i) === null) return null;
    let same = !raw.rowErrors.has(i);
    let named = 0;
    for (let j = 0; j < width; j++) {
      const t = text(j, i);
      if (t === null) {
        same = false;
        continue;
      }
      if (t !== raw.names[j]) same = false;
      if (headerNames.has(t) || matchTarget(t)) named++;
    }
    if (same) return 'repeat';
    return named >= Math.min(2, width) ? 'other' : null;
  };
  let repeats = 0;
  let firstRepeat = 0;
  let otherFrom = -1;
  let otherLine = 0;
  const closeOther = (to: number) => {
    // The fence explains these rows better than a field count would.
    for (let r = otherFrom + 1; r < to; r++) raw.rowErrors.set(r, { field: '', reason: ingestText.underOtherHeader(otherLine) });
    otherFrom = -1;
  };
  for (const i of candidates) {
    const k = kind(i);
    if (k === null) continue;
    if (otherFrom >= 0) closeOther(i);
    if (k === 'repeat') {
      raw.rowErrors.set(i, { field: '', reason: '', skip: true });
      if (repeats++ === 0) firstRepeat = raw.lines[i];
    } else {
      raw.rowErrors.set(i, { field: '', reason: ingestText.otherHeader });
      otherFrom = i;
      otherLine = raw.lines[i];
    }
  }
  if (otherFrom >= 0) closeOther(raw.length);
  if (repeats > 0) raw.headerRepeats = { line: firstRepeat, count: repeats };
}


