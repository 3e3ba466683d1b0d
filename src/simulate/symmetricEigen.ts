/**
 * Eigendecomposition of a real symmetric matrix stored row-major in a Float64Array.
 *
 * Householder tridiagonalisation, then implicit QL with Wilkinson shifts (the classical
 * tred2/tql2 pair), rewritten so every inner loop walks contiguous memory:
 * - the reduction keeps only the lower triangle and forms the symmetric product A·u row by row;
 * - the orthogonal factor is accumulated as Qᵀ by right-multiplying reflectors (row-wise dot + axpy);
 * - eigenvectors are kept as ROWS, so each QL plane rotation mixes two contiguous rows.
 * This is several times faster in V8 than a column-oriented port.
 */
export interface SymmetricEigen {
  n: number;
  /** Eigenvalues, ascending. */
  values: Float64Array;
  /** n×n row-major; row i is the unit eigenvector of values[i]. Empty when vectors were not asked for. */
  vectors: Float64Array;
}

export interface SymmetricEigenOptions {
  /** Compute eigenvectors (default true). */
  vectors?: boolean;
  /** Overwrite the input instead of copying it (saves n² doubles). Default false. */
  inPlace?: boolean;
}

/** Eigenvalues and eigenvectors of the symmetric n×n matrix `a` (only its lower triangle is read). */
export function symmetricEigen(a: Float64Array, n: number, opts: SymmetricEigenOptions = {}): SymmetricEigen {
  const wantVectors = opts.vectors ?? true;
  if (a.length < n * n) throw new RangeError(`symmetricEigen: matrix has ${a.length} entries, need ${n * n}`);
  const A = opts.inPlace ? a : a.slice(0, n * n);
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  const hh = new Float64Array(n);
  if (n === 0) return { n, values: d, vectors: new Float64Array(0) };
  tridiagonalise(A, n, d, e, hh);
  let Z: Float64Array = new Float64Array(0);
  if (wantVectors) Z = accumulate(A, n, hh);
  implicitQl(d, e, n, wantVectors ? Z : null);
  sortAscending(d, Z, n, wantVectors);
  return { n, values: d, vectors: Z };
}

/**
 * Reduces the lower triangle of A to tridiagonal form: diagonal d, sub-diagonal e[i] = T[i][i−1].
 * Reflector i (acting on coordinates 0..i−1) is left in row i of A, its ‖u‖²/2 in hh[i].
 */
function tridiagonalise(A: Float64Array, n: number, d: Float64Array, e: Float64Array, hh: Float64Array): void {
  const p = new Float64Array(n);
  for (let i = n - 1; i >= 1; i--) {
    const ri = i * n;
    d[i] = A[ri + i];
    let scale = 0;
    for (let k = 0; k < i; k++) scale += Math.abs(A[ri + k]);
    if (i === 1 || scale === 0) {
      e[i] = A[ri + i - 1];
      hh[i] = 0;
      continue;
    }
    let h = 0;
    for (let k = 0; k < i; k++) {
      const v = A[ri + k] / scale;
      A[ri + k] = v;
      h += v * v;
    }
    const f = A[ri + i - 1];
    const g = f >= 0 ? -Math.sqrt(h) : Math.sqrt(h);
    e[i] = scale * g;
    h -= f * g;
    A[ri + i - 1] = f - g;
    hh[i] = h;
    // p = A[0:i,0:i]·u / h from the lower triangle, one pass per row.
    p.fill(0, 0, i);
    for (let j = 0; j < i; j++) {
      const rj = j * n;
      const uj = A[ri + j];
      let s = A[rj + j] * uj;
      for (let k = 0; k < j; k++) {
        const ajk = A[rj + k];
        s += ajk * A[ri + k];
        p[k] += ajk * uj;
      }
      p[j] += s;
    }
    let up = 0;
    for (let k = 0; k < i; k++) {
      p[k] /= h;
      up += A[ri + k] * p[k];
    }
    const kk = up / (2 * h);
    for (let k = 0; k < i; k++) p[k] -= kk * A[ri + k];
    // A −= u qᵀ + q uᵀ on the lower triangle.
    for (let j = 0; j < i; j++) {
      const rj = j * n;
      const uj = A[ri + j];
      const qj = p[j];
      for (let k = 0; k <= j; k++) A[rj + k] -= uj * p[k] + qj * A[ri + k];
    }
  }
  d[0] = A[0];
  e[0] = 0;
}

/** Qᵀ = H₁H₂⋯H_{n−1}, built by right-multiplication; only the leading i×i block changes at step i. */
function accumulate(A: Float64Array, n: number, hh: Float64Array): Float64Array {
  const M = new Float64Array(n * n);
  for (let i = 0; i < n; i++) M[i * n + i] = 1;
  for (let i = 1; i < n; i++) {
    const h = hh[i];
    if (h === 0) continue;
    const ri = i * n;
    for (let r = 0; r < i; r++) {
      const rr = r * n;
      let s = 0;
      for (let k = 0; k < i; k++) s += M[rr + k] * A[ri + k];
      s /= h;
      if (s === 0) continue;
      for (let k = 0; k < i; k++) M[rr + k] -= s * A[ri + k];
    }
  }
  return M;
}

