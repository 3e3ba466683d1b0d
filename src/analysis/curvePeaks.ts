import { despike } from './despike.js';
import { localPeaks } from './localPeaks.js';
import { nullMaxP } from './nullMaxP.js';
import { parabolaVertex } from './parabolaVertex.js';
import { medianSorted, quantileSorted } from './quantile.js';
import type { Rng } from './seededRng.js';
import { smoothCurve } from './smoothCurve.js';
import type { CurveSmoother } from './smoothCurve.js';

/** Consistency factor of the median absolute deviation for a normal distribution (1/Φ⁻¹(3/4)). */
const MAD_NORMAL = 1.482602218505602;

/** A peak of the smoothed curve: a rise and a fall that each span at least the minimum extent. */
export interface CurvePeak {
  /** Bin of the smoothed maximum, and the lowest bins before and after it (topographic bases). */
  bin: number;
  leftBase: number;
  rightBase: number;
  /** Location on the log axis (octaves), refined by a parabola through the smooth. */
  u: number;
  /** Smoothed value at the peak, and its height over the higher of the two bases. */
  fitted: number;
  prominence: number;
  /** Prominence in standard errors of the smoothed peak-minus-base difference. */
  z: number;
  /** Octaves from the peak to half its prominence, on the left (rise) and on the right (fall). */
  rise: number;
  fall: number;
}

export interface CurveModel {
  smoother: CurveSmoother;
  /** Smoothed values at the smoother's bins. */
  fit: Float64Array;
  /** Noise of one point: 1.4826 × MAD of the residuals about the smooth. */
  sd: number;
  /** Residuals about the smooth, per input point, standardised to the noise scale (residualScale). */
  residuals: Float64Array;
  /** Residual sd per unit noise, per bin. */
  scale: Float64Array;
  /** Block length of the residual bootstrap (points). */
  blockLength: number;
  /** Admissible peaks, most prominent first. */
  peaks: CurvePeak[];
  /** Resample the residuals (true) or draw Gaussian noise (false) in the null and the interval bootstrap. */
  resample: boolean;
  /** Points the Hampel filter replaced as single-epoch spikes. */
  spikes: number;
  /** The curve's log-axis coordinates, the bandwidth cap, and whether the bandwidth was cross-validated. */
  points: Float64Array;
  maxBandwidth: number;
  bandwidthChosen: boolean;
}

/** Fewest points for which the null and the interval resample the curve's own residuals. */
export const RESAMPLE_MIN_POINTS = 100;
/**
 * Largest mean leverage (trace of the smoother over the points) at which residuals stand for the
 * noise: where the smooth follows each point closely, residuals are high-pass filtered noise, and
 * resampling them makes a null far smoother than real noise (56% false peaks on 200 log-spaced
 * points in bench/coverage.ts). Above it, Gaussian noise is used instead.
 */
const RESAMPLE_MAX_LEVERAGE = 0.1;
/** Most bins for which the null chooses the bandwidth again on every simulated curve (cost grows as bins²). */
const RESELECT_MAX_BINS = 128;

export interface CurveModelOptions {
  /** Smallest rise and smallest fall of a peak, in octaves. */
  minExtent: number;
  /** Fixed smoothing bandwidth in octaves (cross-validated when absent). */
  bandwidth?: number;
}

function robustSd(r: Float64Array): number {
  const s = Float64Array.from(r).sort();
  const med = medianSorted(s);
  for (let i = 0; i < s.length; i++) s[i] = Math.abs(s[i] - med);
  s.sort();
  return MAD_NORMAL * medianSorted(s);
}

/**
 * Standard deviation of a residual (point minus the smooth at its bin) per unit noise, per bin:
 * Var(y_i − fit_b) = σ²·(1 − 2·w_bb/n_b + Σ_c w_bc²/n_c) for white noise. A smooth that follows
 * the points closely leaves residuals far smaller than the noise; dividing by this undoes that.
 */
function residualScale(s: CurveSmoother): Float64Array {
  const B = s.u.length;
  const out = new Float64Array(B);
  for (let b = 0; b < B; b++) {
    let q = 0;
    for (let c = 0; c < B; c++) q += s.w[b * B + c] ** 2 / s.count[c];
    out[b] = Math.sqrt(Math.max(1e-6, 1 - (2 * s.w[b * B + b]) / s.count[b] + q));
  }
  return out;
}

/** Standardised residuals of per-point values about a bin-level fit. */
function residualsOf(y: ArrayLike<number>, fit: Float64Array, s: CurveSmoother, scale: Float64Array, out = new Float64Array(y.length)): Float64Array {
  for (let i = 0; i < y.length; i++) out[i] = (y[i] - fit[s.binOf[i]]) / scale[s.binOf[i]];
  return out;
}

