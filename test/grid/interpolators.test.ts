import Delaunator from 'delaunator';
import { describe, expect, it } from 'vitest';
import { gaussianProcessField, matern52 } from '../../src/grid/gaussianProcessField.js';
import { cholesky, forwardSolve } from '../../src/grid/linalg.js';
import type { FittedField, ScatterPoints } from '../../src/grid/Interpolator.js';
import { linearField } from '../../src/grid/linearField.js';
import { THIN_PLATE_GLOBAL_MAX, thinPlateField } from '../../src/grid/thinPlateField.js';
import { mulberry32 } from '../../src/random/mulberry32.js';

/** Deterministic uniform numbers (mulberry32) so failures reproduce. */
const rng = mulberry32;

function scatter(n: number, f: (x: number, y: number) => number, seed = 1, noise: number | null = null): ScatterPoints {
  const r = rng(seed);
  const x = Float64Array.from({ length: n }, () => r());
  const y = Float64Array.from({ length: n }, () => r());
  return { dims: 2, x, y, v: Float64Array.from(x, (xi, i) => f(xi, y[i])), noise: noise === null ? null : new Float64Array(n).fill(noise) };
}

/** Points strictly inside the convex hull of `p` (for methods that do not extrapolate). */
function insideHull(p: ScatterPoints, m: number, seed: number): [number, number][] {
  const r = rng(seed);
  const out: [number, number][] = [];
  const d = new Delaunator(Float64Array.from({ length: 2 * p.x.length }, (_, k) => (k % 2 ? p.y[(k - 1) / 2] : p.x[k / 2])));
  while (out.length < m) {
    // A random convex combination of a random triangle's corners is inside the hull.
    const t = 3 * Math.floor(r() * (d.triangles.length / 3));
    let a = r();
    let b = r();
    if (a + b > 1) [a, b] = [1 - a, 1 - b];
    const [i, j, k] = [d.triangles[t], d.triangles[t + 1], d.triangles[t + 2]];
    out.push([p.x[i] + a * (p.x[j] - p.x[i]) + b * (p.x[k] - p.x[i]), p.y[i] + a * (p.y[j] - p.y[i]) + b * (p.y[k] - p.y[i])]);
  }
  return out;
}

const affine = (x: number, y: number) => 0.3 - 1.7 * x + 2.9 * y;
const wavy = (x: number, y: number) => Math.sin(4 * x) * Math.cos(3 * y) + 0.5 * x;

describe('linear (Delaunay, barycentric) and thin-plate reproduce any affine function exactly', () => {
  // Common practice: barycentric interpolation is exact for affine data; a thin-plate spline with
  // affine part reproduces affine data (its radial weights vanish) — Duchon 1977, from memory.
  const p = scatter(80, affine, 3);
  const probes = insideHull(p, 200, 4);
  for (const [name, fit] of [['linear', linearField], ['thin-plate', thinPlateField]] as const) {
    it(name, () => {
      const f = fit(p);
      for (const [x, y] of probes) expect(f.at(x, y)).toBeCloseTo(affine(x, y), 9);
      // The raster path (its own loops) agrees with point evaluation.
      const gx = Float64Array.from({ length: 17 }, (_, i) => 0.2 + (0.6 * i) / 16);
      const g = f.grid(gx, gx);
      for (let j = 0; j < 17; j++) {
        for (let i = 0; i < 17; i++) {
          const v = g.value[j * 17 + i];
          if (name === 'thin-plate' || Number.isFinite(v)) expect(v).toBeCloseTo(affine(gx[i], gx[j]), 9);
        }
      }
    });
  }

  it('thin-plate in partition-of-unity mode (more than the global limit) stays exact for affine data', () => {
    const big = scatter(THIN_PLATE_GLOBAL_MAX + 150, affine, 5);
    const f = thinPlateField(big);
    expect(f.notes.join(' ')).toMatch(/partition of unity/);
    for (const [x, y] of insideHull(big, 100, 6)) expect(f.at(x, y)).toBeCloseTo(affine(x, y), 8);
    // The raster path blends tile by tile; each local spline is affine-exact, so the blend is too.
    const gx = Float64Array.from({ length: 33 }, (_, i) => i / 32);
    const g = f.grid(gx, gx);
    for (let j = 0; j < 33; j++) for (let i = 0; i < 33; i++) expect(g.value[j * 33 + i]).toBeCloseTo(affine(gx[i], gx[j]), 8);
  });

  it('one-dimensional maps: both reproduce a line', () => {
    const x = Float64Array.from([0, 0.1, 0.35, 0.5, 0.9, 1]);
    const p: ScatterPoints = { dims: 1, x, y: new Float64Array(6), v: Float64Array.from(x, (t) => 2 - 3 * t), noise: null };
    for (const f of [linearField(p), thinPlateField(p)]) for (const t of [0.05, 0.42, 0.77]) expect(f.at(t, 0)).toBeCloseTo(2 - 3 * t, 9);
  });

  it('linear gives nothing outside the hull', () => {
    const f = linearField(p);
    expect(f.at(-0.5, 0.5)).toBeNaN();
    expect(f.at(2, 2)).toBeNaN();
  });
});

