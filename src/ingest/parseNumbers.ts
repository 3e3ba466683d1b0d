import type { RawColumn } from './RawTable.js';
import { NumTextColumn } from './NumTextColumn.js';

/** How a cell read as a number: a value, nothing, an explicit non-finite value, or not a number. */
export const CELL_OK = 0;
export const CELL_MISSING = 1;
export const CELL_NONFINITE = 2;
export const CELL_BAD = 3;

const NONFINITE: Record<string, number> = {
  nan: NaN, '-nan': NaN, '+nan': NaN, na: NaN, inf: Infinity, '+inf': Infinity, '-inf': -Infinity,
  infinity: Infinity, '+infinity': Infinity, '-infinity': -Infinity,
};

export interface ParsedColumn {
  values: Float64Array;
  kind: Uint8Array;
  /** Some cells carried a '%' sign (already divided by 100). */
  percentSign: boolean;
  /** The first cell written with thousands separators ("4,000"), read without them. */
  thousands?: string;
}

/** "4,000" or "1,250,000.5": groups of three digits after a non-zero lead ("0,5" is a decimal comma). */
const THOUSANDS = /^[-+]?[1-9]\d{0,2}(,\d{3})+(\.\d+)?$/;
/** A number followed by a unit ("4000 samples", "12.5s"). */
const WITH_UNIT = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*([A-Za-zµ][A-Za-z0-9µ/_ ]*)$/;
const DECIMAL_COMMA = /^[-+]?\d+,\d+$/;

/** Why a cell that is not a number is not one, for the rejection message: a unit, a decimal comma, or null. */
export function notNumberHint(text: string): { unit: string } | { decimalComma: true } | null {
  const t = text.trim();
  const u = WITH_UNIT.exec(t);
  if (u && !(u[3].toLowerCase() in NONFINITE)) return { unit: u[3].trim() };
  if (DECIMAL_COMMA.test(t)) return { decimalComma: true };
  return null;
}

/** Parses one column into numbers in a single pass (cell kinds say why a value is NaN). */
export function parseColumn(col: RawColumn, n: number): ParsedColumn {
  const kind = new Uint8Array(n);
  let percentSign = false;
  if (col instanceof NumTextColumn) {
    // Takes over the column's own array (a raw table is read once).
    const values = col.values.length === n ? col.values : col.values.slice(0, n);
    for (let i = 0; i < n; i++) {
      const v = values[i];
      if (v === Infinity || v === -Infinity) kind[i] = CELL_NONFINITE;
    }
    if (col.texts.size > 0) {
      const texts = [...col.texts.entries()];
      const sub = parseColumn(texts.map(([, t]) => t), texts.length);
      texts.forEach(([row], k) => {
        values[row] = sub.values[k];
        kind[row] = sub.kind[k];
      });
      percentSign = sub.percentSign;
      if (sub.thousands !== undefined) return { values, kind, percentSign, thousands: sub.thousands };
    }
    return { values, kind, percentSign };
  }
  const values = new Float64Array(n);
  let thousands: string | undefined;
  if (col instanceof Float64Array) {
    for (let i = 0; i < n; i++) {
      const v = col[i];
      values[i] = v;
      if (v !== v || v === Infinity || v === -Infinity) kind[i] = CELL_NONFINITE;
    }
    return { values, kind, percentSign };
  }
  for (let i = 0; i < n; i++) {
    const c = col[i];
    if (typeof c === 'number') {
      values[i] = c;
      if (!Number.isFinite(c)) kind[i] = CELL_NONFINITE;
      continue;
    }
    if (c === undefined || c === null || c === '') {
      values[i] = NaN;
      kind[i] = CELL_MISSING;
      continue;
    }
    if (typeof c === 'boolean') {
      values[i] = NaN;
      kind[i] = CELL_BAD;
      continue;
    }
    const v = +c;
    if (v === v && (v !== 0 || c.trim() !== '')) {
      values[i] = v;
      if (v === Infinity || v === -Infinity) kind[i] = CELL_NONFINITE;
      continue;
    }
    const t = c.trim().toLowerCase();
    if (t === '') {
      values[i] = NaN;
      kind[i] = CELL_MISSING;
    } else if (t in NONFINITE) {
      values[i] = NONFINITE[t];
      kind[i] = CELL_NONFINITE;
    } else if (t.endsWith('%') && t.length > 1 && Number.isFinite(+t.slice(0, -1))) {
      values[i] = +t.slice(0, -1) / 100;
      percentSign = true;
    } else if (THOUSANDS.test(t)) {
      values[i] = +t.replace(/,/g, '');
      thousands ??= t;
    } else {
      values[i] = NaN;
      kind[i] = CELL_BAD;
    }
  }
  return thousands === undefined ? { values, kind, percentSign } : { values, kind, percentSign, thousands };
}

/** Whether every non-empty cell of a column reads as a number (so it is a metric, not a label). */
export function isNumericColumn(col: RawColumn, n: number): boolean {
  if (col instanceof Float64Array) return true;
  if (col instanceof NumTextColumn) {
    if (col.texts.size === n) return isNumericColumn([...col.texts.values()], col.texts.size);
    // A text cell that reads as a number (a JSON string "12") counts as one, as in plain arrays.
    for (const t of col.texts.values()) if (t.trim() !== '' && +t !== +t && !(t.trim().toLowerCase() in NONFINITE) && !THOUSANDS.test(t.trim())) return false;
    return true;
  }
  let any = false;
  for (let i = 0; i < n; i++) {
    const c = col[i];
    if (c === undefined || c === null || c === '') continue;
    if (typeof c === 'number') {
      any = true;
      continue;
    }
    if (typeof c !== 'string') return false;
    const v = +c;
    if (v !== v && !(c.trim().toLowerCase() in NONFINITE) && !THOUSANDS.test(c.trim())) return false;
    if (c.trim() === '') continue;
    any = true;
  }
  return any;
}
