/** The q-quantile of sorted values, linear between order statistics (Hyndman & Fan type 7, numpy's default). */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** The median of sorted values (the mean of the middle two for an even count). */
export function medianSorted(sorted: ArrayLike<number>): number {
  const k = sorted.length;
  return k % 2 ? sorted[k >> 1] : (sorted[k / 2 - 1] + sorted[k / 2]) / 2;
}
