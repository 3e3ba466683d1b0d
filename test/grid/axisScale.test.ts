import { describe, expect, it } from 'vitest';
import { cellEdges, detectScale, fromScale, toScale } from '../../src/grid/axisScale.js';

describe('axis scales', () => {
  it('detects geometric spacing as log2 and the rest as linear (DESIGN.md §5; common practice for sweep axes)', () => {
    expect(detectScale([4, 8, 16, 32, 64])).toBe('log2');
    expect(detectScale([1, 2, 5, 10, 20, 50, 100, 1000])).toBe('log2');
    expect(detectScale([1000, 4000])).toBe('log2');
    expect(detectScale([0, 0.1, 0.2, 0.3])).toBe('linear');
    expect(detectScale([100, 200, 300, 400, 500])).toBe('linear');
    expect(detectScale([0, 1, 10, 100])).toBe('linear');
    expect(detectScale([5])).toBe('linear');
  });

  it('puts log2 cell edges at geometric midpoints, linear ones at arithmetic midpoints', () => {
    const e = cellEdges('log2', [4, 16, 64]);
    // Geometric midpoint of 4 and 16 is 8; outer edges half a step (factor 2) outside.
    [2, 8, 32, 128].forEach((v, k) => expect(e[k]).toBeCloseTo(v, 12));
    const lin = cellEdges('linear', [0, 0.1, 0.3]);
    [-0.05, 0.05, 0.2, 0.4].forEach((v, k) => expect(lin[k]).toBeCloseTo(v, 12));
    const one = cellEdges('log2', [16]);
    expect(one[0]).toBeCloseTo(16 / Math.SQRT2, 12);
    expect(one[1]).toBeCloseTo(16 * Math.SQRT2, 12);
  });

  it('transforms round-trip', () => {
    expect(fromScale('log2', toScale('log2', 48))).toBeCloseTo(48, 12);
    expect(toScale('linear', 0.2)).toBe(0.2);
  });
});

describe('cell edges at the ends of the double range', () => {
  // IEEE 754 binary64: the largest finite double is about 1.798e308 and the smallest positive
  // (subnormal) one 5e-324 (from memory; Number.MAX_VALUE and Number.MIN_VALUE in ECMA-262).
  const cases: [string, 'log2' | 'linear', number[]][] = [
    ['widths up to 1e308 on a log2 axis', 'log2', [1e306, 1e307, 1e308]],
    ['1 and 1e308 (an outer edge past the largest double)', 'log2', [1, 1e308]],
    ['5e-324 on a log2 axis (an outer edge below the smallest double)', 'log2', [5e-324, 1e-323, 4]],
    ['near the largest double on a linear axis', 'linear', [1.2e308, 1.5e308, 1.7e308]],
    ['both ends of the range on a linear axis', 'linear', [-1.7e308, 1.7e308]],
    ['one value at 1e308', 'log2', [1e308]],
  ];
  for (const [name, scale, values] of cases) {
    it(`${name}: every edge finite, increasing, positive on log2`, () => {
      const e = cellEdges(scale, values);
      expect(e).toHaveLength(values.length + 1);
      for (const v of e) expect(Number.isFinite(v)).toBe(true);
      for (let k = 1; k < e.length; k++) expect(e[k]).toBeGreaterThanOrEqual(e[k - 1]);
      if (scale === 'log2') for (const v of e) expect(v).toBeGreaterThan(0);
      // Interior edges still lie between their neighbours.
      for (let k = 1; k < values.length; k++) {
        expect(e[k]).toBeGreaterThanOrEqual(values[k - 1]);
        expect(e[k]).toBeLessThanOrEqual(values[k]);
      }
    });
  }
});
