import { CholeskyDecomposition, inverse, LuDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { cholesky, choleskyInverseDiagonal, choleskyLogDet, choleskySolve, luFactor, luInverseDiagonal, luSolve } from '../../src/grid/linalg.js';

// Reference: ml-matrix (a maintained npm linear-algebra library) on the same matrices.
function spd(n: number, seed: number): Float64Array {
  let s = seed;
  const r = () => ((s = (s * 16807) % 2147483647) / 2147483647) - 0.5;
  const g = Array.from({ length: n * n }, r);
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
    let v = 0;
    for (let k = 0; k < n; k++) v += g[i * n + k] * g[j * n + k];
    a[i * n + j] = v + (i === j ? 0.1 : 0);
  }
  return a;
}
const toMatrix = (a: Float64Array, n: number) => new Matrix(Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, (i + 1) * n))));

describe('linalg against ml-matrix', () => {
  for (const n of [5, 33, 70]) {
    it(`Cholesky factor, solve, log det and inverse diagonal (n = ${n}, crosses the 32-row blocks)`, () => {
      const a = spd(n, 17 + n);
      const ref = new CholeskyDecomposition(toMatrix(a, n));
      const l = Float64Array.from(a);
      expect(cholesky(l, n)).toBe(true);
      const lr = ref.lowerTriangularMatrix;
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) expect(l[i * n + j]).toBeCloseTo(lr.get(i, j), 9);
      const b = Array.from({ length: n }, (_, i) => Math.sin(i));
      const x = choleskySolve(l, n, b);
      const xr = ref.solve(Matrix.columnVector(b));
      for (let i = 0; i < n; i++) expect(x[i]).toBeCloseTo(xr.get(i, 0), 7);
      let logdet = 0;
      for (let i = 0; i < n; i++) logdet += 2 * Math.log(lr.get(i, i));
      expect(choleskyLogDet(l, n)).toBeCloseTo(logdet, 9);
      const inv = inverse(toMatrix(a, n));
      const d = choleskyInverseDiagonal(l, n);
      for (let i = 0; i < n; i++) expect(d[i] / inv.get(i, i)).toBeCloseTo(1, 8);
    });
  }

  it('LU solve and inverse diagonal of an indefinite (saddle-point) matrix', () => {
    const n = 12;
    const a = spd(n, 3);
    for (let i = 0; i < n; i++) a[i * n + i] -= 3; // make it indefinite
    const f = luFactor(a, n)!;
    const b = Array.from({ length: n }, (_, i) => i - 4);
    const x = luSolve(f, b);
    const xr = new LuDecomposition(toMatrix(a, n)).solve(Matrix.columnVector(b));
    for (let i = 0; i < n; i++) expect(x[i]).toBeCloseTo(xr.get(i, 0), 8);
    const inv = inverse(toMatrix(a, n));
    const d = luInverseDiagonal(f, n);
    for (let i = 0; i < n; i++) expect(d[i]).toBeCloseTo(inv.get(i, i), 8);
  });

  it('reports a singular matrix and a non-positive-definite one', () => {
    expect(luFactor(new Float64Array([1, 2, 2, 4]), 2)).toBeNull();
    expect(cholesky(new Float64Array([1, 2, 2, 1]), 2)).toBe(false);
  });
});
