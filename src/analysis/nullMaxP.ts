/** Euler–Mascheroni constant (mean of the standard Gumbel distribution). */
const EULER_GAMMA = 0.5772156649015329;

/** Exceedances below which the far tail comes from the fitted Gumbel distribution. */
const TAIL_MIN_EXCEEDANCES = 10;

/**
 * p-value of an observed maximum statistic against `nullMax`, simulated maxima of the same
 * statistic under the null (sorted ascending). With enough null maxima at or above it the
 * Monte Carlo p (1 + #{null ≥ observed}) / (rounds + 1) is used; further out, where a few hundred
 * rounds cannot resolve p (its floor 1/(rounds + 1) times the rows of a map would forbid any
 * correction across rows), the upper tail of a Gumbel distribution fitted to the null maxima by
 * moments (scale sd·√6/π, location mean − γ·scale; the extreme-value limit of a maximum of many
 * near-Gaussian statistics, Gumbel 1958) is used instead. Non-finite null maxima leave the
 * Monte Carlo p in force.
 */
export function nullMaxP(nullMax: Float64Array): (observed: number) => number {
  const rounds = nullMax.length;
  let mean = 0;
  let finite = true;
  for (const v of nullMax) {
    if (!Number.isFinite(v)) finite = false;
    mean += v;
  }
  mean /= rounds;
  let ss = 0;
  for (const v of nullMax) ss += (v - mean) ** 2;
  const sd = Math.sqrt(ss / Math.max(1, rounds - 1));
  const scale = (sd * Math.sqrt(6)) / Math.PI;
  const location = mean - EULER_GAMMA * scale;
  const useTail = finite && rounds >= 50 && scale > 0;
  return (observed) => {
    if (Number.isNaN(observed)) return 1;
    let lo = 0;
    let hi = rounds;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (nullMax[mid] >= observed) hi = mid;
      else lo = mid + 1;
    }
    const count = rounds - lo;
    const monteCarlo = (count + 1) / (rounds + 1);
    if (count >= TAIL_MIN_EXCEEDANCES || !useTail) return monteCarlo;
    if (observed === Infinity) return 0;
    // −expm1(−t) keeps the far tail accurate where 1 − exp(−t) would round to 0.
    return -Math.expm1(-Math.exp(-(observed - location) / scale));
  };
}
