import { eigenBasis } from './symmetricEigen.js';
import { gdFilter } from './spectralFilter.js';

/**
 * Predictions of a linear read-out w trained by full-batch gradient descent from w = 0 on
 * L(w) = ‖Φw − y‖²/(2n), step η = stepScale/λ_max, at every requested epoch, in closed form
 * from ONE eigendecomposition (REFERENCES §3). Several label vectors share the decomposition:
 * labels enter only through their eigen-coordinates.
 *
 * Output layout: column j = e·L + l holds epoch e, label vector l; `train` is n×(E·L) and
 * `test` m×(E·L), both row-major (row = data point).
 */
export interface GdPredictions {
  epochs: number[];
  labels: number;
  train: Float64Array;
  test: Float64Array;
  /** λ_max of the Hessian ΦᵀΦ/n (the step is stepScale/λ_max). */
  lambdaMax: number;
}

export interface KernelGdInput {
  /** n×n kernel K = ΦΦᵀ/n (lower triangle read; any positive multiple gives the same predictions). */
  kernel: Float64Array;
  n: number;
  /** m×n cross kernel Φ_test Φᵀ/n (same multiple as `kernel`), row stride `testStride` (default n). */
  testKernel: Float64Array;
  m: number;
  testStride?: number;
  /** n×L row-major label block. */
  labels: Float64Array;
  L: number;
  epochs: number[];
  stepScale?: number;
}

/**
 * Kernel (dual) form, for n <= number of features: K = UΛUᵀ. With c = Uᵀy,
 * w_t = Φᵀ U diag(g_t) c / n, so train predictions are U diag(λ g_t) c and test predictions
 * K_test U diag(g_t) c — no division by singular values anywhere.
 */
export function kernelGdPredictions(inp: KernelGdInput): GdPredictions {
  const { n, m, L, epochs } = inp;
  const E = epochs.length;
  const stride = inp.testStride ?? n;
  const basis = eigenBasis(inp.kernel, n);
  const lam = basis.values;
  const lambdaMax = maxOf(lam);
  // An all-zero Hessian (every feature dead on the data) has no gradient: w stays 0.
  const eta = lambdaMax > 0 ? (inp.stepScale ?? 1) / lambdaMax : 0;
  const c = inp.labels.slice(0, n * L);
  basis.toEigen(c, L);
  const EL = E * L;
  const Z = new Float64Array(n * EL);
  for (let i = 0; i < n; i++) {
    const li = lam[i];
    for (let e = 0; e < E; e++) {
      const g = gdFilter(li, eta, epochs[e]);
      for (let l = 0; l < L; l++) Z[i * EL + e * L + l] = g * c[i * L + l];
    }
  }
  // z = U diag(g) c; train predictions K z (= U diag(λ g) c), from the lower triangle of K.
  basis.fromEigen(Z, EL);
  const K = inp.kernel;
  const train = new Float64Array(n * EL);
  for (let i = 0; i < n; i++) {
    const ri = i * n;
    const oi = i * EL;
    for (let j = 0; j <= i; j++) {
      const a = K[ri + j];
      if (a === 0) continue;
      const oj = j * EL;
      for (let col = 0; col < EL; col++) train[oi + col] += a * Z[oj + col];
      if (j < i) for (let col = 0; col < EL; col++) train[oj + col] += a * Z[oi + col];
    }
  }
  const test = new Float64Array(m * EL);
  multiplyAdd(test, inp.testKernel, m, stride, n, Z, EL);
  return { epochs, labels: L, train, test, lambdaMax };
}

export interface PrimalGdInput {
  /** p×p Hessian ΦᵀΦ/n (lower triangle read); overwritten when `inPlace`. */
  hessian: Float64Array;
  p: number;
  /** Train features, n rows of stride `stride` (first p columns used). */
  features: Float64Array;
  n: number;
  testFeatures: Float64Array;
  m: number;
  stride: number;
  /** n×L row-major label block. */
  labels: Float64Array;
  L: number;
  epochs: number[];
  stepScale?: number;
  inPlace?: boolean;
}

/** Primal form, for n > number of features p: ΦᵀΦ/n = VΛVᵀ, w_t = V diag(g_t) Vᵀ Φᵀy/n. */
export function primalGdPredictions(inp: PrimalGdInput): GdPredictions {
  const { p, n, m, L, epochs, stride } = inp;
  const E = epochs.length;
  const EL = E * L;
  const basis = eigenBasis(inp.hessian, p, { inPlace: inp.inPlace });
  const lam = basis.values;
  const lambdaMax = maxOf(lam);
  // An all-zero Hessian (every feature dead on the data) has no gradient: w stays 0.
  const eta = lambdaMax > 0 ? (inp.stepScale ?? 1) / lambdaMax : 0;
  // b = Φᵀ y / n  (p×L)
  const b = new Float64Array(p * L);
  for (let i = 0; i < n; i++) {
    const fi = i * stride;
    for (let a = 0; a < p; a++) {
      const v = inp.features[fi + a] / n;
      if (v === 0) continue;
      for (let l = 0; l < L; l++) b[a * L + l] += v * inp.labels[i * L + l];
    }
  }
  basis.toEigen(b, L);
  const W = new Float64Array(p * EL);
  for (let a = 0; a < p; a++) {
    for (let e = 0; e < E; e++) {
      const g = gdFilter(lam[a], eta, epochs[e]);
      for (let l = 0; l < L; l++) W[a * EL + e * L + l] = g * b[a * L + l];
    }
  }
  basis.fromEigen(W, EL);
  const train = new Float64Array(n * EL);
  multiplyAdd(train, inp.features, n, stride, p, W, EL);
  const test = new Float64Array(m * EL);
  multiplyAdd(test, inp.testFeatures, m, stride, p, W, EL);
  return { epochs, labels: L, train, test, lambdaMax };
}

/**
 * out (rows×k) += A (rows×inner, row stride `stride`) · B (inner×k), all row-major.
 * Four rows of B per pass over an output row: five loads and one store per four products.
 */
function multiplyAdd(out: Float64Array, A: Float64Array, rows: number, stride: number, inner: number, B: Float64Array, k: number): void {
  for (let r = 0; r < rows; r++) {
    const ar = r * stride;
    const o = r * k;
    let j = 0;
    for (; j + 3 < inner; j += 4) {
      const a0 = A[ar + j];
      const a1 = A[ar + j + 1];
      const a2 = A[ar + j + 2];
      const a3 = A[ar + j + 3];
      if (a0 === 0 && a1 === 0 && a2 === 0 && a3 === 0) continue;
      const b0 = j * k;
      const b1 = b0 + k;
      const b2 = b1 + k;
      const b3 = b2 + k;
      for (let c = 0; c < k; c++) out[o + c] += a0 * B[b0 + c] + a1 * B[b1 + c] + a2 * B[b2 + c] + a3 * B[b3 + c];
    }
    for (; j < inner; j++) {
      const a = A[ar + j];
      if (a === 0) continue;
      const bj = j * k;
      for (let c = 0; c < k; c++) out[o + c] += a * B[bj + c];
    }
  }
}

function maxOf(a: Float64Array): number {
  let m = -Infinity;
  for (let i = 0; i < a.length; i++) if (a[i] > m) m = a[i];
  return m;
}
