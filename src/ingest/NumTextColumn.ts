/**
 * A column read from text as numbers where it can be, with the text of every cell that is not a
 * plain number (empty, "nan", "abc", a label) kept beside it by row. Most sweep columns are all
 * numbers, so this costs one Float64Array and an empty map: no string per cell survives parsing.
 */
export class NumTextColumn {
  values: Float64Array;
  readonly texts = new Map<number, string>();
  length = 0;
  constructor(capacity = 1024) {
    this.values = new Float64Array(capacity);
  }

  push(v: number): void {
    if (this.length === this.values.length) this.grow();
    this.values[this.length++] = v;
  }

  pushText(s: string): void {
    if (this.length === this.values.length) this.grow();
    this.texts.set(this.length, s);
    this.values[this.length++] = NaN;
  }

  /** The cell as read: its text when it was not a plain number, else the number. */
  at(i: number): string | number {
    const t = this.texts.get(i);
    return t === undefined ? this.values[i] : t;
  }

  finish(): this {
    if (this.values.length !== this.length) this.values = this.values.subarray(0, this.length);
    return this;
  }

  private grow(): void {
    const next = new Float64Array(Math.max(1024, this.values.length * 2));
    next.set(this.values);
    this.values = next;
  }
}

/** Exact powers of ten (10^22 is the largest a double holds exactly). */
export const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

/**
 * Parses a plain decimal (`-12.5e-3`) from text[i, j) without making a string. Exact: the
 * digits form an integer below 2^53 scaled by 10^±22 at most, so one IEEE multiply or divide
 * of two exact values rounds correctly (Clinger's fast path). Returns NaN when the text is not
 * such a number (the caller then falls back to Number()).
 */
export function parseDecimal(text: string, i: number, j: number): number {
  if (i >= j) return NaN;
  let k = i;
  let c = text.charCodeAt(k);
  let neg = false;
  if (c === 45 || c === 43) {
    neg = c === 45;
    k++;
  }
  let m = 0;
  let exp = 0;
  let digits = 0;
  while (k < j) {
    c = text.charCodeAt(k) - 48;
    if (c < 0 || c > 9) break;
    m = m * 10 + c;
    digits++;
    k++;
  }
  if (k < j && text.charCodeAt(k) === 46) {
    k++;
    while (k < j) {
      c = text.charCodeAt(k) - 48;
      if (c < 0 || c > 9) break;
      m = m * 10 + c;
      exp--;
      digits++;
      k++;
    }
  }
  if (digits === 0) return NaN;
  if (k < j) {
    c = text.charCodeAt(k);
    if (c !== 101 && c !== 69) return NaN;
    k++;
    let eneg = false;
    c = text.charCodeAt(k);
    if (c === 45 || c === 43) {
      eneg = c === 45;
      k++;
    }
    let e = 0;
    let ed = 0;
    while (k < j) {
      c = text.charCodeAt(k) - 48;
      if (c < 0 || c > 9) return NaN;
      e = e * 10 + c;
      ed++;
      k++;
      if (e > 400) return NaN;
    }
    if (ed === 0) return NaN;
    exp += eneg ? -e : e;
  }
  if (m > 9007199254740991) return NaN;
  let v: number;
  if (exp === 0) v = m;
  else if (exp < 0 && exp >= -22) v = m / POW10[-exp];
  else if (exp > 0 && exp <= 22) v = m * POW10[exp];
  else return NaN;
  return neg ? -v : v;
}
