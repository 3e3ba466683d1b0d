import { describe, expect, it } from 'vitest';
import { tQuantile } from '../../src/cells/tQuantile.js';

describe('tQuantile', () => {
  // Two-sided 95% Student-t quantiles, any statistics handbook table (REFERENCES.md §6).
  const table: [number, number][] = [
    [1, 12.706],
    [2, 4.303],
    [3, 3.182],
    [4, 2.776],
    [9, 2.262],
    [29, 2.045],
  ];
  for (const [df, q] of table) {
    it(`t(0.975, ${df}) = ${q} (handbook table, REFERENCES §6)`, () => {
      expect(tQuantile(0.975, df)).toBeCloseTo(q, 3);
    });
  }

  it('is symmetric and tends to the normal quantile 1.95996 for large df (common practice)', () => {
    expect(tQuantile(0.025, 7)).toBeCloseTo(-tQuantile(0.975, 7), 12);
    expect(tQuantile(0.5, 5)).toBeCloseTo(0, 12);
    expect(tQuantile(0.975, 1e6)).toBeCloseTo(1.959964, 4);
  });

  it('returns NaN for impossible arguments', () => {
    expect(tQuantile(1.2, 3)).toBeNaN();
    expect(tQuantile(0.5, 0)).toBeNaN();
  });
});
