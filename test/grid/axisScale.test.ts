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