describe('every interpolator passes through noise-free data points', () => {
  // Common practice: an interpolant equals the data at the data sites; a GP with zero noise
  // has posterior mean equal to the observations there (Rasmussen & Williams 2006, §2.2).
  const p = scatter(60, wavy, 8, 0);
  const fits: [string, FittedField][] = [
    ['linear', linearField(p)],
    ['thin-plate', thinPlateField(p)],
    ['gp', gaussianProcessField(p)],
  ];
  for (const [name, f] of fits) {
    it(name, () => {
      // Tolerance: the GP adds a tiny diagonal jitter (1e-10..1e-8 of its amplitude) for a stable Cholesky.
      for (let i = 0; i < p.x.length; i++) expect(Math.abs(f.at(p.x[i], p.y[i]) - p.v[i])).toBeLessThan(name === 'gp' ? 2e-5 : 1e-9);
    });
  }
  it('thin-plate in partition-of-unity mode', () => {
    const big = scatter(THIN_PLATE_GLOBAL_MAX + 150, wavy, 9);
    const f = thinPlateField(big);
    for (let i = 0; i < big.x.length; i += 7) expect(f.at(big.x[i], big.y[i])).toBeCloseTo(big.v[i], 8);
  });
});

describe('leave-one-out', () => {
  it('gp: closed form (Rasmussen & Williams 2006, eq. 5.12) equals brute-force refits with the same hyper-parameters', () => {
    const p = scatter(30, wavy, 11, 0.01);
    const full = gaussianProcessField(p);
    const { lx, ly, amp2, noise2, mean, scale } = full.params!;
    for (let i = 0; i < p.x.length; i++) {
      const keep = [...p.x.keys()].filter((k) => k !== i);
      const sub: ScatterPoints = {
        dims: 2,
        x: Float64Array.from(keep, (k) => p.x[k]),
        y: Float64Array.from(keep, (k) => p.y[k]),
        v: Float64Array.from(keep, (k) => p.v[k]),
        noise: Float64Array.from(keep, (k) => p.noise![k]),
      };
      const refit = gaussianProcessField(sub, { hyper: { lx, ly, amp2, noise2 }, mean, scale });
      expect(full.loo[i]).toBeCloseTo(refit.at(p.x[i], p.y[i]), 8);
    }
  });

  it('gp: closed form also holds with a fitted noise level (no per-cell noise given)', () => {
    const p = scatter(20, wavy, 12, null);
    const full = gaussianProcessField(p);
    const { lx, ly, amp2, noise2, mean, scale } = full.params!;
    for (const i of [0, 7, 13]) {
      const keep = [...p.x.keys()].filter((k) => k !== i);
      const sub: ScatterPoints = { dims: 2, x: Float64Array.from(keep, (k) => p.x[k]), y: Float64Array.from(keep, (k) => p.y[k]), v: Float64Array.from(keep, (k) => p.v[k]), noise: null };
      const refit = gaussianProcessField(sub, { hyper: { lx, ly, amp2, noise2 }, mean, scale });
      expect(full.loo[i]).toBeCloseTo(refit.at(p.x[i], p.y[i]), 8);
    }
  });

  it('thin-plate: Rippa’s formula (Rippa 1999, from memory) equals brute-force refits', () => {
    const p = scatter(40, wavy, 13);
    const full = thinPlateField(p);
    for (let i = 0; i < p.x.length; i += 3) {
      const keep = [...p.x.keys()].filter((k) => k !== i);
      const sub: ScatterPoints = { dims: 2, x: Float64Array.from(keep, (k) => p.x[k]), y: Float64Array.from(keep, (k) => p.y[k]), v: Float64Array.from(keep, (k) => p.v[k]), noise: null };
      expect(full.loo[i]).toBeCloseTo(thinPlateField(sub).at(p.x[i], p.y[i]), 8);
    }
  });

  it('linear: the local re-triangulation equals re-triangulating all other points', () => {
    const p = scatter(70, wavy, 14);
    const full = linearField(p);
    let interior = 0;
    for (let i = 0; i < p.x.length; i++) {
      const keep = [...p.x.keys()].filter((k) => k !== i);
      const sub: ScatterPoints = { dims: 2, x: Float64Array.from(keep, (k) => p.x[k]), y: Float64Array.from(keep, (k) => p.y[k]), v: Float64Array.from(keep, (k) => p.v[k]), noise: null };
      const brute = linearField(sub).at(p.x[i], p.y[i]);
      if (Number.isNaN(brute)) expect(full.loo[i]).toBeNaN();
      else {
        interior++;
        expect(full.loo[i]).toBeCloseTo(brute, 10);
      }
    }
    expect(interior).toBeGreaterThan(50);
  });
});

