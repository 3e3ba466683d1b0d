/**
 * Dictionary-encodes a text column: each distinct value once in `dict`, and per row its index in
 * `codes`. Runs of equal values (a run's rows sit together) skip the hash lookup. A missing
 * value counts as "".
 */
export function dictionaryEncode(values: readonly string[]): { dict: string[]; codes: Int32Array } {
  const index = new Map<string, number>();
  const dict: string[] = [];
  const codes = new Int32Array(values.length);
  let last = '';
  let lastCode = -1;
  for (let i = 0; i < values.length; i++) {
    const v = values[i] ?? '';
    if (v !== last || lastCode < 0) {
      let c = index.get(v);
      if (c === undefined) {
        c = dict.length;
        dict.push(v);
        index.set(v, c);
      }
      last = v;
      lastCode = c;
    }
    codes[i] = lastCode;
  }
  return { dict, codes };
}
