import { medianSorted } from './quantile.js';

/** Consistency factor of the median absolute deviation for a normal distribution (1/Φ⁻¹(3/4)). */
const MAD_NORMAL = 1.482602218505602;

/**
 * Noise level of a single-seed curve, estimated from the curve itself: Gasser, Sroka &
 * Jennen-Steinmetz (1986) pseudo-residuals — each point minus the straight line through its
 * two neighbours, scaled so its variance is σ² under white noise on a locally linear curve —
 * summarised by a median absolute value (robust to the peak itself and to a few outliers).
 * `x` must be increasing (use transformed coordinates). NaN when fewer than three points.
 * Curvature of the true curve adds to the estimate, so it errs on the side of more noise.
 */
export function curveNoise(x: ArrayLike<number>, y: ArrayLike<number>): number {
  const r: number[] = [];
  for (let i = 1; i + 1 < x.length; i++) {
    const span = x[i + 1] - x[i - 1];
    if (!(span > 0)) continue;
    const a = (x[i + 1] - x[i]) / span;
    const b = (x[i] - x[i - 1]) / span;
    r.push(Math.abs(a * y[i - 1] + b * y[i + 1] - y[i]) / Math.sqrt(a * a + b * b + 1));
  }
  if (r.length === 0) return NaN;
  return MAD_NORMAL * medianSorted([...r].sort((a, b) => a - b));
}
