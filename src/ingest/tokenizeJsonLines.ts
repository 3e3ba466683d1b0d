import { NumTextColumn, POW10 } from './NumTextColumn.js';
import { emptyRaw, flattenRecord } from './RawTable.js';
import type { RawTable, RawValue } from './RawTable.js';
import { JsonTooDeep, jsonWhy, parseJsonLenient } from './parseJsonLenient.js';
import { ingestText } from '../messages.js';
import { DEFAULT_LIMITS } from './ReadLimits.js';
import type { ReadLimits } from './ReadLimits.js';

const QUOTE = 34;
const BACKSLASH = 92;
const COMMA = 44;
const COLON = 58;
const OPEN = 123;
const CLOSE = 125;

// Field kinds found by the scan of one line.
const NUM = 0;
const STR = 1;
const TRUE = 2;
const FALSE = 3;
const NULL = 4;

const isSpace = (c: number) => c === 32 || c === 9 || c === 13;
const isDigit = (c: number) => c >= 48 && c <= 57;
/** A key JSON.parse would enumerate out of order (an array index comes first) or drop (`__proto__`). */
const unusualKey = (k: string) => k === '__proto__' || /^(0|[1-9]\d*)$/.test(k);
/** A key that can be matched against the raw characters of a line (nothing escaped or special). */
const plainKey = (k: string) => !/["\\\u0000-\u001f]/.test(k);

/** Keys of a record, counted up to one past `max`. */
function keyCount(o: Record<string, unknown>, max: number): number {
  let k = 0;
  for (const _ in o) if (++k > max) break;
  return k;
}

/** The value of the number readNumber last read (a variable, not an object per number). */
let numberValue = 0;

/**
 * Reads the ECMA-404 number -?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)? at text[i] in one pass:
 * the index after it (its value in numberValue), or -1 when the text there is not one. The text
 * must go on with a non-digit (every line read here ends in a line feed). The value is exact
 * where the digits fit in 2^53 and the power of ten is exact (Clinger's fast path, as
 * parseDecimal), else the engine's own conversion of the literal, as JSON.parse.
 */
function readNumber(text: string, i: number): number {
  const vs = i;
  let c = text.charCodeAt(i);
  const neg = c === 45;
  if (neg) c = text.charCodeAt(++i);
  let m = 0;
  let exp = 0;
  if (c === 48) c = text.charCodeAt(++i);
  else if (c >= 49 && c <= 57) {
    do {
      m = m * 10 + (c - 48);
      c = text.charCodeAt(++i);
    } while (c >= 48 && c <= 57);
  } else return -1;
  if (c === 46) {
    c = text.charCodeAt(++i);
    if (!(c >= 48 && c <= 57)) return -1;
    do {
      m = m * 10 + (c - 48);
      exp--;
      c = text.charCodeAt(++i);
    } while (c >= 48 && c <= 57);
  }
  if (c === 101 || c === 69) {
    c = text.charCodeAt(++i);
    let eneg = false;
    if (c === 43 || c === 45) {
      eneg = c === 45;
      c = text.charCodeAt(++i);
    }
    if (!(c >= 48 && c <= 57)) return -1;
    let e = 0;
    do {
      if (e < 1000) e = e * 10 + (c - 48);
      c = text.charCodeAt(++i);
    } while (c >= 48 && c <= 57);
    exp += eneg ? -e : e;
  }
  let v: number;
  if (m <= 9007199254740991 && exp >= -22 && exp <= 22) v = exp === 0 ? m : exp < 0 ? m / POW10[-exp] : m * POW10[exp];
  else v = Math.abs(Number(text.slice(vs, i)));
  numberValue = neg ? -v : v;
  return i;
}

/**
 * JSON Lines straight into typed columns, the hot path of JSON Lines ingest. A line that is one
 * flat record of numbers, strings without escapes, booleans and null (what training loops log) is
 * scanned in place: numbers parsed from the characters (ECMA-404 number grammar, checked), no
 * object per line. Any other line (nested objects, escapes, NaN, not JSON at all) goes through
 * JSON.parse as a whole, so what a line means never depends on which path read it.
 * Cells: numbers as numbers; strings, `true` and `false` as text; null and absent keys as "".
 * Limits (ReadLimits): a line longer than `maxLine` is rejected unread, one with more than
 * `maxFields` keys is rejected when the scan passes the limit, one nested deeper than MAX_DEPTH
 * is rejected before it is parsed; each is one rejected row naming its line, the rest are read.
 */
export function tokenizeJsonLines(text: string, limits: ReadLimits = DEFAULT_LIMITS): RawTable {
  const { maxLine, maxFields } = limits;
  const raw = emptyRaw('jsonl');
  const columns: NumTextColumn[] = [];
  const index = new Map<string, number>();
  // The key seen at each position of the previous record: logs repeat one key order.
  const seenName: string[] = [];
  const seenCol: number[] = [];
  // One line's fields, found before any is stored (a line that leaves the fast path stores nothing).
  let cap = 16;
  let fCol = new Int32Array(cap);
  let fKeyStart = new Int32Array(cap);
  let fKeyEnd = new Int32Array(cap);
  let fKind = new Uint8Array(cap);
  let fStart = new Int32Array(cap);
  let fEnd = new Int32Array(cap);
  let fNum = new Float64Array(cap);
  let fValue = new Int32Array(cap);
  const growFields = () => {
    cap *= 2;
    const g = <T extends Int32Array | Uint8Array | Float64Array>(a: T): T => {
      const b = new (a.constructor as new (n: number) => T)(cap);
      b.set(a);
      return b;
    };
    [fCol, fKeyStart, fKeyEnd, fKind, fStart, fEnd, fNum, fValue] = [g(fCol), g(fKeyStart), g(fKeyEnd), g(fKind), g(fStart), g(fEnd), g(fNum), g(fValue)];
  };

  const columnOf = (name: string): number => {
    let j = index.get(name);
    if (j === undefined) {
      j = columns.length;
      index.set(name, j);
      raw.names.push(name);
      columns.push(new NumTextColumn(Math.max(16, raw.length + 1)));
    }
    return j;
  };
  /** Cell (col, row): rows the column skipped are absent (""); a key repeated in one record overwrites (last wins, as JSON.parse). */
  const at = (col: NumTextColumn, row: number): boolean => {
    while (col.length < row) col.pushText('');
    if (col.length === row) return false;
    col.texts.delete(row);
    return true;
  };
  const setNumber = (j: number, row: number, v: number) => {
    const col = columns[j];
    if (at(col, row)) col.values[row] = v;
    else col.push(v);
  };
  const setText = (j: number, row: number, s: string) => {
    const col = columns[j];
    if (at(col, row)) {
      col.values[row] = NaN;
      col.texts.set(row, s);
    } else col.pushText(s);
  };
  const setValue = (j: number, row: number, v: RawValue) => {
    if (typeof v === 'number') setNumber(j, row, v);
    else setText(j, row, v === null || v === undefined ? '' : String(v));
  };

  /** Scans the record on text[start, end); the number of fields, -1 when the line needs JSON.parse, -2 when it has more than maxFields. */
  const scan = (start: number, end: number): number => {
    let i = start;
    while (i < end && isSpace(text.charCodeAt(i))) i++;
    if (text.charCodeAt(i) !== OPEN || i >= end) return -1;
    i++;
    while (i < end && isSpace(text.charCodeAt(i))) i++;
    let nf = 0;
    if (text.charCodeAt(i) === CLOSE) i++;
    else {
      for (;;) {
        if (i >= end || text.charCodeAt(i) !== QUOTE) return -1;
        const ks = ++i;
        let c = 0;
        while (i < end && (c = text.charCodeAt(i)) !== QUOTE) {
          if (c === BACKSLASH || c < 32) return -1;
          i++;
        }
        if (i >= end) return -1;
        const ke = i++;
        if (nf === maxFields) return -2;
        if (nf === cap) growFields();
        // The column of this key: the one at this position last time when the characters match.
        const prev = seenName[nf];
        fCol[nf] = prev !== undefined && ke - ks === prev.length && text.startsWith(prev, ks) ? seenCol[nf] : -1;
        fKeyStart[nf] = ks;
        fKeyEnd[nf] = ke;
        while (i < end && isSpace(text.charCodeAt(i))) i++;
        if (text.charCodeAt(i) !== COLON || i >= end) return -1;
        i++;
        while (i < end && isSpace(text.charCodeAt(i))) i++;
        if (i >= end) return -1;
        fValue[nf] = i;
        c = text.charCodeAt(i);
        if (c === QUOTE) {
          const vs = ++i;
          while (i < end && (c = text.charCodeAt(i)) !== QUOTE) {
            if (c === BACKSLASH || c < 32) return -1;
            i++;
          }
          if (i >= end) return -1;
          fKind[nf] = STR;
          fStart[nf] = vs;
          fEnd[nf] = i++;
        } else if (c === 45 || isDigit(c)) {
          i = readNumber(text, i);
          if (i < 0) return -1;
          fKind[nf] = NUM;
          fNum[nf] = numberValue;
        } else if (c === 116 && text.startsWith('true', i)) {
          fKind[nf] = TRUE;
          i += 4;
        } else if (c === 102 && text.startsWith('false', i)) {
          fKind[nf] = FALSE;
          i += 5;
        } else if (c === 110 && text.startsWith('null', i)) {
          fKind[nf] = NULL;
          i += 4;
        } else return -1;
        nf++;
        while (i < end && isSpace(text.charCodeAt(i))) i++;
        if (i >= end) return -1;
        c = text.charCodeAt(i++);
        if (c === CLOSE) break;
        if (c !== COMMA) return -1;
        while (i < end && isSpace(text.charCodeAt(i))) i++;
      }
    }
    while (i < end && isSpace(text.charCodeAt(i))) i++;
    if (i !== end) return -1;
    // New keys: one JSON.parse would order or drop differently goes the slow way.
    for (let f = 0; f < nf; f++) {
      if (fCol[f] >= 0) continue;
      const name = text.slice(fKeyStart[f], fKeyEnd[f]);
      const j = index.get(name);
      if (j === undefined && unusualKey(name)) return -1;
      fCol[f] = j ?? -2 - f; // -2 - f: a column to create when the line is stored
    }
    return nf;
  };

  const store = (nf: number, row: number) => {
    for (let f = 0; f < nf; f++) {
      let j = fCol[f];
      if (j < 0) j = fCol[f] = columnOf(text.slice(fKeyStart[f], fKeyEnd[f]));
      seenCol[f] = j;
      seenName[f] = raw.names[j];
      switch (fKind[f]) {
        case NUM:
          setNumber(j, row, fNum[f]);
          break;
        case STR:
          setText(j, row, text.slice(fStart[f], fEnd[f]));
          break;
        case TRUE:
          setText(j, row, 'true');
          break;
        case FALSE:
          setText(j, row, 'false');
          break;
        default:
          setText(j, row, '');
      }
    }
  };

  // The last record's layout, as raw text from each key's opening quote to its value (`"width": `):
  // a line laid out the same way is read by matching those tokens, one native compare per key.
  let shapeTok: string[] = [];
  let shapeCol: number[] = [];
  const learnShape = (nf: number) => {
    const seen = new Set<number>();
    for (let f = 0; f < nf; f++) seen.add(fCol[f]);
    if (seen.size !== nf) {
      shapeTok = [];
      return;
    }
    shapeTok = Array.from({ length: nf }, (_, f) => text.slice(fKeyStart[f] - 1, fValue[f]));
    shapeCol = Array.from(fCol.subarray(0, nf));
  };
  const unstore = (fields: number, row: number) => {
    for (let f = 0; f < fields; f++) {
      const col = columns[shapeCol[f]];
      if (col.length === row + 1) {
        col.length = row;
        col.texts.delete(row);
      }
    }
  };
  /** Reads a line laid out as the last record; false (nothing stored) when it is not. */
  const readShaped = (start: number, end: number, row: number): boolean => {
    const nShape = shapeTok.length;
    if (nShape === 0 || text.charCodeAt(start) !== OPEN) return false;
    let i = start + 1;
    let f = 0;
    // text[end] is the line feed: every scan below stops there without a bounds check.
    for (;;) {
      if (f === nShape || !text.startsWith(shapeTok[f], i)) return unstore(f, row), false;
      i += shapeTok[f].length;
      const col = columns[shapeCol[f]];
      while (col.length < row) col.pushText('');
      let c = text.charCodeAt(i);
      if (c === 45 || (c >= 48 && c <= 57)) {
        i = readNumber(text, i);
        if (i < 0) return unstore(f, row), false;
        col.push(numberValue);
      } else if (c === QUOTE) {
        const vs = i + 1;
        do c = text.charCodeAt(++i);
        while (c !== QUOTE && c !== BACKSLASH && c >= 32);
        if (c !== QUOTE) return unstore(f, row), false;
        col.pushText(text.slice(vs, i++));
      } else if (c === 116 && text.startsWith('true', i)) {
        col.pushText('true');
        i += 4;
      } else if (c === 102 && text.startsWith('false', i)) {
        col.pushText('false');
        i += 5;
      } else if (c === 110 && text.startsWith('null', i)) {
        col.pushText('');
        i += 4;
      } else return unstore(f, row), false;
      f++;
      c = text.charCodeAt(i);
      while (c === 32) c = text.charCodeAt(++i);
      if (c === CLOSE) break;
      if (c !== COMMA) return unstore(f, row), false;
      c = text.charCodeAt(++i);
      while (c === 32) c = text.charCodeAt(++i);
    }
    i++;
    while (i < end && isSpace(text.charCodeAt(i))) i++;
    if (i !== end) return unstore(f, row), false;
    return true;
  };

  let start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  const n = text.length;
  const lines = raw.lines;
  while (start < n) {
    const end = text.indexOf('\n', start);
    if (end < 0) {
      if (text.slice(start).trim() !== '') raw.pendingLine = line;
      break;
    }
    const row = raw.length;
    if (end - start > maxLine) {
      // Not looked into: the limit bounds what one line may cost.
      raw.rowErrors.set(row, { field: '', reason: ingestText.lineTooLong(maxLine) });
      lines.push(line);
      raw.length++;
      line++;
      start = end + 1;
      continue;
    }
    if (readShaped(start, end, row)) {
      lines.push(line);
      raw.length++;
      line++;
      start = end + 1;
      continue;
    }
    const nf = scan(start, end);
    if (nf === -2) {
      raw.rowErrors.set(row, { field: '', reason: ingestText.tooManyFields(maxFields) });
      lines.push(line);
      raw.length++;
    } else if (nf >= 0) {
      store(nf, row);
      learnShape(nf);
      lines.push(line);
      raw.length++;
    } else {
      const body = text.slice(start, end).trim();
      if (body !== '') {
        let rec: unknown;
        let why: string | null = null;
        try {
          rec = parseJsonLenient(body);
        } catch (err) {
          why = err instanceof JsonTooDeep ? ingestText.tooDeep(err.limit) : ingestText.badJsonLineWhy(jsonWhy(err));
        }
        if (why === null && (rec === null || typeof rec !== 'object' || Array.isArray(rec))) why = ingestText.notARecord;
        const flat = why === null ? flattenRecord(rec as Record<string, unknown>) : null;
        if (flat !== null && keyCount(flat, maxFields) > maxFields) why = ingestText.tooManyFields(maxFields);
        if (why !== null || flat === null) raw.rowErrors.set(row, { field: '', reason: why ?? ingestText.notARecord });
        else {
          let f = 0;
          for (const key in flat) {
            const j = columnOf(key);
            setValue(j, row, flat[key]);
            // Only plain keys are matched against raw characters later.
            if (plainKey(key)) {
              seenName[f] = key;
              seenCol[f] = j;
            } else seenName[f] = '\u0000';
            f++;
          }
        }
        lines.push(line);
        raw.length++;
      }
    }
    line++;
    start = end + 1;
  }
  for (const col of columns) {
    while (col.length < raw.length) col.pushText('');
    col.finish();
  }
  raw.columns = columns;
  return raw;
}
