import tCdf from '@stdlib/stats-base-dists-t-cdf';

export type Alternative = 'two-sided' | 'greater' | 'less';

export interface WelchResult {
  /** mean(a) − mean(b). */
  diff: number;
  /** Standard error of the difference, sqrt(va/na + vb/nb). */
  se: number;
  t: number;
  /** Welch–Satterthwaite degrees of freedom. */
  df: number;
  p: number;
}

function meanVar(x: readonly number[]): { m: number; v: number } {
  let m = 0;
  for (const v of x) m += v;
  m /= x.length;
  let ss = 0;
  for (const v of x) ss += (v - m) ** 2;
  return { m, v: ss / (x.length - 1) };
}

/**
 * Welch's unequal-variance t-test of mean(a) against mean(b) (same orientation as
 * scipy.stats.ttest_ind(a, b, equal_var=False)). Each sample needs at least two values.
 * When both samples have zero spread the difference is exact: p is 0 when it points the
 * alternative's way, else 1 (scipy would give NaN).
 */
export function welchTest(a: readonly number[], b: readonly number[], opts: { alternative?: Alternative } = {}): WelchResult {
  const alternative = opts.alternative ?? 'two-sided';
  if (a.length < 2 || b.length < 2) throw new Error(`welchTest needs two or more values per sample (got ${a.length} and ${b.length})`);
  const A = meanVar(a);
  const B = meanVar(b);
  const qa = A.v / a.length;
  const qb = B.v / b.length;
  const diff = A.m - B.m;
  const se = Math.sqrt(qa + qb);
  if (se === 0) {
    const t = diff === 0 ? 0 : diff > 0 ? Infinity : -Infinity;
    const towards = alternative === 'greater' ? diff > 0 : alternative === 'less' ? diff < 0 : diff !== 0;
    return { diff, se, t, df: NaN, p: towards ? 0 : 1 };
  }
  const t = diff / se;
  const df = (qa + qb) ** 2 / (qa ** 2 / (a.length - 1) + qb ** 2 / (b.length - 1));
  let p: number;
  // Symmetry keeps the far tail accurate (1 − cdf would cancel).
  if (alternative === 'greater') p = tCdf(-t, df);
  else if (alternative === 'less') p = tCdf(t, df);
  else p = 2 * tCdf(-Math.abs(t), df);
  return { diff, se, t, df, p: Math.min(1, Math.max(0, p)) };
}
