import { NumTextColumn, parseDecimal } from './NumTextColumn.js';
import { ingestText } from '../messages.js';
import { DEFAULT_LIMITS } from './ReadLimits.js';
import type { ReadLimits } from './ReadLimits.js';

export interface DelimitedColumns {
  names: string[];
  columns: NumTextColumn[];
  lines: number[];
  rowErrors: Map<number, { field: string; reason: string }>;
  /** Line of an incomplete last row, or 0. */
  pendingLine: number;
}

const QUOTE = 34;
const CR = 13;
const LF = 10;

/**
 * The hot path of CSV/TSV ingest: RFC 4180 (quotes,
 * doubled quotes, embedded line breaks, CRLF/LF/CR, BOM, pending last row), but each field goes
 * straight into its column as a number (parsed from the characters, no string made) or, when it
 * is not a plain number, as text. A header line comes first.
 *
 * Limits (ReadLimits) are checked while scanning, so memory stays bounded whatever a line holds:
 * a row longer than `maxLine` characters or with more than `maxFields` fields is rejected as soon
 * as the limit is passed and the rest of it is skipped by native searches (no field is made); a
 * header over a limit refuses the file (its rows could not be read against it).
 */
export function tokenizeToColumns(text: string, delimiter: string, limits: ReadLimits = DEFAULT_LIMITS): DelimitedColumns {
  const d = delimiter.charCodeAt(0);
  const n = text.length;
  const { maxLine, maxFields } = limits;
  const names: string[] = [];
  const columns: NumTextColumn[] = [];
  const lines: number[] = [];
  const rowErrors = new Map<number, { field: string; reason: string }>();
  let width = -1; // -1 while reading the header
  let row = 0;
  let count = 0;
  let firstEmpty = false;
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  let rowLine = 1;
  let unterminated = false;
  // Scans of the row starting at rowStart stop at lim (checking `j < lim` costs what `j < n` did).
  const rowLimit = (from: number) => (from + maxLine < n ? from + maxLine : n);
  let lim = rowLimit(i);
  // Next line end and next quote at or after a position, remembered: skipping many rejected rows
  // searches the text once, not once per row.
  let nextLf = -1;
  let nextCr = -1;
  let nextQuote = -1;
  const find = (code: number, from: number, cached: number): number => {
    if (cached >= from) return cached;
    const p = text.indexOf(code === LF ? '\n' : code === CR ? '\r' : '"', from);
    return p < 0 ? n : p;
  };
  /**
   * A row over a limit: the header refuses the file; a row is rejected (columns padded, nothing
   * else kept) and the rest of it skipped. Returns where the next row starts.
   */
  // One error object per kind, shared by every row it fits (they are only read): a file of
  // millions of bad rows costs a map entry per row, not an object and a message each.
  let tooManyError: { field: string; reason: string } | undefined;
  let tooLongError: { field: string; reason: string } | undefined;
  const countErrors = new Map<number, { field: string; reason: string }>();
  const countError = (got: number) => {
    let e = countErrors.get(got);
    if (!e) countErrors.set(got, (e = { field: got < width ? names[got] : '', reason: ingestText.fieldCount(width, got) }));
    return e;
  };
  const overLimit = (at: number, tooMany: boolean): number => {
    if (width < 0) throw new Error(tooMany ? ingestText.headerTooManyFields(maxFields) : ingestText.headerTooLong(maxLine));
    for (let k = Math.min(count, width); k < width; k++) columns[k].push(NaN);
    rowErrors.set(row, tooMany ? (tooManyError ??= { field: '', reason: ingestText.tooManyFields(maxFields) }) : (tooLongError ??= { field: '', reason: ingestText.lineTooLong(maxLine) }));
    lines.push(rowLine);
    row++;
    const next = skipRow(at);
    line++;
    rowLine = line;
    count = 0;
    return next;
  };
  /** The index after the end of the row holding `from` (quoted fields keep their line breaks); counts the lines passed. */
  const skipRow = (from: number): number => {
    let p = from;
    for (;;) {
      nextLf = find(LF, p, nextLf);
      nextCr = find(CR, p, nextCr);
      nextQuote = find(QUOTE, p, nextQuote);
      const end = nextLf < nextCr ? nextLf : nextCr;
      const q = nextQuote;
      if (q < end) {
        const before = q > 0 ? text.charCodeAt(q - 1) : LF;
        // A quote opens a field only at the field's start (as in the scan below).
        if (before === d || before === LF || before === CR) {
          let c = q + 1;
          for (;;) {
            c = text.indexOf('"', c);
            if (c < 0 || text.charCodeAt(c + 1) !== QUOTE) break;
            c += 2;
          }
          if (c >= 0) {
            for (let k = text.indexOf('\n', q); k >= 0 && k < c; k = text.indexOf('\n', k + 1)) line++;
            p = c + 1;
            continue;
          }
        }
        p = q + 1;
        continue;
      }
      if (end >= n) return n;
      return text.charCodeAt(end) === CR && text.charCodeAt(end + 1) === LF ? end + 2 : end + 1;
    }
  };

  const putText = (s: string, quoted = false) => {
    if (width < 0) names.push(s.trim());
    else if (count < width) {
      const v = s.trim() === '' ? NaN : +s;
      if (v === v) columns[count].push(v);
      else columns[count].pushText(s);
    }
    if (count === 0) firstEmpty = s === '' && !quoted;
    count++;
  };
  const rollback = () => {
    if (width < 0) {
      names.length = 0;
      return;
    }
    for (let j = 0; j < Math.min(count, width); j++) {
      const col = columns[j];
      col.length--;
      col.texts.delete(col.length);
    }
  };

  while (i < n) {
    let c = text.charCodeAt(i);
    if (c === QUOTE) {
      let j = i + 1;
      let seg = j;
      let value = '';
      let closed = false;
      for (;;) {
        const q = text.indexOf('"', j);
        if (q < 0) break;
        if (text.charCodeAt(q + 1) === QUOTE) {
          // Past the line limit the row is rejected: its value is not built (a line of 100
          // million doubled quotes must not become 100 million pieces of string).
          if (q < lim) value += text.slice(seg, q + 1);
          j = q + 2;
          seg = j;
          continue;
        }
        if (q < lim) value += text.slice(seg, q);
        for (let p = text.indexOf('\n', i); p >= 0 && p < q; p = text.indexOf('\n', p + 1)) line++;
        i = q + 1;
        closed = true;
        break;
      }
      if (!closed) {
        // No closing quote anywhere after this one. In a file that stops mid-line: a row still
        // being written (a quoted field may span lines), pending. In a file that ends cleanly: a
        // broken row. It is rejected and, since the rest of the text holds no quote, reading
        // resumes cleanly on the next line.
        let e = i + 1;
        while (e < n && text.charCodeAt(e) !== LF && text.charCodeAt(e) !== CR) e++;
        const last = text.charCodeAt(n - 1);
        if (e >= n || (last !== LF && last !== CR)) {
          unterminated = true;
          break;
        }
        if (width < 0) throw new Error(ingestText.headerQuote);
        for (let k = Math.min(count, width); k < width; k++) columns[k].push(NaN);
        rowErrors.set(row, { field: count < width ? names[count] : '', reason: ingestText.unbalancedQuote(line) });
        lines.push(rowLine);
        row++;
        i = e + 1;
        if (text.charCodeAt(e) === CR && text.charCodeAt(i) === LF) i++;
        line++;
        rowLine = line;
        lim = rowLimit(i);
        count = 0;
        continue;
      }
      let j2 = i;
      while (j2 < lim) {
        c = text.charCodeAt(j2);
        if (c === d || c === LF || c === CR) break;
        j2++;
      }
      if (j2 > i) value += text.slice(i, j2);
      i = j2;
      putText(value, true);
    } else {
      let j = i;
      while (j < lim) {
        c = text.charCodeAt(j);
        if (c === d || c === LF || c === CR) break;
        j++;
      }
      if (width >= 0 && count < width) {
        const v = parseDecimal(text, i, j);
        if (v === v) {
          columns[count].push(v);
          if (count === 0) firstEmpty = false;
          count++;
        } else putText(text.slice(i, j));
      } else putText(text.slice(i, j));
      i = j;
    }
    if (i >= lim || count > maxFields) {
      if (i >= n && count <= maxFields) break;
      // The row's characters (up to its line end) number more than maxLine when the scan passed
      // lim, or stopped at it with more of the row to come.
      const e = i < n ? text.charCodeAt(i) : LF;
      if (count > maxFields || i > lim || (e !== LF && e !== CR)) {
        i = overLimit(i, count > maxFields);
        lim = rowLimit(i);
        continue;
      }
    }
    c = text.charCodeAt(i);
    if (c === d) {
      i++;
      if (i >= n) break;
      c = text.charCodeAt(i);
      if (c === LF || c === CR) {
        putText('');
        if (count > maxFields) {
          i = overLimit(i, true);
          lim = rowLimit(i);
          continue;
        }
      } else continue;
    }
    i++;
    if (c === CR && text.charCodeAt(i) === LF) i++;
    if (count === 1 && firstEmpty) rollback(); // blank line
    else if (width < 0) {
      width = names.length;
      // Size the columns from the header line's length so they rarely grow.
      const capacity = Math.ceil((n - i) / Math.max(8, i)) * 2 + 16;
      for (let k = 0; k < width; k++) columns.push(new NumTextColumn(capacity));
    } else {
      if (count !== width) {
        rowErrors.set(row, countError(count));
        for (let j = count; j < width; j++) columns[j].push(NaN);
      }
      lines.push(rowLine);
      row++;
    }
    line++;
    rowLine = line;
    lim = rowLimit(i);
    count = 0;
  }
  let pendingLine = 0;
  if (count > 0 || unterminated) {
    rollback();
    if (width >= 0) pendingLine = rowLine;
  }
  for (const col of columns) col.finish();
  return { names, columns, lines, rowErrors, pendingLine };
}
