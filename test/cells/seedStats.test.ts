import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { seedStats } from '../../src/cells/seedStats.js';

describe('seedStats', () => {
  it('matches a hand computation for 1, 2, 3, 4 (t quantile from the handbook table, REFERENCES §6)', () => {
    const s = seedStats([4, 1, 3, 2]);
    // mean 2.5; sample variance 5/3; se = sqrt(5/3)/2; t(0.975, 3) = 3.182446 (handbook table value 3.182).
    expect(s.n).toBe(4);
    expect(s.mean).toBe(2.5);
    expect(s.median).toBe(2.5);
    expect(s.sd).toBeCloseTo(Math.sqrt(5 / 3), 12);
    expect(s.se).toBeCloseTo(Math.sqrt(5 / 3) / 2, 12);
    expect(s.low!).toBeCloseTo(2.5 - 3.182446 * 0.6454972, 5);
    expect(s.high!).toBeCloseTo(2.5 + 3.182446 * 0.6454972, 5);
  });

  it('gives one seed no interval, and zero seeds nothing', () => {
    const one = seedStats([0.3]);
    expect(one).toMatchObject({ n: 1, mean: 0.3, median: 0.3, low: null, high: null });
    expect(one.sd).toBeNaN();
    expect(seedStats([]).n).toBe(0);
    expect(seedStats([NaN, 0.2]).n).toBe(1);
  });

  it('agrees with an independent textbook computation on random samples (common practice: sd with n − 1)', () => {
    // Reference: one-pass sums Σx, Σx² (a different algorithm) and the handbook t values for df 1..4, 9.
    const tTable: Record<number, number> = { 1: 12.7062, 2: 4.3027, 3: 3.1824, 4: 2.7764, 9: 2.2622 };
    fc.assert(
      fc.property(
        fc.constantFrom(2, 3, 4, 5, 10).chain((n) => fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: n, maxLength: n })),
        (xs) => {
          const n = xs.length;
          const sum = xs.reduce((a, b) => a + b, 0);
          const sum2 = xs.reduce((a, b) => a + b * b, 0);
          const mean = sum / n;
          const sd = Math.sqrt(Math.max(0, (sum2 - (sum * sum) / n) / (n - 1)));
          const sorted = [...xs].sort((a, b) => a - b);
          const median = n % 2 ? sorted[(n - 1) / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
          const s = seedStats(xs);
          expect(s.mean).toBeCloseTo(mean, 9);
          expect(s.median).toBe(median);
          expect(s.sd).toBeCloseTo(sd, 6);
          const half = (tTable[n - 1] * sd) / Math.sqrt(n);
          expect(s.high! - s.mean).toBeCloseTo(half, 3);
          expect(s.mean - s.low!).toBeCloseTo(half, 3);
        },
      ),
      { numRuns: 200, seed: 7 },
    );
  });
});
