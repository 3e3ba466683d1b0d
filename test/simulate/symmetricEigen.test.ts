import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { eigenBasis, symmetricEigen } from '../../src/simulate/symmetricEigen.js';
import { Rng } from '../../src/simulate/Rng.js';

function randomSymmetric(n: number, seed: number): Float64Array {
  const rng = new Rng(seed);
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      const v = rng.normal();
      a[i * n + j] = v;
      a[j * n + i] = v;
    }
  return a;
}

/** A Gram matrix of rank r (n − r zero eigenvalues: the kernel at N < n is like this). */
function lowRankGram(n: number, r: number, seed: number): Float64Array {
  const rng = new Rng(seed);
  const f = new Float64Array(n * r);
  for (let i = 0; i < f.length; i++) f[i] = rng.normal();
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let k = 0; k < r; k++) s += f[i * r + k] * f[j * r + k];
      a[i * n + j] = s;
    }
  return a;
}

function reference(a: Float64Array, n: number): number[] {
  const rows: number[][] = [];
  for (let i = 0; i < n; i++) rows.push(Array.from(a.subarray(i * n, i * n + n)));
  const ev = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true });
  return [...ev.realEigenvalues].sort((x, y) => x - y);
}

function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}

describe('symmetricEigen', () => {
  // Reference: ml-matrix EigenvalueDecomposition (JAMA tred2/tql2), an independent implementation.
  for (const [kind, n, make] of [
    ['random', 60, (n: number) => randomSymmetric(n, 7)],
    ['rank-deficient Gram', 50, (n: number) => lowRankGram(n, 20, 3)],
    ['random', 1, (n: number) => randomSymmetric(n, 1)],
    ['random', 2, (n: number) => randomSymmetric(n, 2)],
  ] as const) {
    it(`matches ml-matrix eigenvalues and satisfies A·v = λ·v (${kind}, n = ${n})`, () => {
      const a = make(n);
      const scale = maxAbs(a) * n;
      const { values, vectors } = symmetricEigen(a, n);
      const ref = reference(a, n);
      for (let i = 0; i < n; i++) expect(Math.abs(values[i] - ref[i])).toBeLessThan(1e-12 * scale);
      for (let i = 1; i < n; i++) expect(values[i]).toBeGreaterThanOrEqual(values[i - 1]);
      // Residual and orthonormality (rows are eigenvectors).
      for (let i = 0; i < n; i++) {
        const v = vectors.subarray(i * n, i * n + n);
        for (let r = 0; r < n; r++) {
          let s = 0;
          for (let c = 0; c < n; c++) s += a[r * n + c] * v[c];
          expect(Math.abs(s - values[i] * v[r])).toBeLessThan(1e-12 * scale);
        }
        for (let j = 0; j <= i; j++) {
          let s = 0;
          for (let c = 0; c < n; c++) s += v[c] * vectors[j * n + c];
          expect(Math.abs(s - (i === j ? 1 : 0))).toBeLessThan(1e-12 * n);
        }
      }
    });
  }

  it('handles a diagonal matrix and reads only the lower triangle', () => {
    const n = 5;
    const a = new Float64Array(n * n);
    [3, -1, 2, 0, 5].forEach((v, i) => (a[i * n + i] = v));
    a[1 * n + 3] = 99; // upper triangle: must be ignored
    expect(Array.from(symmetricEigen(a, n).values)).toEqual([-1, 0, 2, 3, 5]);
  });
});

describe('eigenBasis (implicit eigenvectors)', () => {
  it('applies the same U as the explicit decomposition, and U·Uᵀ = I', () => {
    const n = 40;
    const a = lowRankGram(n, 25, 11);
    const full = symmetricEigen(a, n);
    const basis = eigenBasis(a, n);
    const rng = new Rng(5);
    const k = 3;
    const X = new Float64Array(n * k);
    for (let i = 0; i < X.length; i++) X[i] = rng.normal();
    const coords = X.slice();
    basis.toEigen(coords, k);
    // Each coordinate j must equal ±(full eigenvector with the same eigenvalue)·x: compare
    // the spectral projections Σ λ c² and Σ c², which do not depend on sign or order.
    for (let c = 0; c < k; c++) {
      let sOurs = 0;
      let sFull = 0;
      let qOurs = 0;
      let qFull = 0;
      for (let i = 0; i < n; i++) {
        const co = coords[i * k + c];
        let cf = 0;
        for (let j = 0; j < n; j++) cf += full.vectors[i * n + j] * X[j * k + c];
        sOurs += basis.values[i] * co * co;
        sFull += full.values[i] * cf * cf;
        qOurs += co * co;
        qFull += cf * cf;
      }
      expect(Math.abs(sOurs - sFull)).toBeLessThan(1e-9 * Math.abs(sFull));
      expect(Math.abs(qOurs - qFull)).toBeLessThan(1e-12 * qFull);
    }
    // A·x computed through the basis: U diag(λ) Uᵀ x.
    for (let i = 0; i < n; i++) for (let c = 0; c < k; c++) coords[i * k + c] *= basis.values[i];
    basis.fromEigen(coords, k);
    for (let r = 0; r < n; r++)
      for (let c = 0; c < k; c++) {
        let s = 0;
        for (let j = 0; j < n; j++) s += a[r * n + j] * X[j * k + c];
        expect(Math.abs(coords[r * k + c] - s)).toBeLessThan(1e-10 * maxAbs(a) * n);
      }
    const sorted = [...basis.values].sort((x, y) => x - y);
    for (let i = 0; i < n; i++) expect(Math.abs(sorted[i] - full.values[i])).toBeLessThan(1e-10 * maxAbs(a) * n);
  });
});