/** Implicit QL with Wilkinson shifts on (d, e); rotations applied to rows of Z when given. */
function implicitQl(d: Float64Array, eIn: Float64Array, n: number, Z: Float64Array | null, rec: RotationLog | null = null): void {
  const e = new Float64Array(n);
  for (let i = 1; i < n; i++) e[i - 1] = eIn[i];
  e[n - 1] = 0;
  let f = 0;
  let tst1 = 0;
  const eps = 2 ** -52;
  // Rotations of one QL sweep, applied to Z together (pairs fused) once the sweep is done.
  const sweepIdx = new Int32Array(n);
  const sweepCos = new Float64Array(n);
  const sweepSin = new Float64Array(n);
  let nRot = 0;
  for (let l = 0; l < n; l++) {
    tst1 = Math.max(tst1, Math.abs(d[l]) + Math.abs(e[l]));
    let m = l;
    while (m < n) {
      if (Math.abs(e[m]) <= eps * tst1) break;
      m++;
    }
    if (m > l) {
      let iter = 0;
      do {
        if (++iter > 60) throw new Error('symmetricEigen: QL iteration did not converge');
        // Wilkinson shift from the leading 2×2 block.
        let g = d[l];
        let p = (d[l + 1] - g) / (2 * e[l]);
        let r = Math.hypot(p, 1);
        if (p < 0) r = -r;
        d[l] = e[l] / (p + r);
        d[l + 1] = e[l] * (p + r);
        const dl1 = d[l + 1];
        let h = g - d[l];
        for (let i = l + 2; i < n; i++) d[i] -= h;
        f += h;
        // Chase the bulge with plane rotations.
        p = d[m];
        let c = 1;
        let c2 = c;
        let c3 = c;
        const el1 = e[l + 1];
        let s = 0;
        let s2 = 0;
        for (let i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i];
          h = c * p;
          r = Math.hypot(p, e[i]);
          e[i + 1] = s * r;
          s = e[i] / r;
          c = p / r;
          p = c * d[i] - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]);
          if (rec) rec.push(i, c, s);
          if (Z) {
            sweepIdx[nRot] = i;
            sweepCos[nRot] = c;
            sweepSin[nRot] = s;
            nRot++;
          }
        }
        if (Z) {
          rotateForward(Z, n, sweepIdx, sweepCos, sweepSin, 0, nRot);
          nRot = 0;
        }
        p = (-s * s2 * c3 * el1 * e[l]) / dl1;
        e[l] = s * p;
        d[l] = c * p;
      } while (Math.abs(e[l]) > eps * tst1);
    }
    d[l] += f;
    e[l] = 0;
  }
}

function sortAscending(d: Float64Array, Z: Float64Array, n: number, vectors: boolean): void {
  const order = Array.from({ length: n }, (_, i) => i).sort((x, y) => d[x] - d[y]);
  let sorted = true;
  for (let i = 0; i < n; i++) if (order[i] !== i) sorted = false;
  if (sorted) return;
  const dv = d.slice();
  for (let i = 0; i < n; i++) d[i] = dv[order[i]];
  if (!vectors) return;
  const zv = Z.slice();
  for (let i = 0; i < n; i++) Z.set(zv.subarray(order[i] * n, order[i] * n + n), i * n);
}

/** The plane rotations of a QL run, in order, so they can be replayed on any set of vectors. */
class RotationLog {
  length = 0;
  index = new Int32Array(1024);
  cos = new Float64Array(1024);
  sin = new Float64Array(1024);
  push(i: number, c: number, s: number): void {
    if (this.length === this.index.length) {
      const grow = <T extends Int32Array | Float64Array>(a: T): T => {
        const b = new (a.constructor as new (n: number) => T)(a.length * 2);
        b.set(a);
        return b;
      };
      this.index = grow(this.index);
      this.cos = grow(this.cos);
      this.sin = grow(this.sin);
    }
    this.index[this.length] = i;
    this.cos[this.length] = c;
    this.sin[this.length] = s;
    this.length++;
  }
}

/**
 * An eigendecomposition A = U·diag(values)·Uᵀ whose eigenvectors are never formed: U is kept as
 * its Householder reflectors and QL rotations and applied to a block of k vectors on demand.
 * When only a few vectors need transforming (labels, spectral filters at the logged epochs),
 * this costs O(n²k) instead of the O(n³) of forming U, which dominates a full decomposition.
 *
 * Blocks are n×k row-major: row i holds coordinate i of all k vectors (so updates are contiguous).
 * Eigenvalues are in the order the QL iteration left them (not sorted).
 */
export interface EigenBasis {
  n: number;
  values: Float64Array;
  /** X ← Uᵀ X (coordinates in the eigenbasis), in place. */
  toEigen(X: Float64Array, k: number): void;
  /** X ← U X (back from the eigenbasis), in place. */
  fromEigen(X: Float64Array, k: number): void;
}

