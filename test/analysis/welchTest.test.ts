import { describe, expect, it } from 'vitest';
import { welchTest } from '../../src/analysis/welchTest.js';

describe('welchTest', () => {
  // Reference values computed once with scipy 1.10.1: scipy.stats.ttest_ind(a, b, equal_var=False[, alternative=...]);
  // df by the Welch–Satterthwaite formula in numpy.
  it('matches scipy on a small error-rate comparison (two-sided, greater, less)', () => {
    const a = [0.412, 0.398, 0.431, 0.405];
    const b = [0.351, 0.362, 0.34];
    const two = welchTest(a, b);
    expect(two.t).toBeCloseTo(6.350852961085898, 10);
    expect(two.df).toBeCloseTo(4.959183673469388, 10);
    expect(two.p).toBeCloseTo(0.0014732999199067339, 8);
    expect(welchTest(a, b, { alternative: 'greater' }).p).toBeCloseTo(0.0007366499599533669, 8);
    expect(welchTest(a, b, { alternative: 'less' }).p).toBeCloseTo(0.9992633500400466, 8);
  });

  // The worked example of Welch's test on Wikipedia (samples A1, A2; t ≈ −2.46, ν ≈ 25.0, p ≈ 0.021 — from memory),
  // exact values from scipy 1.10.1.
  it('matches the textbook example with equal sizes and unequal variances', () => {
    const a = [27.5, 21.0, 19.0, 23.6, 17.0, 17.9, 16.9, 20.1, 21.9, 22.6, 23.1, 19.6, 19.0, 21.7, 21.4];
    const b = [27.1, 22.0, 20.8, 23.4, 23.4, 23.5, 25.8, 22.0, 24.8, 20.2, 21.9, 22.1, 22.9, 20.5, 24.4];
    const r = welchTest(a, b);
    expect(r.t).toBeCloseTo(-2.455356398286006, 10);
    expect(r.df).toBeCloseTo(24.988529290231416, 8);
    expect(r.p).toBeCloseTo(0.021378001462866985, 8);
  });

  it('matches scipy with unequal sizes, a one-sided test the data contradict, and a far tail', () => {
    // scipy 1.10.1, alternative='greater'
    const r = welchTest([0.3, 0.31], [0.1, 0.5, 0.2, 0.45, 0.33], { alternative: 'greater' });
    expect(r.t).toBeCloseTo(-0.14658850696664955, 10);
    expect(r.df).toBeCloseTo(4.0354345960780575, 8);
    expect(r.p).toBeCloseTo(0.5547556122456496, 8);
    const far = welchTest([0.9, 1.1, 1.0, 1.2, 0.8, 1.05], [0.1, 0.15, 0.05, 0.12], { alternative: 'greater' });
    expect(far.t).toBeCloseTo(14.569050258459747, 9);
    expect(far.df).toBeCloseTo(6.207887163265836, 8);
    expect(far.p / 2.4642656886879876e-6).toBeCloseTo(1, 6);
  });

  it('treats zero spread as an exact difference and refuses single values', () => {
    expect(welchTest([2, 2], [1, 1], { alternative: 'greater' }).p).toBe(0);
    expect(welchTest([1, 1], [2, 2], { alternative: 'greater' }).p).toBe(1);
    expect(() => welchTest([1], [1, 2])).toThrow(/two or more/);
  });
});
