/**
 * An object of equal-length scalar arrays (`{"epoch": [...], "test_error": [...]}`): a block of
 * rows, one per index. Arrays of another length are left out and named by the caller.
 */
export interface ColumnarBlock {
  length: number;
  names: string[];
}

const isScalar = (x: unknown) => x === null || typeof x !== 'object';
export const isScalarArray = (v: unknown): v is unknown[] => Array.isArray(v) && v.length > 0 && v.every(isScalar);

/** The block of the length most arrays share (the longer on a tie), when at least two share it. */
export function columnarBlock(obj: Record<string, unknown>): ColumnarBlock | null {
  const byLength = new Map<number, string[]>();
  for (const k in obj) {
    const v = obj[k];
    if (!isScalarArray(v)) continue;
    const list = byLength.get(v.length);
    if (list) list.push(k);
    else byLength.set(v.length, [k]);
  }
  let best: ColumnarBlock | null = null;
  for (const [length, names] of byLength) {
    if (names.length < 2) continue;
    if (!best || names.length > best.names.length || (names.length === best.names.length && length > best.length)) best = { length, names };
  }
  return best;
}