/** Eigenvalues of the symmetric n×n matrix `a` (lower triangle read) with implicit eigenvectors. */
export function eigenBasis(a: Float64Array, n: number, opts: { inPlace?: boolean } = {}): EigenBasis {
  if (a.length < n * n) throw new RangeError(`eigenBasis: matrix has ${a.length} entries, need ${n * n}`);
  const A = opts.inPlace ? a : a.slice(0, n * n);
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  const hh = new Float64Array(n);
  if (n > 0) tridiagonalise(A, n, d, e, hh);
  const rec = new RotationLog();
  if (n > 0) implicitQl(d, e, n, null, rec);
  let work = new Float64Array(0);
  const reflect = (X: Float64Array, k: number, i: number) => {
    // X ← (I − u uᵀ/h) X on rows 0..i−1, u = row i of A.
    const h = hh[i];
    if (h === 0) return;
    if (work.length < k) work = new Float64Array(k);
    const w = work;
    w.fill(0, 0, k);
    const ri = i * n;
    for (let j = 0; j < i; j++) {
      const uj = A[ri + j];
      if (uj === 0) continue;
      const xj = j * k;
      for (let c = 0; c < k; c++) w[c] += uj * X[xj + c];
    }
    for (let j = 0; j < i; j++) {
      const f = A[ri + j] / h;
      if (f === 0) continue;
      const xj = j * k;
      for (let c = 0; c < k; c++) X[xj + c] -= f * w[c];
    }
  };
  return {
    n,
    values: d,
    toEigen(X, k) {
      // Uᵀ = Sᵀ Qᵀ, Qᵀ = H₁⋯H_{n−1}: apply H_{n−1} first.
      for (let i = n - 1; i >= 1; i--) reflect(X, k, i);
      rotateForward(X, k, rec.index, rec.cos, rec.sin, 0, rec.length);
    },
    fromEigen(X, k) {
      // U = Q S: undo the rotations in reverse order, then Q = H_{n−1}⋯H₁ (apply H₁ first).
      rotateBackward(X, k, rec.index, rec.cos, rec.sin, 0, rec.length);
      for (let i = 1; i < n; i++) reflect(X, k, i);
    },
  };
}

/**
 * Applies plane rotations q = from..to−1 in order to rows (idx[q], idx[q]+1) of X (row length k):
 * row b ← s·a + c·b, row a ← c·a − s·b. Consecutive rotations of a QL sweep share a row
 * (idx[q+1] = idx[q] − 1); such pairs are fused so the shared row is loaded and stored once.
 */
function rotateForward(X: Float64Array, k: number, idx: Int32Array, cos: Float64Array, sin: Float64Array, from: number, to: number): void {
  let q = from;
  while (q < to) {
    const i = idx[q];
    const c1 = cos[q];
    const s1 = sin[q];
    if (q + 1 < to && idx[q + 1] === i - 1) {
      const c2 = cos[q + 1];
      const s2 = sin[q + 1];
      const r0 = (i - 1) * k;
      const r1 = r0 + k;
      const r2 = r1 + k;
      for (let j = 0; j < k; j++) {
        const xb = X[r1 + j];
        const xc = X[r2 + j];
        X[r2 + j] = s1 * xb + c1 * xc;
        const yb = c1 * xb - s1 * xc;
        const xa = X[r0 + j];
        X[r1 + j] = s2 * xa + c2 * yb;
        X[r0 + j] = c2 * xa - s2 * yb;
      }
      q += 2;
    } else {
      const a0 = i * k;
      const b0 = a0 + k;
      for (let j = 0; j < k; j++) {
        const xa = X[a0 + j];
        const xb = X[b0 + j];
        X[b0 + j] = s1 * xa + c1 * xb;
        X[a0 + j] = c1 * xa - s1 * xb;
      }
      q += 1;
    }
  }
}

/** Undoes rotateForward over the same range: inverse rotations in reverse order, pairs fused. */
function rotateBackward(X: Float64Array, k: number, idx: Int32Array, cos: Float64Array, sin: Float64Array, from: number, to: number): void {
  let q = to - 1;
  while (q >= from) {
    const i = idx[q];
    const c1 = cos[q];
    const s1 = sin[q];
    if (q - 1 >= from && idx[q - 1] === i + 1) {
      const c2 = cos[q - 1];
      const s2 = sin[q - 1];
      const r0 = i * k;
      const r1 = r0 + k;
      const r2 = r1 + k;
      for (let j = 0; j < k; j++) {
        const xa = X[r0 + j];
        const xb = X[r1 + j];
        X[r0 + j] = c1 * xa + s1 * xb;
        const yb = c1 * xb - s1 * xa;
        const xc = X[r2 + j];
        X[r1 + j] = c2 * yb + s2 * xc;
        X[r2 + j] = c2 * xc - s2 * yb;
      }
      q -= 2;
    } else {
      const a0 = i * k;
      const b0 = a0 + k;
      for (let j = 0; j < k; j++) {
        const xa = X[a0 + j];
        const xb = X[b0 + j];
        X[a0 + j] = c1 * xa + s1 * xb;
        X[b0 + j] = c1 * xb - s1 * xa;
      }
      q -= 1;
    }
  }
}
