import { describe, expect, it } from 'vitest';
import { curveNoise } from '../../src/analysis/curveNoise.js';
import { findThreshold } from '../../src/analysis/findThreshold.js';
import { parabolaVertex } from '../../src/analysis/parabolaVertex.js';
import { quantileSorted } from '../../src/analysis/quantile.js';
import { testRng } from './makeCell.js';

describe('parabolaVertex', () => {
  it('recovers the vertex of an exact parabola through unequally spaced points', () => {
    const f = (x: number) => 3 - 2 * (x - 1.3) ** 2;
    expect(parabolaVertex(0, f(0), 1, f(1), 2.5, f(2.5))).toBeCloseTo(1.3, 12);
  });
  it('clips to the bracket and falls back to the middle point without a maximum', () => {
    const f = (x: number) => -((x - 5) ** 2);
    expect(parabolaVertex(0, f(0), 1, f(1), 2, f(2))).toBe(2);
    expect(parabolaVertex(0, 1, 1, 0, 2, 1)).toBe(1); // convex
    expect(parabolaVertex(0, 1, 1, 1, 2, 1)).toBe(1); // flat
  });
});

describe('curveNoise', () => {
  it('is exactly zero on a straight line, however spaced', () => {
    const x = [0, 0.5, 2, 2.2, 4, 7];
    expect(curveNoise(x, x.map((v) => 3 - 0.4 * v))).toBeCloseTo(0, 12);
  });
  it('recovers the noise sd of white noise on a smooth trend within 15% (400 points)', () => {
    // Gasser, Sroka & Jennen-Steinmetz (1986): pseudo-residuals have variance σ² on a locally linear curve.
    const r = testRng(11);
    const x = Array.from({ length: 400 }, (_, i) => i / 40);
    const y = x.map((v) => 0.5 - 0.02 * v + 0.03 * r.z());
    expect(curveNoise(x, y) / 0.03).toBeGreaterThan(0.85);
    expect(curveNoise(x, y) / 0.03).toBeLessThan(1.15);
  });
  it('is NaN with fewer than three points', () => {
    expect(curveNoise([1, 2], [1, 2])).toBeNaN();
  });
});

describe('findThreshold', () => {
  it('interpolates the first crossing below epsilon linearly in transformed x', () => {
    // train error 0.2, 0.05, 0.0 at u = 2, 3, 4: crosses 0.01 at 3 + 0.04/0.05 = 3.8
    expect(findThreshold([2, 3, 4], [0.2, 0.05, 0], { epsilon: 0.01, direction: 'first-below' })).toBeCloseTo(3.8, 12);
  });
  it('finds the last size that still fits for train_size (effective model complexity)', () => {
    // Nakkiran et al. 2019: EMC is the largest n with train error <= ε. Fits up to u = 3, fails at 4 (0.03).
    expect(findThreshold([1, 2, 3, 4], [0, 0, 0.005, 0.03], { epsilon: 0.01, direction: 'last-below' })).toBeCloseTo(3.2, 12);
  });
  it('is null when never reached, skips missing train error, and stops at the edge when reached at once', () => {
    expect(findThreshold([1, 2], [0.3, 0.2], { epsilon: 0.01, direction: 'first-below' })).toBeNull();
    expect(findThreshold([1, 2, 3], [0.3, NaN, 0], { epsilon: 0.01, direction: 'first-below' })).toBeCloseTo(1 + (0.29 / 0.3) * 2, 12);
    expect(findThreshold([1, 2], [0, 0], { epsilon: 0.01, direction: 'first-below' })).toBe(1);
  });
});

describe('quantileSorted', () => {
  it('matches numpy.quantile (linear, type 7)', () => {
    // numpy.quantile([1,2,3,4,10], [0.025, 0.5, 0.975]) = [1.1, 3.0, 9.4] (common practice; arithmetic by hand)
    const v = [1, 2, 3, 4, 10];
    expect(quantileSorted(v, 0.025)).toBeCloseTo(1.1, 12);
    expect(quantileSorted(v, 0.5)).toBe(3);
    expect(quantileSorted(v, 0.975)).toBeCloseTo(9.4, 12);
  });
});
