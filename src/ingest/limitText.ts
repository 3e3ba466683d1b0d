import { NumTextColumn } from './NumTextColumn.js';
import type { RawTable } from './RawTable.js';
import { ingestText } from '../messages.js';

/**
 * Applies the text-field limit to a table as read, whatever its format: a cell holding more than
 * `maxText` characters rejects its row (naming the field and the limit), a column name or a
 * per-source constant over it is left out with a note. Run names and conditions are built from
 * these texts, so none of them can grow past the limit. Numeric logs pay only a look at their
 * (few) text cells.
 */
export function limitText(raw: RawTable, opts: { maxText: number; source: string }): void {
  const { maxText, source } = opts;
  const reject = (row: number, field: string, length: number) => {
    if (!raw.rowErrors.has(row)) raw.rowErrors.set(row, { field, reason: ingestText.textTooLong(length, maxText) });
  };
  for (let j = 0; j < raw.columns.length; j++) {
    const col = raw.columns[j];
    const name = raw.names[j] ?? '';
    if (col instanceof NumTextColumn) {
      for (const [row, t] of col.texts) if (t.length > maxText) reject(row, name, t.length);
    } else if (Array.isArray(col)) {
      for (let row = 0; row < col.length; row++) {
        const v = col[row];
        if (typeof v === 'string' && v.length > maxText) reject(row, name, v.length);
      }
    }
  }
  if (raw.names.some((nm) => nm.length > maxText)) {
    const keep: number[] = [];
    raw.names.forEach((nm, j) => {
      if (nm.length > maxText) (raw.notes ??= []).push(ingestText.longColumnName(source, j + 1, nm.length, maxText));
      else keep.push(j);
    });
    raw.names = keep.map((j) => raw.names[j]);
    raw.columns = keep.map((j) => raw.columns[j]);
  }
  for (const key of Object.keys(raw.constants)) {
    const v = raw.constants[key];
    const long = key.length > maxText ? key.length : typeof v === 'string' && v.length > maxText ? v.length : 0;
    if (long === 0) continue;
    (raw.notes ??= []).push(ingestText.longConstant(source, key, long, maxText));
    delete raw.constants[key];
  }
}
