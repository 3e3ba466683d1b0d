import type { SeedStats } from './Cell.js';
import { tQuantile } from './tQuantile.js';

/** Two-sided confidence level of every seed interval. */
export const SEED_INTERVAL_LEVEL = 0.95;

/**
 * Statistics over the seeds of one cell: mean, median, sample sd (n − 1), standard error and the
 * two-sided 95% Student-t interval of the mean. Non-finite values are left out (callers pass finite
 * values; a NaN here would be a diverged or unlogged seed, which is counted elsewhere).
 * One seed: sd, se NaN and no interval.
 */
export function seedStats(values: readonly number[]): SeedStats {
  const v = values.filter((x) => Number.isFinite(x)).sort((a, b) => a - b);
  const n = v.length;
  if (n === 0) return { n: 0, mean: NaN, median: NaN, sd: NaN, se: NaN, low: null, high: null };
  // Two-pass mean and variance (numerically stable for values of similar size).
  let sum = 0;
  for (const x of v) sum += x;
  const mean = sum / n;
  const median = n % 2 === 1 ? v[(n - 1) / 2] : (v[n / 2 - 1] + v[n / 2]) / 2;
  if (n === 1) return { n, mean, median, sd: NaN, se: NaN, low: null, high: null };
  let ss = 0;
  let comp = 0;
  for (const x of v) {
    ss += (x - mean) * (x - mean);
    comp += x - mean;
  }
  const variance = Math.max(0, (ss - (comp * comp) / n) / (n - 1));
  const sd = Math.sqrt(variance);
  const se = sd / Math.sqrt(n);
  const t = tQuantile(1 - (1 - SEED_INTERVAL_LEVEL) / 2, n - 1);
  return { n, mean, median, sd, se, low: mean - t * se, high: mean + t * se };
}
