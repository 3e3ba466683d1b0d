import { describe, expect, it } from 'vitest';
import { localPeaks } from '../../src/analysis/localPeaks.js';

describe('localPeaks', () => {
  // Reference: scipy 1.10.1 scipy.signal.find_peaks + peak_prominences on the same arrays
  // (peaks [2,4,6,8], prominences [0.03,0.15,0.03,0.05], left bases [1,1,5,7], right bases [3,9,9,9]).
  it('finds interior maxima with the topographic prominence scipy reports', () => {
    const y = [0.5, 0.3, 0.35, 0.32, 0.45, 0.41, 0.44, 0.2, 0.25, 0.1];
    const p = localPeaks(y);
    expect(p.map((q) => q.index)).toEqual([2, 4, 6, 8]);
    p.forEach((q, i) => expect(q.prominence).toBeCloseTo([0.03, 0.15, 0.03, 0.05][i], 12));
    expect(p.map((q) => q.leftBase)).toEqual([1, 1, 5, 7]);
    expect(p.map((q) => q.rightBase)).toEqual([3, 9, 9, 9]);
    // The global maximum sits at the left edge (an under-fitted small model): never a peak.
    expect(p.some((q) => q.index === 0)).toBe(false);
  });

  it('handles plateaus (scipy puts the peak mid-plateau; we keep its first index) with the same prominences', () => {
    // scipy: peaks [1,5,8], prominences [1,4,3]
    const p = localPeaks([1, 3, 3, 2, 5, 5, 5, 1, 4, 0]);
    expect(p.map((q) => q.index)).toEqual([1, 4, 8]);
    expect(p.map((q) => q.prominence)).toEqual([1, 4, 3]);
  });

  it('admits a rise still going at the last point only when asked', () => {
    expect(localPeaks([0.3, 0.2, 0.25, 0.4])).toEqual([]);
    const p = localPeaks([0.3, 0.2, 0.25, 0.4], { allowRightEnd: true });
    expect(p).toHaveLength(1);
    expect(p[0]).toMatchObject({ index: 3, leftBase: 1, rightBase: -1, keyBase: 1 });
    expect(p[0].prominence).toBeCloseTo(0.2, 12);
  });

  it('finds nothing in monotone or U-shaped sequences', () => {
    expect(localPeaks([5, 4, 3, 2, 1])).toEqual([]);
    expect(localPeaks([5, 3, 2, 3, 5])).toEqual([]);
    expect(localPeaks([1, 1, 1, 1])).toEqual([]);
  });
});
