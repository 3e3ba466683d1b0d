/**
 * Speed of the symmetric eigensolver (src/simulate/symmetricEigen.ts) against ml-matrix's
 * EigenvalueDecomposition (a column-oriented port of the same tred2/tql2 algorithm), with
 * eigenvectors, on random symmetric matrices. Run: node --import tsx bench/eigen.ts [sizes...]
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { eigenBasis, symmetricEigen } from '../src/simulate/symmetricEigen.js';
import { mulberry32 } from '../src/random/mulberry32.js';

function randomSymmetric(n: number, seed: number): Float64Array {
  const u = mulberry32(seed);
  const rand = () => u() - 0.5;
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      const v = rand();
      a[i * n + j] = v;
      a[j * n + i] = v;
    }
  return a;
}

function time(f: () => void, reps: number): number {
  let best = Infinity;
  for (let r = 0; r < reps; r++) {
    const t0 = performance.now();
    f();
    best = Math.min(best, performance.now() - t0);
  }
  return best / 1000;
}

const sizes = process.argv.slice(2).map(Number).filter((x) => x > 0);
const list = sizes.length ? sizes : [256, 512, 1024];
console.log('n      ours (s)   ml-matrix (s)   speed-up   max |λ diff|   implicit basis + 80 vectors (s)');
for (const n of list) {
  const a = randomSymmetric(n, n);
  const reps = n <= 256 ? 3 : 1;
  let ours = symmetricEigen(a, n);
  const tOurs = time(() => {
    ours = symmetricEigen(a, n);
  }, reps);
  const rows: number[][] = [];
  for (let i = 0; i < n; i++) rows.push(Array.from(a.subarray(i * n, i * n + n)));
  const m = new Matrix(rows);
  let ref = new EigenvalueDecomposition(m, { assumeSymmetric: true });
  const tRef = time(() => {
    ref = new EigenvalueDecomposition(m, { assumeSymmetric: true });
  }, reps);
  const X = new Float64Array(n * 80).fill(1);
  const tBasis = time(() => {
    const b = eigenBasis(a, n);
    b.toEigen(X, 80);
    b.fromEigen(X, 80);
  }, reps);
  const rv = [...ref.realEigenvalues].sort((x, y) => x - y);
  let diff = 0;
  for (let i = 0; i < n; i++) diff = Math.max(diff, Math.abs(rv[i] - ours.values[i]));
  console.log(
    `${String(n).padEnd(6)} ${tOurs.toFixed(3).padStart(8)}   ${tRef.toFixed(3).padStart(13)}   ${(tRef / tOurs).toFixed(1).padStart(7)}×   ${diff.toExponential(1)}   ${tBasis.toFixed(3).padStart(8)}`,
  );
}
