import type { FittedField, GridField, ScatterPoints } from './Interpolator.js';
import { lowerBound } from './Interpolator.js';
import { luFactor, luInverseDiagonal, luSolve } from './linalg.js';

/** Up to this many points one global spline is solved (an (n+3)² LU); beyond, a partition of unity. */
export const THIN_PLATE_GLOBAL_MAX = 400;
/** Target points per tile core in the partition of unity. */
const TILE_POINTS = 60;
/** Tile support half-width relative to the tile core half-width (overlap between neighbours). */
const OVERLAP = 1.5;
/** Smallest local system (more neighbours are pulled in for sparse tiles). */
const MIN_LOCAL = 16;

/** Radial kernel: r² log r in 2-D (thin-plate), r³ in 1-D (its 1-D counterpart, the natural cubic spline). */
function kernel(dims: 1 | 2, r2: number): number {
  if (r2 === 0) return 0;
  return dims === 2 ? 0.5 * r2 * Math.log(r2) : r2 * Math.sqrt(r2);
}

/** One exactly interpolating spline through a subset of the points. */
interface LocalSpline {
  ids: number[];
  /** Radial weights then affine coefficients (1, x[, y]). */
  coef: Float64Array;
  /** Leave-one-out residual v_i − f₋ᵢ(p_i) of each point in `ids` (Rippa's formula). */
  looResidual: Float64Array;
}

function solveSpline(p: ScatterPoints, ids: number[]): LocalSpline | null {
  const n = ids.length;
  const q = p.dims === 2 ? 3 : 2;
  const m = n + q;
  const a = new Float64Array(m * m);
  for (let r = 0; r < n; r++) {
    const i = ids[r];
    for (let c = 0; c < n; c++) {
      const j = ids[c];
      const dx = p.x[i] - p.x[j];
      const dy = p.dims === 2 ? p.y[i] - p.y[j] : 0;
      a[r * m + c] = kernel(p.dims, dx * dx + dy * dy);
    }
    const poly = p.dims === 2 ? [1, p.x[i], p.y[i]] : [1, p.x[i]];
    for (let k = 0; k < q; k++) {
      a[r * m + n + k] = poly[k];
      a[(n + k) * m + r] = poly[k];
    }
  }
  const f = luFactor(a, m);
  if (!f) return null;
  const rhs = new Float64Array(m);
  ids.forEach((i, r) => (rhs[r] = p.v[i]));
  const coef = luSolve(f, rhs);
  // Rippa (1999): for an interpolating radial system (also with a polynomial part),
  // the leave-one-out residual at point r is c_r / (A⁻¹)_rr.
  const diag = luInverseDiagonal(f, n);
  const looResidual = new Float64Array(n);
  for (let r = 0; r < n; r++) looResidual[r] = coef[r] / diag[r];
  return { ids, coef, looResidual };
}

function evalSpline(p: ScatterPoints, s: LocalSpline, x: number, y: number): number {
  const n = s.ids.length;
  let v = 0;
  for (let r = 0; r < n; r++) {
    const i = s.ids[r];
    const dx = x - p.x[i];
    const dy = p.dims === 2 ? y - p.y[i] : 0;
    v += s.coef[r] * kernel(p.dims, dx * dx + dy * dy);
  }
  v += s.coef[n] + s.coef[n + 1] * x;
  if (p.dims === 2) v += s.coef[n + 2] * y;
  return v;
}

/** Smooth bump on [−1, 1] (Wendland-like), zero outside. */
function bump(t: number): number {
  const a = Math.abs(t);
  if (a >= 1) return 0;
  const u = 1 - a * a;
  return u * u;
}

interface Tile {
  cx: number;
  cy: number;
  hx: number;
  hy: number;
  spline: LocalSpline;
}

function nearestIds(p: ScatterPoints, cx: number, cy: number, k: number): number[] {
  const n = p.x.length;
  const d = Array.from({ length: n }, (_, i) => {
    const dx = p.x[i] - cx;
    const dy = p.y[i] - cy;
    return [dx * dx + dy * dy, i] as const;
  });
  d.sort((a, b) => a[0] - b[0]);
  return d.slice(0, k).map((e) => e[1]);
}

/**
 * Thin-plate spline with affine part (exact for affine functions, passes through every point).
 * Up to THIN_PLATE_GLOBAL_MAX points: one global solve. Beyond that, a partition of unity of local
 * thin-plate splines: the plane is cut into tiles of about TILE_POINTS points, each tile fits the
 * points inside its enlarged support, and the fits are blended with smooth weights that sum to one.
 * Each local spline reproduces affine functions and interpolates every point where its weight is
 * non-zero, so the blend keeps both properties, at O(n) cost instead of O(n³).
 * Leave-one-out is exact in both modes: Rippa's formula per spline, blended with the same weights.
 */
