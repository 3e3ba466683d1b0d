import { describe, expect, it } from 'vitest';
import { findHurts } from '../../src/analysis/findHurts.js';
import { welchTest } from '../../src/analysis/welchTest.js';
import { UserError } from '../../src/UserError.js';
import { makeCell, testRng } from './makeCell.js';

/** Four seeds spread ±0.015 around m (sd 0.0129). */
const spread = (m: number) => [m - 0.015, m - 0.005, m + 0.005, m + 0.015];

// Slice A: falls, rises from n = 400 to n = 1,600, falls back below the n = 400 level between 3,200 and 6,400.
const sizesA = [100, 200, 400, 800, 1600, 3200, 6400];
const valuesA = [spread(0.5), spread(0.45), [0.4, 0.41, 0.39, 0.42], spread(0.44), [0.47, 0.45, 0.49, 0.46], spread(0.43), spread(0.38)];
const sliceA = sizesA.map((n, i) => makeCell({ width: 64, epochs: 1000, label_noise: 0.1, train_size: n }, valuesA[i]));
// Slice B: still rising at the largest size, with unequal seed counts.
const sizesB = [100, 200, 400, 800];
const valuesB = [spread(0.4), [0.3, 0.33, 0.31, 0.28, 0.32], spread(0.33), [0.36, 0.35, 0.37]];
const sliceB = sizesB.map((n, i) => makeCell({ width: 128, epochs: 1000, label_noise: 0.1, train_size: n }, valuesB[i]));

