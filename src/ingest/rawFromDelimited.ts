import { emptyRaw } from './RawTable.js';
import type { RawTable } from './RawTable.js';
import { tokenizeDelimited, tokenizeWhitespace } from './tokenizeDelimited.js';
import { ingestText } from '../messages.js';

/**
 * Reads CSV (`,`), TSV (tab) or whitespace-separated text with a header line into columns.
 * Header names are trimmed; a row with a different number of fields than the header is kept
 * as a row error (rejected with its line), never silently padded.
 */
export function rawFromDelimited(text: string, delimiter: ',' | '\t' | 'whitespace'): RawTable {
  const format = delimiter === ',' ? 'csv' : delimiter === '\t' ? 'tsv' : 'text';
  const raw = emptyRaw(format);
  let columns: string[][] = [];
  let width = 0;
  const onRow = (fields: string[], count: number, line: number) => {
    if (width === 0) {
      raw.names = fields.slice(0, count).map((f) => f.trim());
      width = count;
      columns = raw.names.map(() => []);
      raw.columns = columns;
      return;
    }
    const row = raw.length;
    raw.lines.push(line);
    raw.length = row + 1;
    if (count !== width) {
      raw.rowErrors.set(row, { field: '', reason: ingestText.fieldCount(width, count) });
      for (let j = 0; j < width; j++) columns[j][row] = '';
      return;
    }
    for (let j = 0; j < width; j++) columns[j][row] = fields[j];
  };
  const end = delimiter === 'whitespace' ? tokenizeWhitespace(text, onRow) : tokenizeDelimited(text, delimiter, onRow);
  // A header still being written is not a row; only a data row can be pending.
  raw.pendingLine = width === 0 ? 0 : end.pendingLine;
  return raw;
}
