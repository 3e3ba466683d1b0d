import { DictionaryBuilder } from './textCodes.js';

/**
 * Dictionary-encodes a text column: each distinct value once in `dict`, and per row its index in
 * `codes`. Runs of equal values (a run's rows sit together) skip the hash lookup. A missing
 * value counts as "".
 */
export function dictionaryEncode(values: readonly string[]): { dict: string[]; codes: Int32Array } {
  const builder = new DictionaryBuilder();
  const codes = new Int32Array(values.length);
  let last: string | undefined;
  let lastCode = -1;
  for (let i = 0; i < values.length; i++) {
    const v = values[i] ?? '';
    if (v !== last) {
      last = v;
      lastCode = builder.code(v);
    }
    codes[i] = lastCode;
  }
  return { dict: builder.dict, codes };
}
