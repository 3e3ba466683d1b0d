import { describe, expect, it } from 'vitest';
import { nullMaxP } from '../../src/analysis/nullMaxP.js';
import { testRng } from './makeCell.js';

describe('nullMaxP', () => {
  it('gives the Monte Carlo p inside the simulated range and the Gumbel tail beyond it', () => {
    // Null maxima drawn from a standard Gumbel (inverse CDF −ln(−ln U)); Gumbel 1958.
    const r = testRng(4);
    const sorted = Float64Array.from({ length: 2000 }, () => -Math.log(-Math.log(r.u()))).sort();
    const p = nullMaxP(sorted);
    // inside: (1 + #{≥ x}) / (rounds + 1)
    const x = sorted[1000];
    expect(p(x)).toBeCloseTo((1 + 1000) / 2001, 12);
    // beyond the largest draw: P(X ≥ 12) = 1 − exp(−e^−12) ≈ 6.1e-6 for the standard Gumbel, fitted by moments
    expect(p(12)).toBeGreaterThan(2e-6);
    expect(p(12)).toBeLessThan(2e-5);
    expect(p(20)).toBeLessThan(p(12));
    expect(p(Number.NaN)).toBe(1);
  });
});
