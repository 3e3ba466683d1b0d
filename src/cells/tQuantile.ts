import quantile from '@stdlib/stats-base-dists-t-quantile';

/**
 * Quantile of Student's t distribution with `df` degrees of freedom: the x with P(T <= x) = p.
 * Delegates to @stdlib (a well-kept numerical library) rather than our own series expansion.
 */
export function tQuantile(p: number, df: number): number {
  if (!(p >= 0 && p <= 1) || !(df > 0)) return NaN;
  return quantile(p, df);
}