describe('findHurts', () => {
  it('finds onset, peak, rise, Welch p and the interpolated recovery', () => {
    const res = findHurts(sliceA);
    expect(res.segments).toHaveLength(1);
    const s = res.segments[0];
    expect(s).toMatchObject({ onset: 400, peak: 1600, test: 'welch', fixed: { width: 64, epochs: 1000, label_noise: 0.1, condition: '' } });
    expect(s.rise).toBeCloseTo(0.4675 - 0.405, 12);
    // scipy 1.10.1: ttest_ind([.47,.45,.49,.46], [.40,.41,.39,.42], equal_var=False, alternative='greater')
    expect(s.p).toBeCloseTo(0.0007149216632534556, 8);
    // recovery: between 3,200 (0.43) and 6,400 (0.38) the onset level 0.405 is crossed halfway in log2 n
    expect(s.recovery).toBeCloseTo(3200 * Math.SQRT2, 6);
  });

  it('reports null recovery for a rise still going at the largest size, and lists segments worst first', () => {
    const res = findHurts([...sliceB, ...sliceA]);
    expect(res.segments.map((s) => s.fixed.width)).toEqual([64, 128]);
    const b = res.segments[1];
    expect(b).toMatchObject({ onset: 200, peak: 800, recovery: null, lastSize: 800 });
    // scipy 1.10.1: ttest_ind([.36,.35,.37], [.30,.33,.31,.28,.32], equal_var=False, alternative='greater')
    expect(b.p).toBeCloseTo(0.0012110962745017098, 8);
  });

  it('restricts to the slice named by at, and refuses to fix train_size', () => {
    const res = findHurts([...sliceA, ...sliceB], { at: { width: 128 } });
    expect(res.fixed).toEqual({ width: 128 });
    expect(res.segments.map((s) => s.fixed.width)).toEqual([128]);
    expect(findHurts([...sliceA, ...sliceB], { at: { width: 128, label_noise: 0.2 } }).segments).toEqual([]);
    expect(() => findHurts(sliceA, { at: { train_size: 100 } })).toThrow(UserError);
  });

  it('keeps a rise with a wiggle on the way up as one segment', () => {
    const means = [0.3, 0.35, 0.34, 0.45, 0.3];
    const cells = means.map((m, i) => makeCell({ train_size: 100 * 2 ** i }, [m - 0.003, m, m + 0.003]));
    const res = findHurts(cells);
    expect(res.segments).toHaveLength(1);
    expect(res.segments[0]).toMatchObject({ onset: 100, peak: 800 });
    expect(res.segments[0].recovery).toBeCloseTo(1600, 6);
  });

  it('drops a rise that is not significant', () => {
    const cells = [0.3, 0.29, 0.3, 0.28].map((m, i) => makeCell({ train_size: 100 * 2 ** i }, [m - 0.05, m, m + 0.05]));
    const res = findHurts(cells);
    expect(res.segments).toEqual([]);
    const p = welchTest([0.25, 0.3, 0.35], [0.24, 0.29, 0.34], { alternative: 'greater' }).p;
    expect(p).toBeGreaterThan(0.05);
  });

  it('uses a bootstrap with the curve noise when cells have a single seed', () => {
    const r = testRng(3);
    const sizes = Array.from({ length: 24 }, (_, i) => 100 * 2 ** (i / 4)); // quarter-octave steps
    const curve = (u: number) => 0.5 - 0.03 * u + 0.12 * Math.exp(-((u - 3) ** 2) / 0.6);
    const cells = sizes.map((n) => makeCell({ train_size: n }, [curve(Math.log2(n / 100)) + 0.004 * r.z()]));
    const res = findHurts(cells, { boot: 2000 });
    expect(res.segments.length).toBeGreaterThanOrEqual(1);
    const s = res.segments[0];
    expect(s.test).toBe('bootstrap');
    expect(s.noiseFrom).toBe('curve');
    expect(s.p).toBeLessThan(0.01);
    expect(Math.abs(Math.log2(s.peak / 800))).toBeLessThanOrEqual(0.5);
    expect(findHurts(cells, { boot: 2000 })).toEqual(res); // fixed seed: deterministic
  });

  it('keeps false segments in pure-noise slices near the 5% level (onset and peak are picked, so Welch alone would not)', () => {
    const r = testRng(5);
    let withSegment = 0;
    let welchAlone = 0;
    const trials = 120;
    for (let t = 0; t < trials; t++) {
      const cells = Array.from({ length: 8 }, (_, i) => makeCell({ train_size: 100 * 2 ** i }, Array.from({ length: 4 }, () => 0.3 + 0.02 * r.z())));
      if (findHurts(cells, { nullRounds: 300, seed: t }).segments.length) withSegment++;
      if (findHurts(cells, { nullRounds: 0 }).segments.length) welchAlone++;
    }
    expect(withSegment / trials).toBeLessThanOrEqual(0.09);
    expect(welchAlone / trials).toBeGreaterThan(0.2); // the selection effect the search-wide check removes
  });

  it('corrects for the slices scanned (Benjamini–Hochberg 1995): 40 pure-noise slices give about 5% false discoveries, not one per 20 slices', () => {
    const r = testRng(8);
    let falseSlices = 0;
    let uncorrected = 0;
    let realFound = 0;
    const sweeps = 6;
    for (let t = 0; t < sweeps; t++) {
      const cells = [];
      for (let w = 0; w < 40; w++) {
        for (let i = 0; i < 8; i++) cells.push(makeCell({ width: w + 1, train_size: 100 * 2 ** i }, Array.from({ length: 4 }, () => 0.3 + 0.02 * r.z())));
      }
      // one slice with a real rise from n = 800 to 3,200
      const real = [0.4, 0.36, 0.33, 0.3, 0.38, 0.42, 0.35, 0.3];
      real.forEach((m, i) => cells.push(makeCell({ width: 99, train_size: 100 * 2 ** i }, Array.from({ length: 4 }, () => m + 0.01 * r.z()))));
      const res = findHurts(cells, { nullRounds: 300, seed: t });
      const raw = findHurts(cells, { nullRounds: 300, seed: t, correction: 'none' });
      expect(res.correction).toBe('benjamini-hochberg');
      expect(res.slices).toBe(41);
      for (const s of res.segments) expect(s.pAdjusted!).toBeGreaterThanOrEqual(Math.max(s.p, s.pSearch!));
      falseSlices += new Set(res.segments.filter((s) => s.fixed.width !== 99).map((s) => s.fixed.width)).size;
      uncorrected += new Set(raw.segments.filter((s) => s.fixed.width !== 99).map((s) => s.fixed.width)).size;
      if (res.segments.some((s) => s.fixed.width === 99)) realFound++;
      expect(res.slicesWithRise).toBe(new Set(res.segments.map((s) => s.fixed.width)).size);
    }
    // with a real discovery, BH lets through about alpha × discoveries false ones: far fewer than uncorrected
    expect(falseSlices).toBeLessThan(uncorrected);
    expect(falseSlices / sweeps).toBeLessThanOrEqual(1);
    expect(realFound).toBe(sweeps);
  });
});
