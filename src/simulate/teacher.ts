import { Rng } from './Rng.js';

/**
 * The fixed teacher that labels the random-features task (REFERENCES §7):
 * f(x) = u₀·x_A + q·Σ_{k=1..K} s_k((u_k·x_A)² − 1)/√2 + b·v·x_B
 * with unit vectors u_k (on block A, the first `dimA` coordinates), signs s_k = ±1 and an
 * optional linear signal on block B (the remaining coordinates, for the two-group epoch-wise setting).
 * Labels are y = sign f(x). Each term has unit variance under x ~ N(0, I), so `quadratic` and
 * `blockSignal` weigh them directly.
 */
export interface Teacher {
  dim: number;
  dimA: number;
  /** f(x) for x = row `row` of X (row-major, stride dim). */
  value(X: Float64Array, row: number): number;
}

export interface TeacherOptions {
  dim: number;
  /** Size of block A (default dim: no block B). */
  dimA?: number;
  quadratic?: number;
  terms?: number;
  blockSignal?: number;
  seed?: number;
}

export function makeTeacher(opts: TeacherOptions): Teacher {
  const { dim, dimA = dim, quadratic = 0.5, terms = 4, blockSignal = 0, seed = 20260 } = opts;
  const rng = new Rng(seed, 99);
  const unit = (len: number) => {
    const v = rng.normals(new Float64Array(len));
    const s = Math.hypot(...v);
    return v.map((x) => x / s);
  };
  const u0 = unit(dimA);
  const us = Array.from({ length: terms }, () => unit(dimA));
  const signs = us.map((_, k) => (k % 2 === 0 ? 1 : -1));
  const dimB = dim - dimA;
  const v = dimB > 0 ? unit(dimB) : new Float64Array(0);
  const dot = (w: Float64Array, X: Float64Array, off: number) => {
    let s = 0;
    for (let i = 0; i < w.length; i++) s += w[i] * X[off + i];
    return s;
  };
  return {
    dim,
    dimA,
    value(X, row) {
      const off = row * dim;
      let f = dot(u0, X, off);
      for (let k = 0; k < terms; k++) {
        const z = dot(us[k], X, off);
        f += (quadratic * signs[k] * (z * z - 1)) / Math.SQRT2;
      }
      if (dimB > 0 && blockSignal !== 0) f += blockSignal * dot(v, X, off + dimA);
      return f;
    },
  };
}
