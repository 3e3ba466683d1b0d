/**
 * RFC 4180 tokenizer for CSV/TSV text: quoted fields with embedded delimiters, doubled quotes and
 * line breaks; CRLF, LF or CR line ends; a leading byte-order mark. Rows are handed to `onRow`
 * in one reused array (no per-row objects). A last row without a line end, or an unterminated
 * quoted field, is not emitted: it is reported as pending (a log still being written).
 */
export interface TokenizeEnd {
  /** Physical lines seen (1-based number of the line after the last complete row). */
  lines: number;
  /** Line where an incomplete final row starts, or 0 when the text ended cleanly. */
  pendingLine: number;
}

export type RowHandler = (fields: string[], count: number, line: number) => void;

const QUOTE = 34;
const CR = 13;
const LF = 10;

function countLf(text: string, from: number, to: number): number {
  let k = 0;
  let p = text.indexOf('\n', from);
  while (p >= 0 && p < to) {
    k++;
    p = text.indexOf('\n', p + 1);
  }
  return k;
}

export function tokenizeDelimited(text: string, delimiter: string, onRow: RowHandler): TokenizeEnd {
  const d = delimiter.charCodeAt(0);
  const n = text.length;
  const fields: string[] = [];
  let count = 0;
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  let rowLine = 1;
  let quotedFirst = false;
  while (i < n) {
    let c = text.charCodeAt(i);
    if (count === 0) quotedFirst = c === QUOTE;
    if (c === QUOTE) {
      let j = i + 1;
      let seg = j;
      let value = '';
      for (;;) {
        const q = text.indexOf('"', j);
        if (q < 0) return { lines: line, pendingLine: rowLine };
        if (text.charCodeAt(q + 1) === QUOTE) {
          value += text.slice(seg, q + 1);
          j = q + 2;
          seg = j;
          continue;
        }
        value += text.slice(seg, q);
        line += countLf(text, i, q);
        i = q + 1;
        break;
      }
      // Lenient: characters after a closing quote (not allowed by RFC 4180) are kept.
      let j2 = i;
      while (j2 < n) {
        c = text.charCodeAt(j2);
        if (c === d || c === LF || c === CR) break;
        j2++;
      }
      if (j2 > i) value += text.slice(i, j2);
      i = j2;
      fields[count++] = value;
    } else {
      let j = i;
      while (j < n) {
        c = text.charCodeAt(j);
        if (c === d || c === LF || c === CR) break;
        j++;
      }
      fields[count++] = text.slice(i, j);
      i = j;
    }
    if (i >= n) break; // row ended without a line end: pending
    c = text.charCodeAt(i);
    if (c === d) {
      i++;
      if (i >= n) break;
      c = text.charCodeAt(i);
      if (c === LF || c === CR) fields[count++] = ''; // trailing empty field before the line end
      else continue;
    }
    // c is CR or LF here
    i++;
    if (c === CR && text.charCodeAt(i) === LF) i++;
    if (!(count === 1 && fields[0] === '' && !quotedFirst)) onRow(fields, count, rowLine); // skip blank lines
    line++;
    rowLine = line;
    count = 0;
  }
  return { lines: line, pendingLine: count > 0 ? rowLine : 0 };
}

/**
 * Whitespace-separated text with a header line (e.g. `epoch  width  test_err`): fields split
 * on runs of spaces or tabs; blank lines and lines starting with '#' are skipped.
 */
export function tokenizeWhitespace(text: string, onRow: RowHandler): TokenizeEnd {
  const n = text.length;
  let start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  const fields: string[] = [];
  while (start < n) {
    let end = text.indexOf('\n', start);
    if (end < 0) {
      const rest = text.slice(start).trim();
      return { lines: line, pendingLine: rest === '' || rest.startsWith('#') ? 0 : line };
    }
    let stop = end;
    if (stop > start && text.charCodeAt(stop - 1) === CR) stop--;
    const body = text.slice(start, stop).trim();
    if (body !== '' && body.charCodeAt(0) !== 35) {
      const parts = body.split(/[ \t]+/);
      for (let k = 0; k < parts.length; k++) fields[k] = parts[k];
      onRow(fields, parts.length, line);
    }
    line++;
    start = end + 1;
  }
  return { lines: line, pendingLine: 0 };
}