/** Standard error of fit[a] − fit[b] under independent noise of sd 1 per point. */
function unitPairSe(s: CurveSmoother, a: number, b: number): number {
  const B = s.u.length;
  let v = 0;
  for (let c = 0; c < B; c++) {
    const d = s.w[a * B + c] - s.w[b * B + c];
    if (d !== 0) v += (d * d) / s.count[c];
  }
  return Math.sqrt(v);
}

/** Location of the maximum of `fit` in bins [lo, hi], refined by a parabola through its neighbours. */
export function locateMax(u: Float64Array, fit: ArrayLike<number>, lo: number, hi: number): number {
  let k = lo;
  for (let i = lo + 1; i <= hi; i++) if (fit[i] > fit[k]) k = i;
  if (k <= 0 || k >= u.length - 1) return u[k];
  return parabolaVertex(u[k - 1], fit[k - 1], u[k], fit[k], u[k + 1], fit[k + 1]);
}

/**
 * Octaves from the peak to where the smooth first falls to `level` going left (dir −1) or right
 * (+1), interpolated linearly between bins; the distance to the end when it never does.
 */
function spanTo(u: Float64Array, fit: ArrayLike<number>, k: number, level: number, dir: -1 | 1): number {
  for (let i = k + dir; i >= 0 && i < u.length; i += dir) {
    if (fit[i] <= level) {
      const prev = i - dir;
      const f = (fit[prev] - level) / (fit[prev] - fit[i]);
      return Math.abs(u[prev] + f * (u[i] - u[prev]) - u[k]);
    }
  }
  return Math.abs(u[dir < 0 ? 0 : u.length - 1] - u[k]);
}

/** Admissible peaks of a smoothed curve with noise `sd` (most prominent first). */
function admissiblePeaks(s: CurveSmoother, fit: Float64Array, sd: number, minExtent: number): CurvePeak[] {
  const out: CurvePeak[] = [];
  for (const lp of localPeaks(fit)) {
    if (lp.rightBase < 0) continue;
    // Width at half prominence on each side (scipy.signal.peak_widths with rel_height 0.5): a
    // one-epoch spike, smoothed, is about 1.18 bandwidths wide there, a wiggle narrower still.
    const half = fit[lp.index] - lp.prominence / 2;
    const rise = spanTo(s.u, fit, lp.index, half, -1);
    const fall = spanTo(s.u, fit, lp.index, half, 1);
    if (rise < minExtent || fall < minExtent) continue;
    const se = sd * unitPairSe(s, lp.index, lp.keyBase);
    const z = se > 0 ? lp.prominence / se : lp.prominence > 0 ? Infinity : 0;
    out.push({
      bin: lp.index,
      leftBase: lp.leftBase,
      rightBase: lp.rightBase,
      u: locateMax(s.u, fit, lp.index, lp.index),
      fitted: fit[lp.index],
      prominence: lp.prominence,
      z,
      rise,
      fall,
    });
  }
  return out.sort((a, b) => b.prominence - a.prominence);
}

/**
 * The peak model of one curve with a single value per point (one seed, or a mean over seeds with
 * no spread in the data): smooth on the log axis (smoothCurve), estimate the noise robustly from
 * the residuals about the smooth, and keep the local maxima of the smooth whose rise and fall
 * each span at least `minExtent` octaves. `u` (log2 of x) must be increasing.
 */
export function curveModel(u: ArrayLike<number>, y: ArrayLike<number>, opts: CurveModelOptions): CurveModel {
  // The bandwidth stays at or below half the minimum extent, so a smoothed one-epoch spike (about
  // 1.18 bandwidths wide at half height) can never pass the extent rule; a coarse row (points
  // farther apart than that) may smooth over one gap.
  const gaps = Array.from({ length: Math.max(0, u.length - 1) }, (_, i) => u[i + 1] - u[i]).sort((a, b) => a - b);
  const medianGap = gaps.length ? medianSorted(gaps) : 0;
  const maxBandwidth = Math.max(opts.minExtent / 2, medianGap);
  // Single-epoch spikes go first (Hampel filter), so they neither raise the smooth nor the noise.
  const clean = new Float64Array(y.length);
  // A peak spans at least 2·minExtent at half height: a window no wider cannot cover one.
  const spikes = despike(y, clean, u, 2 * opts.minExtent);
  const smoother = smoothCurve(u, clean, { bandwidth: opts.bandwidth, maxBandwidth });
  const fit = smoother.smooth(clean);
  const scale = residualScale(smoother);
  const residuals = residualsOf(clean, fit, smoother, scale);
  const sd = robustSd(residuals);
  // Block length of the order n^(1/3) (Hall, Horowitz & Jing 1995): keeps the serial correlation
  // of evaluation noise between neighbouring epochs inside a block.
  const blockLength = Math.max(1, Math.round(Math.cbrt(y.length)));
  let trace = 0;
  const B = smoother.u.length;
  for (let b = 0; b < B; b++) trace += smoother.w[b * B + b];
  const resample = y.length >= RESAMPLE_MIN_POINTS && trace / y.length <= RESAMPLE_MAX_LEVERAGE;
  return {
    smoother,
    fit,
    sd,
    residuals,
    scale,
    blockLength,
    peaks: admissiblePeaks(smoother, fit, sd, opts.minExtent),
    points: Float64Array.from(u),
    spikes,
    resample,
    maxBandwidth,
    bandwidthChosen: opts.bandwidth === undefined,
  };
}

