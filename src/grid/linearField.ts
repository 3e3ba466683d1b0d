import Delaunator from 'delaunator';
import type { FittedField, GridField, ScatterPoints } from './Interpolator.js';
import { lowerBound } from './Interpolator.js';

/** Barycentric tolerance: points this close outside a triangle count as on its edge (grid-aligned data). */
const EDGE_TOL = 1e-9;

/** Barycentric interpolation in triangle (a, b, c) at (px, py); NaN when outside. */
function barycentric(
  ax: number, ay: number, av: number,
  bx: number, by: number, bv: number,
  cx: number, cy: number, cv: number,
  px: number, py: number,
): number {
  const det = (by - cy) * (ax - cx) + (cx - bx) * (ay - cy);
  if (det === 0) return NaN;
  const l1 = ((by - cy) * (px - cx) + (cx - bx) * (py - cy)) / det;
  const l2 = ((cy - ay) * (px - cx) + (ax - cx) * (py - cy)) / det;
  const l3 = 1 - l1 - l2;
  if (l1 < -EDGE_TOL || l2 < -EDGE_TOL || l3 < -EDGE_TOL) return NaN;
  return l1 * av + l2 * bv + l3 * cv;
}

/** Piecewise-linear interpolation through sorted 1-D knots; NaN outside [first, last]. */
function linear1d(xs: Float64Array, vs: Float64Array, x: number): number {
  const n = xs.length;
  if (n === 0 || x < xs[0] - EDGE_TOL || x > xs[n - 1] + EDGE_TOL) return NaN;
  if (n === 1) return vs[0];
  let k = lowerBound(xs, x);
  if (k === 0) return vs[0];
  if (k >= n) return vs[n - 1];
  if (xs[k] === x) return vs[k];
  k -= 1;
  const w = (x - xs[k]) / (xs[k + 1] - xs[k]);
  return vs[k] + w * (vs[k + 1] - vs[k]);
}

function fit1d(p: ScatterPoints): FittedField {
  const order = [...p.x.keys()].sort((a, b) => p.x[a] - p.x[b]);
  const xs = Float64Array.from(order, (i) => p.x[i]);
  const vs = Float64Array.from(order, (i) => p.v[i]);
  const loo = new Float64Array(p.x.length).fill(NaN);
  // Without knot k, the value there comes from its two neighbours; the end knots have none on one side.
  for (let k = 1; k < xs.length - 1; k++) {
    const w = (xs[k] - xs[k - 1]) / (xs[k + 1] - xs[k - 1]);
    loo[order[k]] = vs[k - 1] + w * (vs[k + 1] - vs[k - 1]);
  }
  const at = (x: number) => linear1d(xs, vs, x);
  return {
    at,
    grid: (gx, gy) => {
      const value = new Float64Array(gx.length * gy.length);
      for (let j = 0; j < gy.length; j++) for (let i = 0; i < gx.length; i++) value[j * gx.length + i] = at(gx[i]);
      return { value, sd: null };
    },
    loo,
    notes: [],
  };
}

/**
 * Delaunay triangulation (delaunator) and barycentric interpolation: exact for affine functions,
 * continuous, NaN outside the convex hull of the data (no extrapolation).
 *
 * Leave-one-out without n re-triangulations: removing point i changes the Delaunay triangulation
 * only inside i's star, which is re-triangulated from its neighbours; every new triangle is
 * Delaunay for those neighbours, so the triangle holding p_i in DT(P \ {i}) is the one holding it
 * in DT(neighbours of i). Hull points usually fall outside the shrunken hull and get NaN.
 */
export function linearField(p: ScatterPoints): FittedField {
  if (p.dims === 1) return fit1d(p);
  const n = p.x.length;
  const coords = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    coords[2 * i] = p.x[i];
    coords[2 * i + 1] = p.y[i];
  }
  const d = new Delaunator(coords);
  const tri = d.triangles;
  if (tri.length === 0) throw new Error('linear interpolation needs at least three points not on one line');

  // Neighbours of each point from the triangle edges.
  const nbr: Set<number>[] = Array.from({ length: n }, () => new Set<number>());
  for (let t = 0; t < tri.length; t += 3) {
    const a = tri[t];
    const b = tri[t + 1];
    const c = tri[t + 2];
    nbr[a].add(b).add(c);
    nbr[b].add(a).add(c);
    nbr[c].add(a).add(b);
  }
  const loo = new Float64Array(n).fill(NaN);
  // One triangulator per star size, refilled and updated in place: constructing one allocates nine
  // typed arrays, and the stars of a few thousand points needed ~60 ms mostly for that.
  const byStarSize = new Map<number, Delaunator<Float64Array>>();
  for (let i = 0; i < n; i++) {
    const ids = [...nbr[i]];
    if (ids.length < 3) continue;
    let ld = byStarSize.get(ids.length);
    const local = ld ? ld.coords : new Float64Array(2 * ids.length);
    ids.forEach((id, k) => {
      local[2 * k] = p.x[id];
      local[2 * k + 1] = p.y[id];
    });
    if (ld) ld.update();
    else byStarSize.set(ids.length, (ld = new Delaunator(local)));
    const lt = ld.triangles;
    for (let t = 0; t < lt.length; t += 3) {
      const a = ids[lt[t]];
      const b = ids[lt[t + 1]];
      const c = ids[lt[t + 2]];
      const v = barycentric(p.x[a], p.y[a], p.v[a], p.x[b], p.y[b], p.v[b], p.x[c], p.y[c], p.v[c], p.x[i], p.y[i]);
      if (!Number.isNaN(v)) {
        loo[i] = v;
        break;
      }
    }
  }

  const at = (px: number, py: number): number => {
    for (let t = 0; t < tri.length; t += 3) {
      const a = tri[t];
      const b = tri[t + 1];
      const c = tri[t + 2];
      const v = barycentric(p.x[a], p.y[a], p.v[a], p.x[b], p.y[b], p.v[b], p.x[c], p.y[c], p.v[c], px, py);
      if (!Number.isNaN(v)) return v;
    }
    return NaN;
  };

  // Raster by scanning each triangle's bounding box: total work ~ raster size, not raster × triangles.
  const grid = (gx: Float64Array, gy: Float64Array): GridField => {
    const nx = gx.length;
    const value = new Float64Array(nx * gy.length).fill(NaN);
    for (let t = 0; t < tri.length; t += 3) {
      const a = tri[t];
      const b = tri[t + 1];
      const c = tri[t + 2];
      const ax = p.x[a], ay = p.y[a], bx = p.x[b], by = p.y[b], cx = p.x[c], cy = p.y[c];
      const i0 = lowerBound(gx, Math.min(ax, bx, cx) - EDGE_TOL);
      const i1 = lowerBound(gx, Math.max(ax, bx, cx) + EDGE_TOL);
      const j0 = lowerBound(gy, Math.min(ay, by, cy) - EDGE_TOL);
      const j1 = lowerBound(gy, Math.max(ay, by, cy) + EDGE_TOL);
      for (let j = j0; j < j1; j++) {
        for (let i = i0; i < i1; i++) {
          const k = j * nx + i;
          if (!Number.isNaN(value[k])) continue;
          value[k] = barycentric(ax, ay, p.v[a], bx, by, p.v[b], cx, cy, p.v[c], gx[i], gy[j]);
        }
      }
    }
    return { value, sd: null };
  };
  return { at, grid, loo, notes: [] };
}
