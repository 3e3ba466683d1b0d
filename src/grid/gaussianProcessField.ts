import type { FittedField, GridField, ScatterPoints } from './Interpolator.js';
import { cholesky, choleskyInverseDiagonal, choleskyLogDet, choleskySolve, forwardSolve, forwardSolveMany } from './linalg.js';
import { nelderMead } from './nelderMead.js';
import { mulberry32 } from '../random/mulberry32.js';

/** Hyper-parameters are fitted on at most this many points (a fixed-seed random subset beyond it). */
export const GP_FIT_SUBSET = 256;
/**
 * Work allowed for the exact sd field, in multiply-adds (each sd point costs n²/2). Below it every
 * raster point is exact; above it the sd is computed exactly on an evenly spaced sub-raster and
 * interpolated bilinearly between (the sd of a Matérn 5/2 posterior is smooth between cells).
 */
export const GP_SD_BUDGET = 1.5e9;
/** Diagonal jitter relative to the amplitude, for numerical stability only. */
const JITTER = 1e-10;

export interface GpHyper {
  /** Length-scales along x and y in normalised transformed units. */
  lx: number;
  ly: number;
  /** Signal variance (amplitude²) in standardised value units. */
  amp2: number;
  /** Extra noise variance fitted when cells carry no standard error; 0 otherwise. */
  noise2: number;
}

export interface GpOptions {
  /** Fixed hyper-parameters (skip the marginal-likelihood fit); used by tests and refits. */
  hyper?: GpHyper;
  /** Fixed constant mean in value units (default: the mean of the values). */
  mean?: number;
  /** Fixed value scale (default: the sd of the values). */
  scale?: number;
  /** Work allowed for the exact sd field (default GP_SD_BUDGET). */
  sdBudget?: number;
}

/** Matérn 5/2 correlation at scaled distance r. */
export function matern52(r: number): number {
  const s = Math.sqrt(5) * r;
  return (1 + s + (s * s) / 3) * Math.exp(-s);
}

interface Data {
  dims: 1 | 2;
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  /** Noise variance per point in standardised units (0 when fitted globally). */
  noise: Float64Array;
}

function covariance(d: Data, ids: ArrayLike<number>, h: GpHyper): Float64Array {
  const n = ids.length;
  const k = new Float64Array(n * n);
  for (let a = 0; a < n; a++) {
    const i = ids[a];
    for (let b = 0; b <= a; b++) {
      const j = ids[b];
      const dx = (d.x[i] - d.x[j]) / h.lx;
      const dy = d.dims === 2 ? (d.y[i] - d.y[j]) / h.ly : 0;
      const v = h.amp2 * matern52(Math.sqrt(dx * dx + dy * dy));
      k[a * n + b] = v;
      k[b * n + a] = v;
    }
    k[a * n + a] += d.noise[i] + h.noise2 + JITTER * h.amp2;
  }
  return k;
}

/** Cholesky of the covariance, raising the jitter until it factors (duplicated points, tiny noise). */
function factor(d: Data, ids: ArrayLike<number>, h: GpHyper): Float64Array | null {
  let extra = 0;
  for (let attempt = 0; attempt < 6; attempt++) {
    const k = covariance(d, ids, { ...h, noise2: h.noise2 + extra });
    if (cholesky(k, ids.length)) return k;
    extra = extra === 0 ? 1e-8 * h.amp2 : extra * 100;
  }
  return null;
}

/** Negative log marginal likelihood (Rasmussen & Williams eq. 2.30). */
function negLogMarginal(d: Data, ids: ArrayLike<number>, h: GpHyper): number {
  const n = ids.length;
  const l = factor(d, ids, h);
  if (!l) return Infinity;
  const z = Float64Array.from(ids, (i) => d.z[i]);
  const w = forwardSolve(l, n, z);
  let q = 0;
  for (let i = 0; i < n; i++) q += w[i] * w[i];
  return 0.5 * q + 0.5 * choleskyLogDet(l, n) + 0.5 * n * Math.log(2 * Math.PI);
}

const BOUNDS = { l: [Math.log(0.02), Math.log(5)], amp2: [Math.log(1e-4), Math.log(100)], noise2: [Math.log(1e-8), Math.log(10)] };
const clamp = (v: number, [lo, hi]: number[]) => Math.min(hi, Math.max(lo, v));