/**
 * One circular block bootstrap draw of the centred residuals (Politis & Romano 1992): blocks of
 * `blockLength` consecutive points starting at random positions, wrapped around the end.
 */
function resampleResiduals(m: CurveModel, rng: Rng, out: Float64Array, centred: Float64Array): void {
  const n = centred.length;
  const L = m.blockLength;
  for (let i = 0; i < n; ) {
    const start = rng.int(n);
    for (let k = 0; k < L && i < n; k++, i++) out[i] = centred[(start + k) % n];
  }
}

function centredResiduals(m: CurveModel): Float64Array {
  let mean = 0;
  for (const r of m.residuals) mean += r;
  mean /= m.residuals.length;
  return Float64Array.from(m.residuals, (r) => r - mean);
}

/**
 * Search-wide p-value of each z in `observed`: how often a curve of pure noise (block-resampled
 * residuals of this curve, so with its heavy tails and serial correlation), put through the same
 * smoother, noise estimate and extent rule, has an admissible peak at least that many SE tall.
 */
export function curveSearchP(m: CurveModel, opts: { rounds: number; rng: Rng; minExtent: number }): (z: number) => number {
  const { rounds, rng, minExtent } = opts;
  const centred = centredResiduals(m);
  const n = centred.length;
  const e = new Float64Array(n);
  const fit = new Float64Array(m.fit.length);
  const r = new Float64Array(n);
  const nullMax = new Float64Array(rounds);
  const e2 = new Float64Array(n);
  // A short curve has too few residuals to stand for the noise distribution (resampling 13 of
  // them gave 10% false peaks at a 5% level): use Gaussian noise there. Where it is affordable the
  // bandwidth is chosen again on every simulated curve, as on the observed one (a bandwidth fitted
  // to a noise bump makes it look taller). Statistics are in SE, so scale-free.
  const short = !m.resample;
  const reselect = m.bandwidthChosen && m.fit.length <= RESELECT_MAX_BINS;
  for (let b = 0; b < rounds; b++) {
    if (short) for (let i = 0; i < n; i++) e[i] = rng.normal();
    else resampleResiduals(m, rng, e, centred);
    despike(e, e2, m.points, 2 * minExtent);
    e.set(e2);
    let s = m.smoother;
    let scale = m.scale;
    if (reselect) {
      s = smoothCurve(m.points, e, { maxBandwidth: m.maxBandwidth });
      scale = residualScale(s);
    }
    s.smooth(e, fit);
    const sd = robustSd(residualsOf(e, fit, s, scale, r));
    let best = 0;
    for (const pk of admissiblePeaks(s, fit, sd, minExtent)) best = Math.max(best, pk.z);
    nullMax[b] = best;
  }
  nullMax.sort();
  return nullMaxP(nullMax);
}

/**
 * Location interval of a peak by residual block bootstrap along the curve: the smooth plus
 * resampled (standardised) residuals, smoothed again, and the maximum located between the peak's two bases.
 * Returns sorted bootstrap locations (log axis).
 */
export function curveLocationDraws(m: CurveModel, pk: CurvePeak, opts: { boot: number; rng: Rng }): Float64Array {
  const centred = centredResiduals(m);
  const e = new Float64Array(centred.length);
  const B = m.fit.length;
  const means = new Float64Array(B);
  const fit = new Float64Array(B);
  const draws = new Float64Array(opts.boot);
  const { count, binOf } = m.smoother;
  const short = !m.resample;
  for (let b = 0; b < opts.boot; b++) {
    if (short) for (let i = 0; i < e.length; i++) e[i] = m.sd * opts.rng.normal();
    else resampleResiduals(m, opts.rng, e, centred);
    means.set(m.fit);
    for (let i = 0; i < e.length; i++) means[binOf[i]] += e[i] / count[binOf[i]];
    m.smoother.smoothBins(means, fit);
    draws[b] = locateMax(m.smoother.u, fit, pk.leftBase, pk.rightBase);
  }
  return draws.sort();
}

/** Percentile interval of sorted draws at `level`, holding `est`. */
export function percentileInterval(draws: Float64Array, est: number, level: number): { low: number; high: number } {
  if (draws.length === 0) return { low: est, high: est };
  return {
    low: Math.min(est, quantileSorted(draws, (1 - level) / 2)),
    high: Math.max(est, quantileSorted(draws, 1 - (1 - level) / 2)),
  };
}
