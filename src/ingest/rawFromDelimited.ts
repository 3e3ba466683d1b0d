import { emptyRaw } from './RawTable.js';
import type { RawTable, RawValue } from './RawTable.js';
import { tokenizeWhitespace } from './tokenizeDelimited.js';
import { tokenizeToColumns } from './tokenizeToColumns.js';

import { ingestText } from '../messages.js';

/**
 * Reads CSV (`,`), TSV (tab) or whitespace-separated text with a header line into columns.
 * Header names are trimmed; a row with a different number of fields than the header is kept
 * as a row error (rejected with its line), never silently padded.
 */
export function rawFromDelimited(text: string, delimiter: ',' | '\t' | 'whitespace'): RawTable {
  const format = delimiter === ',' ? 'csv' : delimiter === '\t' ? 'tsv' : 'text';
  const raw = emptyRaw(format);
  if (delimiter !== 'whitespace') {
    const t = tokenizeToColumns(text, delimiter);
    raw.names = t.names;
    raw.columns = t.columns;
    raw.lines = t.lines;
    raw.length = t.lines.length;
    raw.rowErrors = t.rowErrors;
    raw.pendingLine = t.pendingLine;
    return raw;
  }
  let columns: RawValue[][] = [];
  let width = 0;
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
    if (count !== width) raw.rowErrors.set(row, { field: '', reason: ingestText.fieldCount(width, count) });
    for (let j = 0; j < width; j++) columns[j][row] = j < count ? fields[j] : '';
  });
  raw.columns = columns;
  // A header still being written is not a row; only a data row can be pending.
  raw.pendingLine = width === 0 ? 0 : end.pendingLine;
  return raw;
}