function fitHyper(d: Data, ids: number[], fitNoise: boolean): GpHyper {
  const unpack = (t: number[]): GpHyper => {
    let k = 0;
    const lx = Math.exp(clamp(t[k++], BOUNDS.l));
    const ly = d.dims === 2 ? Math.exp(clamp(t[k++], BOUNDS.l)) : 1;
    const amp2 = Math.exp(clamp(t[k++], BOUNDS.amp2));
    const noise2 = fitNoise ? Math.exp(clamp(t[k++], BOUNDS.noise2)) : 0;
    return { lx, ly, amp2, noise2 };
  };
  // A soft penalty outside the box keeps the simplex from drifting along flat directions.
  const pen = (t: number[]) => {
    let k = 0;
    let s = 0;
    const out = (v: number, b: number[]) => (v < b[0] ? b[0] - v : v > b[1] ? v - b[1] : 0);
    s += out(t[k++], BOUNDS.l);
    if (d.dims === 2) s += out(t[k++], BOUNDS.l);
    s += out(t[k++], BOUNDS.amp2);
    if (fitNoise) s += out(t[k++], BOUNDS.noise2);
    return 10 * s * s;
  };
  const objective = (t: number[]) => negLogMarginal(d, ids, unpack(t)) + pen(t);
  let best: { x: number[]; f: number } | null = null;
  for (const l0 of [0.15, 0.5]) {
    const x0 = [Math.log(l0)];
    if (d.dims === 2) x0.push(Math.log(l0));
    x0.push(0);
    if (fitNoise) x0.push(Math.log(0.05));
    const r = nelderMead(objective, x0, { step: 0.7, maxEvals: 120, tol: 1e-5 });
    if (!best || r.f < best.f) best = r;
  }
  return unpack(best!.x);
}

/**
 * Gaussian-process regression of the cell means: constant mean, anisotropic Matérn 5/2 kernel,
 * each cell's noise variance its squared standard error (or one fitted noise level when no cell
 * has two seeds), length-scales and amplitude by maximising the log marginal likelihood
 * (Nelder–Mead over their logs). Gives the posterior mean and standard-deviation fields.
 *
 * Leave-one-out in closed form (Rasmussen & Williams 2006, eq. 5.12), hyper-parameters and mean
 * held fixed. The sd field is exact at every raster point while that costs less than
 * GP_SD_BUDGET, else exact on a sub-raster and bilinear in between (said in the notes).
 */