describe('gp standard deviation field', () => {
  it('is small at noise-free data and grows away from them; exact neighbourhood when few cells', () => {
    const p = scatter(25, wavy, 15, 0);
    const f = gaussianProcessField(p);
    const g = f.grid(Float64Array.from([p.x[0], 0.5]), Float64Array.from([p.y[0]]));
    expect(g.sd![0]).toBeLessThan(1e-3);
    expect(g.value[0]).toBeCloseTo(f.at(p.x[0], p.y[0]), 12);
    expect(g.value[1]).toBeCloseTo(f.at(0.5, p.y[0]), 12);
    expect(Number.isFinite(g.sd![1])).toBe(true);
    const far = f.grid(Float64Array.from([1e3]), Float64Array.from([1e3]));
    // Far from all data the posterior sd returns to the prior amplitude (R&W §2.2).
    expect(far.sd![0]).toBeCloseTo(f.params!.scale * Math.sqrt(f.params!.amp2), 6);
  });

  it('is the exact posterior sd (R&W 2006, eq. 2.26) at every raster point, or at sub-raster nodes with bilinear values between', () => {
    const n = 100;
    const p = scatter(n, wavy, 16, 1e-4);
    const f = gaussianProcessField(p);
    const { lx, ly, amp2, scale } = f.params!;
    const z2 = 1e-4 / (scale * scale);
    const k = new Float64Array(n * n);
    const corr = (ax: number, ay: number, bx: number, by: number) => amp2 * matern52(Math.hypot((ax - bx) / lx, (ay - by) / ly));
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) k[i * n + j] = corr(p.x[i], p.y[i], p.x[j], p.y[j]) + (i === j ? z2 + 1e-10 * amp2 : 0);
    expect(cholesky(k, n)).toBe(true);
    const exactSd = (x: number, y: number) => {
      const ks = Float64Array.from({ length: n }, (_, a) => corr(x, y, p.x[a], p.y[a]));
      forwardSolve(k, n, ks);
      return scale * Math.sqrt(Math.max(0, amp2 - ks.reduce((s2, v) => s2 + v * v, 0)));
    };
    const g9 = Float64Array.from({ length: 9 }, (_, i) => i / 8);
    const full = f.grid(g9, g9);
    for (let j = 0; j < 9; j++) for (let i = 0; i < 9; i++) expect(full.sd![j * 9 + i]).toBeCloseTo(exactSd(g9[i], g9[j]), 9);

    // A budget of 100 points on a 37×37 raster: exact on a 10×10 sub-raster (every 4th point).
    const coarse = gaussianProcessField(p, { hyper: f.params as never, mean: f.params!.mean, scale, sdBudget: 100 * (n * n) / 2 });
    const g37 = Float64Array.from({ length: 37 }, (_, i) => i / 36);
    const sub = coarse.grid(g37, g37);
    expect(coarse.notes.join(' ')).toMatch(/10×10 sub-raster/);
    for (let j = 0; j < 37; j += 4) for (let i = 0; i < 37; i += 4) expect(sub.sd![j * 37 + i]).toBeCloseTo(exactSd(g37[i], g37[j]), 9);
    for (let j = 1; j < 36; j += 5) {
      for (let i = 2; i < 36; i += 5) {
        const i0 = 4 * Math.floor(i / 4);
        const j0 = 4 * Math.floor(j / 4);
        const corners = [sub.sd![j0 * 37 + i0], sub.sd![j0 * 37 + i0 + 4], sub.sd![(j0 + 4) * 37 + i0], sub.sd![(j0 + 4) * 37 + i0 + 4]];
        expect(sub.sd![j * 37 + i]).toBeGreaterThanOrEqual(Math.min(...corners) - 1e-12);
        expect(sub.sd![j * 37 + i]).toBeLessThanOrEqual(Math.max(...corners) + 1e-12);
      }
    }
  });
});
