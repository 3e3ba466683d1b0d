/**
 * Shared shape of the interpolators. They work on scattered points in a normalised transformed
 * plane (each axis mapped to [0, 1] after its log2/linear transform). `dims` is 1 when the map
 * has a single value on one axis: then only `x` is used.
 */
export interface ScatterPoints {
  dims: 1 | 2;
  x: Float64Array;
  y: Float64Array;
  /** Values (cell means). */
  v: Float64Array;
  /**
   * Noise variance of each value (squared standard error of the cell mean); null when unknown
   * (no cell has two seeds). Only the Gaussian process uses it; the others interpolate exactly.
   */
  noise: Float64Array | null;
}

/** A field evaluated on the regular grid gx × gy (row-major: index j * gx.length + i). */
export interface GridField {
  value: Float64Array;
  /** Posterior standard deviation of the field (Gaussian process only). */
  sd: Float64Array | null;
}

export interface FittedField {
  /** The field at one point (NaN where the method gives no value, e.g. outside the hull). */
  at(x: number, y: number): number;
  grid(gx: Float64Array, gy: Float64Array): GridField;
  /** Leave-one-out prediction at each data point (NaN where the method cannot predict without it). */
  loo: Float64Array;
  /** What a reader of the map should know about how the fit was made. */
  notes: string[];
  /** Fitted parameters worth reporting (e.g. Gaussian-process length-scales). */
  params?: Record<string, number>;
}

/** Index of the first element of sorted `a` that is >= v. */
export function lowerBound(a: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