export function gaussianProcessField(p: ScatterPoints, opts: GpOptions = {}): FittedField {
  const n = p.x.length;
  if (n < 2) throw new Error('a Gaussian process needs at least two points');
  const notes: string[] = [];
  let mean = opts.mean ?? 0;
  if (opts.mean === undefined) {
    for (let i = 0; i < n; i++) mean += p.v[i];
    mean /= n;
  }
  let scale = opts.scale ?? 0;
  if (opts.scale === undefined) {
    for (let i = 0; i < n; i++) scale += (p.v[i] - mean) ** 2;
    scale = Math.sqrt(scale / n);
    if (!(scale > 0)) scale = 1;
  }
  const d: Data = {
    dims: p.dims,
    x: p.x,
    y: p.y,
    z: Float64Array.from(p.v, (v) => (v - mean) / scale),
    noise: p.noise ? Float64Array.from(p.noise, (s) => (Number.isFinite(s) && s > 0 ? s / (scale * scale) : 0)) : new Float64Array(n),
  };
  const fitNoise = p.noise === null;

  let hyper = opts.hyper;
  if (!hyper) {
    let ids = [...Array(n).keys()];
    if (n > GP_FIT_SUBSET) {
      const rand = mulberry32(12345);
      for (let i = n - 1; i > 0; i--) {
        const j = Math.floor(rand() * (i + 1));
        [ids[i], ids[j]] = [ids[j], ids[i]];
      }
      ids = ids.slice(0, GP_FIT_SUBSET);
      notes.push(`gp: hyper-parameters fitted on a random subset of ${GP_FIT_SUBSET} of ${n} cells`);
    }
    hyper = fitHyper(d, ids, fitNoise);
  }
  const h = hyper;
  const all = [...Array(n).keys()];
  const l = factor(d, all, h);
  if (!l) throw new Error('Gaussian-process covariance is not positive definite');
  const alpha = choleskySolve(l, n, d.z);
  const kinvDiag = choleskyInverseDiagonal(l, n);
  const loo = new Float64Array(n);
  // R&W eq. 5.12: y_i − μ₋ᵢ = [K⁻¹y]_i / [K⁻¹]_ii.
  for (let i = 0; i < n; i++) loo[i] = mean + scale * (d.z[i] - alpha[i] / kinvDiag[i]);

  const corrTo = (i: number, x: number, y: number) => {
    const dx = (x - d.x[i]) / h.lx;
    const dy = d.dims === 2 ? (y - d.y[i]) / h.ly : 0;
    return h.amp2 * matern52(Math.sqrt(dx * dx + dy * dy));
  };
  const at = (x: number, y: number): number => {
    let s = 0;
    for (let i = 0; i < n; i++) s += corrTo(i, x, y) * alpha[i];
    return mean + scale * s;
  };

  const grid = (gx: Float64Array, gy: Float64Array): GridField => {
    const nx = gx.length;
    const ny = gy.length;
    const value = new Float64Array(nx * ny);
    // Posterior mean row by row, the y part of each distance computed once per row; pairs beyond
    // 20 length-scales (correlation < 1e-18) are skipped.
    const ilx = 1 / h.lx;
    const ily = 1 / h.ly;
    const dy2 = new Float64Array(n);
    for (let j = 0; j < ny; j++) {
      for (let k = 0; k < n; k++) dy2[k] = d.dims === 2 ? ((gy[j] - d.y[k]) * ily) ** 2 : 0;
      for (let i = 0; i < nx; i++) {
        const x = gx[i];
        let s = 0;
        for (let k = 0; k < n; k++) {
          const dx = (x - d.x[k]) * ilx;
          const r2 = dx * dx + dy2[k];
          if (r2 > 400) continue;
          const r = Math.sqrt(5 * r2);
          s += alpha[k] * (1 + r + (r * r) / 3) * Math.exp(-r);
        }
        value[j * nx + i] = mean + scale * h.amp2 * s;
      }
    }
    // Standard deviation: exact var = k(x,x) − k*ᵀ(K + N)⁻¹k* (R&W eq. 2.26) on a sub-raster
    // sized to the budget (the full raster when n is small), bilinear in between.
    const perPoint = Math.max(1, (n * n) / 2);
    const maxPoints = Math.max(4, Math.floor((opts.sdBudget ?? GP_SD_BUDGET) / perPoint));
    let sx = nx;
    let sy = ny;
    if (nx * ny > maxPoints) {
      if (ny === 1) sx = Math.max(2, Math.min(nx, maxPoints));
      else if (nx === 1) sy = Math.max(2, Math.min(ny, maxPoints));
      else {
        const f = Math.sqrt(maxPoints / (nx * ny));
        sx = Math.max(2, Math.min(nx, Math.floor(nx * f)));
        sy = Math.max(2, Math.min(ny, Math.floor(ny * f)));
      }
    }
    const lerp = (g: Float64Array, m: number) => Float64Array.from({ length: m }, (_, k) => (m === 1 ? g[0] : g[0] + ((g[g.length - 1] - g[0]) * k) / (m - 1)));
    const cx = sx === nx ? gx : lerp(gx, sx);
    const cy = sy === ny ? gy : lerp(gy, sy);
    const coarse = new Float64Array(sx * sy);
    const rhs: Float64Array[] = [];
    const where: number[] = [];
    const flush = () => {
      forwardSolveMany(l, n, rhs);
      rhs.forEach((v, b) => {
        let q = 0;
        for (let a = 0; a < n; a++) q += v[a] * v[a];
        coarse[where[b]] = scale * Math.sqrt(Math.max(0, h.amp2 - q));
      });
      rhs.length = 0;
      where.length = 0;
    };
    for (let j = 0; j < sy; j++) {
      for (let i = 0; i < sx; i++) {
        rhs.push(Float64Array.from({ length: n }, (_, a) => corrTo(a, cx[i], cy[j])));
        where.push(j * sx + i);
        if (rhs.length === 16) flush();
      }
    }
    if (rhs.length) flush();
    let sd: Float64Array;
    if (sx === nx && sy === ny) sd = coarse;
    else {
      notes.push(`gp: sd computed exactly on a ${sx}×${sy} sub-raster and interpolated bilinearly to ${nx}×${ny}`);
      sd = new Float64Array(nx * ny);
      const pos = (g: Float64Array, c: Float64Array, k: number) => {
        if (c.length === 1) return { k0: 0, w: 0 };
        const t = ((g[k] - c[0]) / (c[c.length - 1] - c[0])) * (c.length - 1);
        const k0 = Math.min(c.length - 2, Math.max(0, Math.floor(t)));
        return { k0, w: t - k0 };
      };
      for (let j = 0; j < ny; j++) {
        const { k0: j0, w: wy } = pos(gy, cy, j);
        const j1 = Math.min(sy - 1, j0 + 1);
        for (let i = 0; i < nx; i++) {
          const { k0: i0, w: wx } = pos(gx, cx, i);
          const i1 = Math.min(sx - 1, i0 + 1);
          const top = coarse[j0 * sx + i0] * (1 - wx) + coarse[j0 * sx + i1] * wx;
          const bottom = coarse[j1 * sx + i0] * (1 - wx) + coarse[j1 * sx + i1] * wx;
          sd[j * nx + i] = top * (1 - wy) + bottom * wy;
        }
      }
    }
    return { value, sd };
  };
  return { at, grid, loo, notes, params: { ...h, mean, scale } };
}
