import { describe, expect, it } from 'vitest';
import { findRidge } from '../../src/analysis/findRidge.js';
import { makeCell, makeMap, testRng } from './makeCell.js';

// 13 widths, half-octave steps from 4 to 256 (log-spaced widths: REFERENCES §5, common practice).
const XS = Array.from({ length: 13 }, (_, i) => 2 ** (2 + i / 2));
const r = testRng(2024);

function noisyRow(curve: (u: number) => number, seeds: number, sd: number, train?: (u: number) => number) {
  return XS.map((x) => {
    const u = Math.log2(x);
    const v = Array.from({ length: seeds }, () => curve(u) + sd * r.z());
    return makeCell({ width: x }, v, train ? v.map(() => train(u)) : undefined);
  });
}

/** Fraction of `trials` noisy rows in which findRidge reports a peak. */
function peakRate(curve: (u: number) => number, seeds: number, sd: number, trials: number): number {
  let hits = 0;
  for (let t = 0; t < trials; t++) {
    const map = makeMap({ xs: XS, rows: [{ y: 1, cells: noisyRow(curve, seeds, sd) }] });
    if (findRidge(map, { boot: 0, nullRounds: 300, seed: t }).rows[0].peak) hits++;
  }
  return hits / trials;
}

describe('findRidge', () => {
  it('locates an intermediate peak, not the under-fitted global maximum at the left edge', () => {
    // Means fall from 0.6 (tiny model), rise to a peak at width 32 (index 6), then fall again.
    const means = [0.6, 0.5, 0.42, 0.36, 0.38, 0.44, 0.5, 0.46, 0.38, 0.32, 0.28, 0.26, 0.25];
    const cells = means.map((m, i) => makeCell({ width: XS[i] }, [m - 0.01, m, m + 0.01]));
    const row = findRidge(makeMap({ xs: XS, rows: [{ y: 1000, cells }] }), { boot: 300 }).rows[0];
    expect(row.noiseFrom).toBe('seeds');
    expect(row.peak).not.toBeNull();
    const pk = row.peak!;
    expect(pk.cellX).toBe(32);
    expect(pk.error).toBeCloseTo(0.5, 12);
    // prominence over the higher flanking minimum: 0.5 − max(0.36, 0.25)
    expect(pk.prominence).toBeCloseTo(0.14, 12);
    // parabola through (4.5, .44), (5, .5), (5.5, .46) in log2 width: vertex at 5 + 0.25·(0.02/0.1) − ... computed by hand:
    // a = ((.46−.5) − (.5−.44))/(2·0.25) = −0.2, b-slope at 5 = (.46 − .44)/1 = 0.02 → vertex 5 + 0.02/(2·0.2) = 5.05
    expect(Math.log2(pk.x)).toBeCloseTo(5.05, 10);
    expect(pk.low).toBeLessThanOrEqual(pk.x);
    expect(pk.high).toBeGreaterThanOrEqual(pk.x);
    expect(pk.low).toBeGreaterThanOrEqual(XS[5]);
    expect(pk.high).toBeLessThanOrEqual(XS[7]);
    expect(row.others).toEqual([]);
  });

  it('reports no peak for a monotone decreasing curve, a U-shaped curve and pure noise', () => {
    const decreasing = (u: number) => 0.1 + 0.4 * 2 ** (-(u - 2) / 2);
    const uShape = (u: number) => 0.2 + 0.02 * (u - 5) ** 2;
    const flat = () => 0.3;
    for (const curve of [decreasing, uShape, flat]) {
      const map = makeMap({ xs: XS, rows: [{ y: 1, cells: noisyRow(curve, 4, 0.02) }] });
      expect(findRidge(map, { boot: 100 }).rows[0].peak).toBeNull();
    }
    // Over many noisy rows, false peaks stay near the 5% search-wide level (slack for Monte-Carlo error).
    expect(peakRate(flat, 3, 0.02, 150)).toBeLessThanOrEqual(0.09);
    expect(peakRate(decreasing, 3, 0.02, 100)).toBeLessThanOrEqual(0.09);
    expect(peakRate(uShape, 3, 0.02, 100)).toBeLessThanOrEqual(0.09);
    // ...and single-seed rows too, where the noise is estimated from the curve itself.
    expect(peakRate(flat, 1, 0.02, 150)).toBeLessThanOrEqual(0.09);
  });

  it('says when a bump sits inside the noise', () => {
    const means = [0.4, 0.38, 0.36, 0.35, 0.353, 0.34, 0.33, 0.32, 0.31, 0.3, 0.3, 0.29, 0.28];
    const cells = means.map((m, i) => makeCell({ width: XS[i] }, [m - 0.02, m, m + 0.02]));
    const row = findRidge(makeMap({ xs: XS, rows: [{ y: 1, cells }] }), { boot: 50 }).rows[0];
    expect(row.peak).toBeNull();
    expect(row.insideNoise?.cellX).toBe(XS[4]);
    expect(row.insideNoise!.prominenceSe).toBeLessThan(2);
  });

  it('gives competing peaks as the most prominent plus others', () => {
    const means = [0.5, 0.4, 0.47, 0.4, 0.3, 0.35, 0.6, 0.4, 0.3, 0.25, 0.24, 0.23, 0.22];
    const cells = means.map((m, i) => makeCell({ width: XS[i] }, [m - 0.005, m, m + 0.005]));
    const row = findRidge(makeMap({ xs: XS, rows: [{ y: 1, cells }] }), { boot: 100 }).rows[0];
    expect(row.peak?.cellX).toBe(XS[6]);
    expect(row.others.map((o) => o.cellX)).toEqual([XS[2]]);
    expect(row.others[0].prominence).toBeCloseTo(0.07, 12);
  });

  it('uses the curve for noise when cells have one seed, and says so', () => {
    const curve = (u: number) => 0.3 - 0.02 * (u - 2) + 0.15 * Math.exp(-((u - 5.2) ** 2) / 0.5);
    const map = makeMap({ xs: XS, rows: [{ y: 1, cells: noisyRow(curve, 1, 0.005) }] });
    const row = findRidge(map, { boot: 300 }).rows[0];
    expect(row.noiseFrom).toBe('curve');
    expect(row.noiseSd).toBeGreaterThan(0);
    expect(row.peak).not.toBeNull();
    expect(Math.abs(Math.log2(row.peak!.x) - 5.2)).toBeLessThan(0.5);
  });

  it('reports the threshold per row and the peak/threshold ratio', () => {
    // train error reaches 0 at width 32 (u = 5) linearly from 0.25 at u = 4: crosses 0.01 at u = 4.96
    const train = (u: number) => Math.max(0, 0.25 * (5 - u));
    const curve = (u: number) => 0.3 + 0.2 * Math.exp(-((u - 5) ** 2) / 0.5);
    const map = makeMap({ xs: XS, rows: [{ y: 1, cells: noisyRow(curve, 3, 0.005, train) }] });
    const row = findRidge(map, { boot: 100 }).rows[0];
    expect(Math.log2(row.threshold!)).toBeCloseTo(4.96, 10);
    expect(row.ratio).toBeCloseTo(row.peak!.x / row.threshold!, 12);
    // sample-wise maps: the threshold is the largest n that is still fitted (effective model complexity)
    const ns = [100, 200, 400, 800];
    const cells = [0, 0, 0.005, 0.05].map((t, i) => makeCell({ train_size: ns[i] }, [0.3, 0.31], [t, t]));
    const sample = findRidge(makeMap({ kind: 'sample', x: 'train_size', y: 'width', xs: ns, rows: [{ y: 64, cells }] }), { boot: 10 });
    // crosses between 400 (0.005) and 800 (0.05) at u = log2(400) + 0.005/0.045
    expect(Math.log2(sample.rows[0].threshold!)).toBeCloseTo(Math.log2(400) + 0.005 / 0.045, 10);
  });

  it('is deterministic for a seed and handles several rows independently', () => {
    const curve = (u: number) => 0.3 + 0.1 * Math.exp(-((u - 5) ** 2) / 0.8);
    const rows = [10, 100, 1000].map((y) => ({ y, cells: noisyRow(curve, 4, 0.02) }));
    rows[0].cells = noisyRow(() => 0.3, 4, 0.001);
    const map = makeMap({ xs: XS, rows });
    const a = findRidge(map, { boot: 200, seed: 5 });
    const b = findRidge(map, { boot: 200, seed: 5 });
    expect(a).toEqual(b);
    expect(a.rows.map((x) => x.y)).toEqual([10, 100, 1000]);
    expect(a.rows[1].peak).not.toBeNull();
    expect(a.rows[2].peak).not.toBeNull();
    expect(a).toMatchObject({ map: 'model', x: 'width', y: 'epochs', minProminence: 2, epsilon: 0.01, boot: 200 });
  });

  it("gives a row the same bootstrap interval whether or not other rows are in the map", () => {
    // Tall peaks (prominence ~10 SE), so the correction across rows cannot change which peak is reported.
    const curve = (u: number) => 0.3 + 0.1 * Math.exp(-((u - 5) ** 2) / 0.8);
    const seeds = [10, 100, 1000].map((y) => ({ y, cells: noisyRow(curve, 4, 0.02) }));
    // One seed per cell: the smoothed-curve model and its residual block bootstrap.
    const single = [10, 100, 1000].map((y) => ({ y, cells: noisyRow(curve, 1, 0.01) }));
    for (const rows of [seeds, single]) {
      const full = findRidge(makeMap({ xs: XS, rows }), { boot: 200, seed: 7 });
      for (const keep of [[2], [1, 2], [0, 2]]) {
        const part = findRidge(makeMap({ xs: XS, rows: keep.map((i) => rows[i]) }), { boot: 200, seed: 7 });
        const a = full.rows.find((r) => r.y === 1000)!.peak;
        const b = part.rows.find((r) => r.y === 1000)!.peak;
        expect(a).not.toBeNull();
        expect([b?.low, b?.high, b?.x]).toEqual([a!.low, a!.high, a!.x]);
        // The interval is a real bootstrap (not collapsed onto the estimate).
        expect(a!.high).toBeGreaterThan(a!.low);
      }
    }
  });
});
