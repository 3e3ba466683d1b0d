/** A local maximum of a 1-D sequence with its topographic prominence. */
export interface LocalPeak {
  /** Index of the maximum (the first index of a plateau). */
  index: number;
  /** Index of the lowest point between the peak and the nearest strictly higher point on the left (or the start). */
  leftBase: number;
  /** Same on the right; −1 when the peak is the last point. */
  rightBase: number;
  /** Height over the higher of the two bases (over the left base alone for a peak at the right end). */
  prominence: number;
  /** Index of the base the prominence is measured from. */
  keyBase: number;
}

/**
 * Local maxima of `y` and their prominences, as in topography (and scipy.signal.peak_prominences):
 * walk out from the peak on each side until a strictly higher value or the end, the lowest
 * point passed is that side's base, and the prominence is the height over the higher base.
 * A peak needs a strictly lower neighbour on the left (descent on that side); on the right it
 * needs a strictly lower value after any plateau, unless `allowRightEnd` admits a rise that is
 * still going at the last point. NaN entries must be removed by the caller.
 */
export function localPeaks(y: ArrayLike<number>, opts: { allowRightEnd?: boolean } = {}): LocalPeak[] {
  const allowRightEnd = opts.allowRightEnd ?? false;
  const n = y.length;
  const out: LocalPeak[] = [];
  for (let i = 1; i < n; i++) {
    if (!(y[i] > y[i - 1])) continue;
    let j = i;
    while (j + 1 < n && y[j + 1] === y[i]) j++;
    const atEnd = j === n - 1;
    if (atEnd ? !allowRightEnd : !(y[j + 1] < y[i])) continue;
    let leftBase = i - 1;
    for (let k = i - 1; k >= 0 && y[k] <= y[i]; k--) if (y[k] < y[leftBase]) leftBase = k;
    let rightBase = -1;
    if (!atEnd) {
      rightBase = j + 1;
      for (let k = j + 1; k < n && y[k] <= y[i]; k++) if (y[k] < y[rightBase]) rightBase = k;
    }
    const keyBase = rightBase >= 0 && y[rightBase] > y[leftBase] ? rightBase : leftBase;
    out.push({ index: i, leftBase, rightBase, prominence: y[i] - y[keyBase], keyBase });
    i = j;
  }
  return out;
}
