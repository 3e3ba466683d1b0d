import { medianSorted } from './quantile.js';

/** Consistency factor of the median absolute deviation for a normal distribution. */
const MAD_NORMAL = 1.482602218505602;
/** Half-window of the running median (7 points). */
const HALF = 3;
/** Points farther than this many robust sds (the usual Hampel threshold) from their running median are spikes. */
const CUT = 3;

/**
 * Hampel filter (Hampel 1974; Pearson 2002, "Outliers in process modeling and identification"):
 * each point is compared with the median of its 7-point window; where it departs by more than
 * 3 robust standard deviations (1.4826 × MAD of all such departures) it is replaced by that
 * median. Removes single-epoch evaluation spikes before smoothing; a broad rise spans many
 * windows and is left alone. Only points whose window spans at most `maxSpan` on the log axis `u`
 * are judged: on a coarse curve a window covers a real peak, which must not be cut off.
 * Writes into `out` and returns how many points were replaced.
 */
export function despike(y: ArrayLike<number>, out: Float64Array, u: ArrayLike<number>, maxSpan: number): number {
  const n = y.length;
  const med = new Float64Array(n);
  const win = new Float64Array(2 * HALF + 1);
  for (let i = 0; i < n; i++) {
    const lo = Math.max(0, i - HALF);
    const hi = Math.min(n - 1, i + HALF);
    const len = hi - lo + 1;
    // Insertion sort of at most 7 values: runs once per point of every simulated null curve.
    for (let k = 0; k < len; k++) {
      const v = y[lo + k];
      let j = k - 1;
      while (j >= 0 && win[j] > v) {
        win[j + 1] = win[j];
        j--;
      }
      win[j + 1] = v;
    }
    med[i] = len % 2 ? win[len >> 1] : (win[len / 2 - 1] + win[len / 2]) / 2;
  }
  const dev = new Float64Array(n);
  for (let i = 0; i < n; i++) dev[i] = Math.abs(y[i] - med[i]);
  const sorted = Float64Array.from(dev).sort();
  const cut = CUT * MAD_NORMAL * medianSorted(sorted);
  let replaced = 0;
  for (let i = 0; i < n; i++) {
    const span = u[Math.min(n - 1, i + HALF)] - u[Math.max(0, i - HALF)];
    if (n >= 2 * HALF + 1 && cut > 0 && dev[i] > cut && span <= maxSpan + 1e-9) {
      out[i] = med[i];
      replaced++;
    } else out[i] = y[i];
  }
  return replaced;
}
