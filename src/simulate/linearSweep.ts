import { emptyTable } from '../store/RowTable.js';
import type { RowTable } from '../store/RowTable.js';
import { Rng } from './Rng.js';
import { symmetricEigen } from './symmetricEigen.js';
import { addGram } from './addGram.js';

/**
 * Linear-Gaussian sweep, the model with an exact risk formula (REFERENCES §1–§2):
 * x ~ N(0, I_D), y = x·β + σε; the learner uses the first p features (p = `width`) and fits
 * minimum-norm least squares (ridge λ = 0) or ridge β̂ = (XᵀX/n + λI)⁻¹Xᵀy/n.
 * Each run logs one row (the closed-form fit, at epoch 1): test_loss = mean squared error on a
 * fresh test set (the risk, σ² included), train_loss, and the values the formulas need as
 * extra columns sigma2, signal_in = ‖β_T‖², signal_out = ‖β_Tc‖², plus ridge (the λ used) and
 * risk = ‖β_T − β̂‖² + ‖β_Tc‖² + σ², the exact expected loss of this fit on a new point
 * (isotropic x), which test_loss estimates.
 */
export interface LinearSweepOptions {
  /** Number of seeds (0..K−1) or the seed list. */
  seeds: number | readonly number[];
  /** Features used, p. */
  widths: readonly number[];
  /** Training-set sizes, n. */
  trainSizes: readonly number[];
  /** Total features D (default: the largest width). */
  dims?: number;
  /** Noise variance σ² (default 0.25). */
  sigma2?: number;
  /** ‖β‖² (default 1), spread evenly over the D coordinates. */
  signal?: number;
  /** Fresh test points per seed (default 1000). */
  testSize?: number;
  /**
   * Ridge λ (default 0: minimum-norm least squares), or 'optimal': λ* = σ_eff²·(p/n)/‖β_T‖² with
   * σ_eff² = σ² + ‖β_Tc‖², the isotropic optimum (REFERENCES §2).
   */
  ridge?: number | 'optimal';
  condition?: string;
  /** Prefix of run ids (default "lin"). */
  runPrefix?: string;
  /** Log the measured compute time as wall_seconds (default true); false leaves it NaN (bit-for-bit reproducible). */
  measureTime?: boolean;
  onRun?: () => void;
}

export const LINEAR_EXTRA_COLUMNS = ['sigma2', 'signal_in', 'signal_out', 'ridge', 'risk'] as const;

export function linearSweep(opts: LinearSweepOptions): RowTable {
  const seeds = typeof opts.seeds === 'number' ? Array.from({ length: opts.seeds }, (_, i) => i) : [...opts.seeds];
  const widths = [...new Set(opts.widths.map((p) => Math.round(p)))].sort((a, b) => a - b);
  const sizes = [...new Set(opts.trainSizes.map((n) => Math.round(n)))].sort((a, b) => a - b);
  const D = opts.dims ?? widths[widths.length - 1];
  const sigma2 = opts.sigma2 ?? 0.25;
  const signal = opts.signal ?? 1;
  const m = opts.testSize ?? 1000;
  const ridge = opts.ridge ?? 0;
  const condition = opts.condition ?? '';
  const prefix = opts.runPrefix ?? 'lin';
  const bad = (what: string) => {
    throw new RangeError(`linearSweep: ${what}`);
  };
  if (!seeds.length || !seeds.every(Number.isInteger)) bad('seeds must be a count >= 1 or a list of integers');
  if (!widths.length || widths[0] < 1 || widths[widths.length - 1] > D) bad(`widths must be in 1..D (D = ${D})`);
  if (!sizes.length || sizes[0] < 1) bad('train sizes must be >= 1');
  if (!(sigma2 >= 0) || !(signal >= 0) || !(m >= 1)) bad('sigma2 and signal must be >= 0, test size >= 1');
  if (ridge !== 'optimal' && !(ridge >= 0)) bad('ridge must be >= 0 or "optimal"');

  const beta = new Float64Array(D).fill(Math.sqrt(signal / D));
  const sigma = Math.sqrt(sigma2);
  const nMax = sizes[sizes.length - 1];
  const out = emptyTable(seeds.length * sizes.length * widths.length, LINEAR_EXTRA_COLUMNS);
  let row = 0;
  for (const seed of seeds) {
    // Nested pools: size n uses the first n points, width p the first p coordinates.
    const X = new Rng(seed, 11).normals(new Float64Array(nMax * D));
    const eps = new Rng(seed, 12).normals(new Float64Array(nMax));
    const Xt = new Rng(seed, 13).normals(new Float64Array(m * D));
    const epst = new Rng(seed, 14).normals(new Float64Array(m));
    const respond = (Z: Float64Array, e: Float64Array, rows: number) =>
      Float64Array.from({ length: rows }, (_, i) => {
        let s = 0;
        for (let j = 0; j < D; j++) s += Z[i * D + j] * beta[j];
        return s + sigma * e[i];
      });
    const y = respond(X, eps, nMax);
    const yt = respond(Xt, epst, m);
    for (const n of sizes) {
      for (const p of widths) {
        const t0 = performance.now();
        let signalIn = 0;
        for (let j = 0; j < p; j++) signalIn += beta[j] * beta[j];
        const signalOut = Math.max(0, signal - signalIn);
        const lam = ridge === 'optimal' ? (signalIn > 0 ? ((sigma2 + signalOut) * (p / n)) / signalIn : Infinity) : ridge;
        const bhat = Number.isFinite(lam) ? fit(X, y, n, p, D, lam) : new Float64Array(p);
        const mse = (Z: Float64Array, target: Float64Array, rows: number) => {
          let s = 0;
          for (let i = 0; i < rows; i++) {
            let f = 0;
            for (let j = 0; j < p; j++) f += Z[i * D + j] * bhat[j];
            s += (target[i] - f) ** 2;
          }
          return s / rows;
        };
        out.run[row] = `${prefix}-s${seed}-n${n}-p${p}`;
        out.condition[row] = condition;
        out.seed[row] = seed;
        out.width[row] = p;
        out.epochs[row] = 1;
        out.train_size[row] = n;
        out.label_noise[row] = 0;
        out.test_loss[row] = mse(Xt, yt, m);
        out.train_loss[row] = mse(X, y, n);
        out.extra.sigma2[row] = sigma2;
        out.extra.signal_in[row] = signalIn;
        out.extra.signal_out[row] = signalOut;
        out.extra.ridge[row] = lam;
        let risk = sigma2 + signalOut;
        for (let j = 0; j < p; j++) risk += (beta[j] - bhat[j]) ** 2;
        out.extra.risk[row] = risk;
        out.wall_seconds[row] = opts.measureTime === false ? NaN : (performance.now() - t0) / 1000;
        row++;
        opts.onRun?.();
      }
    }
  }
  return out;
}

