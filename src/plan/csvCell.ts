import { quoteCsvField } from '../csv/quoteCsvField.js';

/**
 * One CSV cell: RFC 4180 quoting (fields with a comma, double quote, CR or LF are quoted, quotes
 * doubled), and text that a spreadsheet would run as a formula (starting with = + - @, tab or CR)
 * is made inert with a leading apostrophe (OWASP "CSV injection" advice, common practice).
 * Text already starting with apostrophes before such a character gets one more, so
 * `uninertCell` restores every value exactly. Finite numbers are written as numbers.
 */
export function csvCell(value: string | number | null): string {
  if (value === null) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  let v = value;
  if (/^'*[=+\-@\t\r]/.test(v)) v = `'${v}`;
  return quoteCsvField(v);
}

/** The inverse of the spreadsheet guard of `csvCell` on an unquoted cell value. */
export function uninertCell(v: string): string {
  return /^'+[=+\-@\t\r]/.test(v) ? v.slice(1) : v;
}

/** A CSV line (without its line ending). */
export function csvLine(values: readonly (string | number | null)[]): string {
  return values.map(csvCell).join(',');
}
