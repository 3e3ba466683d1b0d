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
    }
    return { values, kind, percentSign };
  }
  const values = new Float64Array(n);
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
    } else {
      values[i] = NaN;
      kind[i] = CELL_BAD;
    }
  }
  return { values, kind, percentSign };
}

/** Whether every non-empty cell of a column reads as a number (so it is a metric, not a label). */
export function isNumericColumn(col: RawColumn, n: number): boolean {
  if (col instanceof Float64Array) return true;
  if (col instanceof NumTextColumn) {
    if (col.texts.size === n) return isNumericColumn([...col.texts.values()], col.texts.size);
    for (const t of col.texts.values()) if (t.trim() !== '' && !(t.trim().toLowerCase() in NONFINITE)) return false;
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
    if (v !== v && !(c.trim().toLowerCase() in NONFINITE)) return false;
    if (c.trim() === '') continue;
    any = true;
  }
  return any;
}