/**
 * β̂ = (XᵀX/n + λI)⁻¹Xᵀy/n on the first n rows and p columns (row stride D); for p > n through
 * the dual form Xᵀ(XXᵀ + nλI)⁻¹y, which at λ = 0 is the minimum-norm interpolator pinv(X)y.
 */
function fit(X: Float64Array, y: Float64Array, n: number, p: number, D: number, lam: number): Float64Array {
  if (p <= n) {
    // XᵀX as the Gram matrix of the columns (rows of Xᵀ).
    const Xt = new Float64Array(p * n);
    const b = new Float64Array(p);
    for (let i = 0; i < n; i++)
      for (let a = 0; a < p; a++) {
        const v = X[i * D + a];
        Xt[a * n + i] = v;
        b[a] += v * y[i];
      }
    const A = new Float64Array(p * p);
    addGram(A, Xt, p, Xt, p, n, 0, n, true);
    for (let a = 0; a < p; a++) A[a * p + a] += n * lam;
    return solveSpd(A, b, p);
  }
  const B = new Float64Array(n * n);
  addGram(B, X, n, X, n, D, 0, p, true);
  for (let i = 0; i < n; i++) B[i * n + i] += n * lam;
  const alpha = solveSpd(B, y.subarray(0, n), n);
  const bhat = new Float64Array(p);
  for (let i = 0; i < n; i++) for (let a = 0; a < p; a++) bhat[a] += X[i * D + a] * alpha[i];
  return bhat;
}

/**
 * Solves A x = b for symmetric positive (semi-)definite A given by its lower triangle: Cholesky,
 * or the pseudo-inverse through an eigendecomposition when A is numerically singular.
 */
function solveSpd(A: Float64Array, b: Float64Array, k: number): Float64Array {
  const Lm = A.slice();
  let ok = true;
  for (let j = 0; j < k && ok; j++) {
    let dj = Lm[j * k + j];
    for (let c = 0; c < j; c++) dj -= Lm[j * k + c] ** 2;
    if (!(dj > 1e-13 * Math.abs(A[j * k + j]))) ok = false;
    const ljj = Math.sqrt(dj);
    Lm[j * k + j] = ljj;
    for (let i = j + 1; i < k; i++) {
      let s = Lm[i * k + j];
      for (let c = 0; c < j; c++) s -= Lm[i * k + c] * Lm[j * k + c];
      Lm[i * k + j] = s / ljj;
    }
  }
  if (ok) {
    const z = new Float64Array(k);
    for (let i = 0; i < k; i++) {
      let s = b[i];
      for (let c = 0; c < i; c++) s -= Lm[i * k + c] * z[c];
      z[i] = s / Lm[i * k + i];
    }
    for (let i = k - 1; i >= 0; i--) {
      let s = z[i];
      for (let c = i + 1; c < k; c++) s -= Lm[c * k + i] * z[c];
      z[i] = s / Lm[i * k + i];
    }
    return z;
  }
  const { values, vectors } = symmetricEigen(A, k);
  const tol = Math.max(...values) * k * 2 ** -52;
  const x = new Float64Array(k);
  for (let i = 0; i < k; i++) {
    if (!(values[i] > tol)) continue;
    let c = 0;
    for (let j = 0; j < k; j++) c += vectors[i * k + j] * b[j];
    c /= values[i];
    for (let j = 0; j < k; j++) x[j] += c * vectors[i * k + j];
  }
  return x;
}
