/**
 * Small dense linear algebra on row-major Float64Array matrices (n × n), enough for the
 * interpolators: Cholesky for the Gaussian process, LU with partial pivoting for the thin-plate
 * spline's indefinite saddle-point system. Plain loops ordered for contiguous access.
 */

/** Σ a[ia + k]·b[ib + k] for k < len, with four accumulators (about 3× faster than one in V8). */
export function dot(a: Float64Array, ia: number, b: Float64Array, ib: number, len: number): number {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let k = 0;
  for (; k + 3 < len; k += 4) {
    s0 += a[ia + k] * b[ib + k];
    s1 += a[ia + k + 1] * b[ib + k + 1];
    s2 += a[ia + k + 2] * b[ib + k + 2];
    s3 += a[ia + k + 3] * b[ib + k + 3];
  }
  for (; k < len; k++) s0 += a[ia + k] * b[ib + k];
  return s0 + s1 + s2 + s3;
}

/**
 * In-place Cholesky A = L·Lᵀ (lower triangle of `a` becomes L, upper is zeroed). Returns false if
 * not positive definite. Rows are factored 32 at a time so each earlier row is read from memory
 * once per block instead of once per row (the matrix of a 2,000-cell map does not fit in cache).
 */
export function cholesky(a: Float64Array, n: number): boolean {
  const B = 32;
  for (let i0 = 0; i0 < n; i0 += B) {
    const i1 = Math.min(n, i0 + B);
    for (let j = 0; j < i1; j++) {
      const rj = j * n;
      for (let i = Math.max(i0, j); i < i1; i++) {
        const ri = i * n;
        const s = a[ri + j] - dot(a, ri, a, rj, j);
        if (i === j) {
          if (!(s > 0)) return false;
          a[ri + i] = Math.sqrt(s);
        } else {
          a[ri + j] = s / a[rj + j];
        }
      }
    }
    for (let i = i0; i < i1; i++) for (let j = i + 1; j < n; j++) a[i * n + j] = 0;
  }
  return true;
}

/** Solves L·x = b in place (L lower triangular, row-major). */
export function forwardSolve(l: Float64Array, n: number, b: Float64Array): Float64Array {
  for (let i = 0; i < n; i++) {
    const ri = i * n;
    b[i] = (b[i] - dot(l, ri, b, 0, i)) / l[ri + i];
  }
  return b;
}

/** Solves L·x = b in place for several right-hand sides, reading each row of L once for all of them. */
export function forwardSolveMany(l: Float64Array, n: number, bs: Float64Array[]): void {
  for (let i = 0; i < n; i++) {
    const ri = i * n;
    const lii = l[ri + i];
    for (const b of bs) b[i] = (b[i] - dot(l, ri, b, 0, i)) / lii;
  }
}

/** Solves Lᵀ·x = b in place. */
export function backSolveT(l: Float64Array, n: number, b: Float64Array): Float64Array {
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let k = i + 1; k < n; k++) s -= l[k * n + i] * b[k];
    b[i] = s / l[i * n + i];
  }
  return b;
}

/** Solves (L·Lᵀ)·x = b, returning a new vector. */
export function choleskySolve(l: Float64Array, n: number, b: ArrayLike<number>): Float64Array {
  const x = Float64Array.from(b);
  forwardSolve(l, n, x);
  return backSolveT(l, n, x);
}

/**
 * diag((L·Lᵀ)⁻¹) = squared norms of the columns of L⁻¹ (n³/6 operations). Column j of L⁻¹ solves
 * L·m = e_j (zero above j); columns are solved 16 at a time so each row of L is read from memory
 * once per block rather than once per column.
 */
export function choleskyInverseDiagonal(l: Float64Array, n: number): Float64Array {
  const B = 16;
  const diag = new Float64Array(n);
  const cols = new Float64Array(B * n);
  for (let j0 = 0; j0 < n; j0 += B) {
    const bEnd = Math.min(B, n - j0);
    cols.fill(0);
    for (let i = j0; i < n; i++) {
      const ri = i * n;
      const lii = l[ri + i];
      for (let b = 0; b < bEnd; b++) {
        const j = j0 + b;
        if (j > i) break;
        const cb = b * n;
        const v = i === j ? 1 / lii : -dot(l, ri + j, cols, cb + j, i - j) / lii;
        cols[cb + i] = v;
        diag[j] += v * v;
      }
    }
  }
  return diag;
}

/** log det(L·Lᵀ). */
export function choleskyLogDet(l: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += Math.log(l[i * n + i]);
  return 2 * s;
}

export interface LU {
  lu: Float64Array;
  perm: Int32Array;
  n: number;
}

/** LU factorisation with partial pivoting (copies `a`). Returns null when singular. */
export function luFactor(a: Float64Array, n: number): LU | null {
  const lu = Float64Array.from(a);
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[i] = i;
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(lu[i]));
  const tiny = scale * n * 1e-15;
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(lu[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(lu[i * n + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    if (!(best > tiny)) return null;
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t = lu[k * n + j];
        lu[k * n + j] = lu[p * n + j];
        lu[p * n + j] = t;
      }
      const t = perm[k];
      perm[k] = perm[p];
      perm[p] = t;
    }
    const pivot = lu[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const f = (lu[i * n + k] /= pivot);
      if (f === 0) continue;
      const ri = i * n;
      const rk = k * n;
      for (let j = k + 1; j < n; j++) lu[ri + j] -= f * lu[rk + j];
    }
  }
  return { lu, perm, n };
}

/** Solves A·x = b with a factorisation from luFactor. */
export function luSolve(f: LU, b: ArrayLike<number>): Float64Array {
  const { lu, perm, n } = f;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = b[perm[i]];
  for (let i = 0; i < n; i++) {
    let s = x[i];
    for (let k = 0; k < i; k++) s -= lu[i * n + k] * x[k];
    x[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i];
    for (let k = i + 1; k < n; k++) s -= lu[i * n + k] * x[k];
    x[i] = s / lu[i * n + i];
  }
  return x;
}

/** The first `m` diagonal entries of A⁻¹ (one solve per entry). */
export function luInverseDiagonal(f: LU, m: number): Float64Array {
  const out = new Float64Array(m);
  const e = new Float64Array(f.n);
  for (let i = 0; i < m; i++) {
    e.fill(0);
    e[i] = 1;
    out[i] = luSolve(f, e)[i];
  }
  return out;
}