export function thinPlateField(p: ScatterPoints): FittedField {
  const n = p.x.length;
  const need = p.dims === 2 ? 3 : 2;
  if (n < need) throw new Error(`thin-plate spline needs at least ${need} points`);
  const notes: string[] = [];
  const loo = new Float64Array(n).fill(NaN);

  if (n <= THIN_PLATE_GLOBAL_MAX || p.dims === 1) {
    const ids = [...Array(n).keys()];
    const s = solveSpline(p, ids);
    if (!s) throw new Error('thin-plate spline system is singular (points on one line?)');
    for (let r = 0; r < n; r++) loo[r] = p.v[r] - s.looResidual[r];
    const at = (x: number, y: number) => evalSpline(p, s, x, y);
    const grid = (gx: Float64Array, gy: Float64Array): GridField => {
      const value = new Float64Array(gx.length * gy.length);
      for (let j = 0; j < gy.length; j++) for (let i = 0; i < gx.length; i++) value[j * gx.length + i] = at(gx[i], gy[j]);
      return { value, sd: null };
    };
    return { at, grid, loo, notes };
  }

  const g = Math.max(1, Math.round(Math.sqrt(n / TILE_POINTS)));
  notes.push(`thin-plate: ${n} points, blended local splines on ${g}×${g} overlapping tiles (partition of unity)`);
  const tiles: Tile[] = [];
  for (let a = 0; a < g; a++) {
    for (let b = 0; b < g; b++) {
      const cx = (a + 0.5) / g;
      const cy = (b + 0.5) / g;
      const hx = (0.5 / g) * OVERLAP;
      const hy = hx;
      let ids: number[] = [];
      for (let i = 0; i < n; i++) if (Math.abs(p.x[i] - cx) < hx && Math.abs(p.y[i] - cy) < hy) ids.push(i);
      let spline: LocalSpline | null = null;
      let want = Math.max(MIN_LOCAL, ids.length);
      while (!spline) {
        if (ids.length < want) ids = [...new Set([...ids, ...nearestIds(p, cx, cy, want)])];
        spline = solveSpline(p, ids);
        if (!spline && want >= n) throw new Error('thin-plate spline system is singular (points on one line?)');
        want = Math.min(n, want * 2);
      }
      tiles.push({ cx, cy, hx, hy, spline });
    }
  }

  const weights = (x: number, y: number): number[] => tiles.map((t) => bump((x - t.cx) / t.hx) * bump((y - t.cy) / t.hy));
  const at = (x: number, y: number): number => {
    const w = weights(x, y);
    let sw = 0;
    let sv = 0;
    w.forEach((wt, k) => {
      if (wt > 0) {
        sw += wt;
        sv += wt * evalSpline(p, tiles[k].spline, x, y);
      }
    });
    return sw > 0 ? sv / sw : NaN;
  };

  // Leave-one-out: every tile with weight > 0 at p_i holds p_i, so its own Rippa residual applies.
  const pos = tiles.map((t) => new Map(t.spline.ids.map((id, r) => [id, r])));
  for (let i = 0; i < n; i++) {
    const w = weights(p.x[i], p.y[i]);
    let sw = 0;
    let sr = 0;
    w.forEach((wt, k) => {
      const r = pos[k].get(i);
      if (wt > 0 && r !== undefined) {
        sw += wt;
        sr += wt * tiles[k].spline.looResidual[r];
      }
    });
    if (sw > 0) loo[i] = p.v[i] - sr / sw;
  }

  // Raster: each tile adds its weighted spline to the raster points inside its support only.
  const grid = (gx: Float64Array, gy: Float64Array): GridField => {
    const nx = gx.length;
    const sv = new Float64Array(nx * gy.length);
    const sw = new Float64Array(nx * gy.length);
    for (const t of tiles) {
      const i0 = lowerBound(gx, t.cx - t.hx);
      const i1 = lowerBound(gx, t.cx + t.hx);
      const j0 = lowerBound(gy, t.cy - t.hy);
      const j1 = lowerBound(gy, t.cy + t.hy);
      for (let j = j0; j < j1; j++) {
        const wy = bump((gy[j] - t.cy) / t.hy);
        if (wy === 0) continue;
        for (let i = i0; i < i1; i++) {
          const wt = wy * bump((gx[i] - t.cx) / t.hx);
          if (wt === 0) continue;
          sw[j * nx + i] += wt;
          sv[j * nx + i] += wt * evalSpline(p, t.spline, gx[i], gy[j]);
        }
      }
    }
    for (let k = 0; k < sv.length; k++) sv[k] = sw[k] > 0 ? sv[k] / sw[k] : NaN;
    return { value: sv, sd: null };
  };
  return { at, grid, loo, notes };
}
