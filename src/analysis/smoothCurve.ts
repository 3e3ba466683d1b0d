/**
 * A linear smoother of one curve on the log axis: the points are binned (bins of `BIN_WIDTH`
 * octaves; a sparse stretch keeps one point per bin), and the bin means are smoothed by local
 * linear regression with a Gaussian kernel, each bin weighted by its count (binned kernel
 * smoothing, Fan & Marron 1994; local linear fits, Fan & Gijbels 1996). Because the smoother is
 * linear with a fixed matrix, a bootstrap replicate or a simulated noise curve costs one
 * matrix–vector product.
 */
export interface CurveSmoother {
  /** Bin centres (mean u of each bin's points), increasing. */
  u: Float64Array;
  /** Points per bin. */
  count: Float64Array;
  /** Bin of each input point (inputs in increasing u). */
  binOf: Int32Array;
  /** Kernel standard deviation, in octaves. */
  bandwidth: number;
  /** Smoother matrix, row-major: fit[b] = Σ_c w[b·B + c] · binMean[c]. */
  w: Float64Array;
  /** Smooths per-point values (same order as the input) into bin-level fitted values. */
  smooth(y: ArrayLike<number>, out?: Float64Array): Float64Array;
  /** Smooths bin means directly. */
  smoothBins(means: ArrayLike<number>, out?: Float64Array): Float64Array;
}

/** Bin width on the log axis (octaves): fine enough that no double-descent feature lives inside one bin. */
export const BIN_WIDTH = 1 / 32;

/** Bins of increasing `u` (each bin spans at most BIN_WIDTH from its first point). */
function binPoints(u: ArrayLike<number>): { centre: Float64Array; count: Float64Array; binOf: Int32Array } {
  const n = u.length;
  const binOf = new Int32Array(n);
  const centres: number[] = [];
  const counts: number[] = [];
  let start = -Infinity;
  for (let i = 0; i < n; i++) {
    if (u[i] - start >= BIN_WIDTH || centres.length === 0) {
      start = u[i];
      centres.push(0);
      counts.push(0);
    }
    const b = centres.length - 1;
    centres[b] += u[i];
    counts[b]++;
    binOf[i] = b;
  }
  const centre = Float64Array.from(centres, (s, b) => s / counts[b]);
  return { centre, count: Float64Array.from(counts), binOf };
}

/** Local linear smoother matrix for bins at `u` with counts `count`, Gaussian kernel sd `h`. */
function smootherMatrix(u: Float64Array, count: Float64Array, h: number): Float64Array {
  const B = u.length;
  const w = new Float64Array(B * B);
  const reach = 4 * h;
  for (let b = 0; b < B; b++) {
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    for (let c = 0; c < B; c++) {
      const d = u[c] - u[b];
      if (Math.abs(d) > reach) continue;
      const k = count[c] * Math.exp(-0.5 * (d / h) ** 2);
      s0 += k;
      s1 += k * d;
      s2 += k * d * d;
    }
    const det = s0 * s2 - s1 * s1;
    // With one bin in reach the line is undetermined: fall back to the local mean (Nadaraya–Watson).
    const linear = det > 1e-12 * s0 * s2;
    for (let c = 0; c < B; c++) {
      const d = u[c] - u[b];
      if (Math.abs(d) > reach) continue;
      const k = count[c] * Math.exp(-0.5 * (d / h) ** 2);
      w[b * B + c] = linear ? (k * (s2 - d * s1)) / det : k / s0;
    }
  }
  return w;
}

function makeSmoother(binned: ReturnType<typeof binPoints>, h: number, w: Float64Array): CurveSmoother {
  const { centre, count, binOf } = binned;
  const B = centre.length;
  const smoothBins = (means: ArrayLike<number>, out: Float64Array = new Float64Array(B)): Float64Array => {
    for (let b = 0; b < B; b++) {
      let s = 0;
      const row = b * B;
      for (let c = 0; c < B; c++) s += w[row + c] * means[c];
      out[b] = s;
    }
    return out;
  };
  const sums = new Float64Array(B);
  return {
    u: centre,
    count,
    binOf,
    bandwidth: h,
    w,
    smoothBins,
    smooth(y, out) {
      sums.fill(0);
      for (let i = 0; i < y.length; i++) sums[binOf[i]] += y[i];
      for (let b = 0; b < B; b++) sums[b] /= count[b];
      return smoothBins(sums, out);
    },
  };
}

/**
 * Leave-one-bin-out cross-validation score of a smoother (each bin weighted equally, so it
 * estimates the smooth's mean squared error integrated along the log axis). For a local
 * polynomial fit the deleted fit at bin b is (fit_b − w_bb·ȳ_b)/(1 − w_bb) exactly.
 */
function cvScore(w: Float64Array, means: Float64Array): number {
  const B = means.length;
  let score = 0;
  for (let b = 0; b < B; b++) {
    let fit = 0;
    for (let c = 0; c < B; c++) fit += w[b * B + c] * means[c];
    const wbb = w[b * B + b];
    if (!(wbb < 1 - 1e-9)) return Infinity; // the bin predicts only itself: no smoothing at this bandwidth
    const loo = (fit - wbb * means[b]) / (1 - wbb);
    score += (means[b] - loo) ** 2;
  }
  return score / B;
}

export interface SmoothCurveOptions {
  /** Fixed bandwidth (octaves); chosen by cross-validation when absent. */
  bandwidth?: number;
  /** Largest bandwidth tried (octaves, default 1). */
  maxBandwidth?: number;
}

/**
 * Smoother for a curve at increasing log-axis coordinates `u` with values `y`. The bandwidth is
 * the one of 24 geometrically spaced candidates (from 1/16 octave to `maxBandwidth`) with the
 * lowest leave-one-bin-out cross-validation score.
 */
export function smoothCurve(u: ArrayLike<number>, y: ArrayLike<number>, opts: SmoothCurveOptions = {}): CurveSmoother {
  const binned = binPoints(u);
  if (opts.bandwidth !== undefined) return makeSmoother(binned, opts.bandwidth, smootherMatrix(binned.centre, binned.count, opts.bandwidth));
  const B = binned.centre.length;
  const means = new Float64Array(B);
  for (let i = 0; i < y.length; i++) means[binned.binOf[i]] += y[i];
  for (let b = 0; b < B; b++) means[b] /= binned.count[b];
  const hMin = 1 / 16;
  const hMax = Math.max(hMin, opts.maxBandwidth ?? 1);
  const steps = 24;
  let best: { h: number; w: Float64Array; score: number } | null = null;
  for (let s = 0; s < steps; s++) {
    const h = hMin * (hMax / hMin) ** (s / (steps - 1));
    const w = smootherMatrix(binned.centre, binned.count, h);
    const score = cvScore(w, means);
    // When no bandwidth can be scored (too few points), the widest one is the safe choice.
    if (!best || score < best.score || (score === Infinity && best.score === Infinity)) best = { h, w, score };
  }
  return makeSmoother(binned, best!.h, best!.w);
}
