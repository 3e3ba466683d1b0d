import type { RowTable, TextCodes, TextColumn } from './RowTable.js';

export const TEXT_COLUMNS: readonly TextColumn[] = ['run', 'condition', 'source', 'status'];

/** The strings of a coded text column, one per row. */
export function decodeCodes(c: TextCodes): string[] {
  const { codes, dict } = c;
  const out = new Array<string>(codes.length);
  for (let i = 0; i < codes.length; i++) out[i] = dict[codes[i]];
  return out;
}

/** Defines `key` on `obj` as computed on first read, then kept (a plain writable value from then on). */
export function lazyProperty<T extends object, K extends keyof T>(obj: T, key: K, make: () => T[K]): void {
  Object.defineProperty(obj, key, {
    configurable: true,
    enumerable: true,
    get() {
      const value = make();
      Object.defineProperty(obj, key, { value, writable: true, configurable: true, enumerable: true });
      return value;
    },
  });
}

/**
 * Gives `table` its text columns as codes: `table.codes` is set and each coded column's string
 * array is built only when first read (a million-element array costs ~40 ms, mostly in faulting
 * in fresh memory, and the row loops over a store read the codes instead).
 */
export function attachTextCodes(table: object, codes: Partial<Record<TextColumn, TextCodes>>): void {
  const t = table as { -readonly [K in keyof RowTable]: RowTable[K] };
  t.codes = codes;
  for (const name of TEXT_COLUMNS) {
    const c = codes[name];
    if (c) lazyProperty(t, name, () => decodeCodes(c) as never);
  }
}

/** Builds one dictionary over values arriving from several tables (each value coded once). */
export class DictionaryBuilder {
  readonly dict: string[] = [];
  private readonly index = new Map<string, number>();

  code(value: string): number {
    let c = this.index.get(value);
    if (c === undefined) {
      c = this.dict.length;
      this.dict.push(value);
      this.index.set(value, c);
    }
    return c;
  }

  /**
   * Maps another dictionary's codes to this one's. An entry joins this dictionary only when first
   * translated, so a dictionary built from the rows kept holds no value of a dropped row.
   */
  translator(dict: readonly string[]): (code: number) => number {
    const tr = new Int32Array(dict.length).fill(-1);
    return (code) => {
      let g = tr[code];
      if (g < 0) g = tr[code] = this.code(dict[code]);
      return g;
    };
  }
}
