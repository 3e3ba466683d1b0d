import { describe, expect, it } from 'vitest';
import { buildMap } from '../../src/grid/buildMap.js';
import type { SweepMap } from '../../src/grid/SweepMap.js';
import { linearSweep } from '../../src/simulate/linearSweep.js';

/**
 * Exact risk of minimum-norm least squares on the first p of D isotropic Gaussian features,
 * σ² included (Belkin, Hsu & Xu 2019, Theorem 1; p < n branch Breiman & Freedman 1983; REFERENCES §1).
 */
function exactRisk(n: number, p: number, D: number, signal: number, sigma2: number): number {
  const inT = (signal * p) / D;
  const outT = signal - inT;
  if (p <= n - 2) return ((outT + sigma2) * (n - 1)) / (n - p - 1);
  if (p >= n + 2) return inT * (1 - n / p) + (outT + sigma2) * (1 + n / (p - n - 1));
  return Infinity;
}

/** Cells whose 95% Student-t interval misses the exact risk. */
function misses(map: SweepMap, risk: (c: SweepMap['cells'][number]['cell']) => number) {
  return map.cells.filter(({ cell }) => !(cell.stats.low! <= risk(cell) && risk(cell) <= cell.stats.high!));
}

describe('maps of the linear-Gaussian simulator agree with the exact risk (REFERENCES §1)', () => {
  it('the risk formula reproduces the check values of REFERENCES §1', () => {
    // Belkin, Hsu & Xu 2019, Thm 1 — check values as listed in REFERENCES §1.
    expect(exactRisk(100, 50, 50, 1, 0.25)).toBeCloseTo(0.505102, 6);
    expect(exactRisk(100, 90, 90, 1, 0.25)).toBeCloseTo(2.75, 6);
    expect(exactRisk(100, 200, 200, 1, 0.25)).toBeCloseTo(1.002525, 6);
    expect(exactRisk(40, 20, 100, 1, 0.04)).toBeCloseTo(1.724211, 6);
    expect(exactRisk(40, 60, 100, 1, 0.04)).toBeCloseTo(1.566316, 6);
    expect(exactRisk(40, 80, 100, 1, 0.04)).toBeCloseTo(0.886154, 6);
    expect(exactRisk(40, 100, 100, 1, 0.04)).toBeCloseTo(0.667119, 6);
    expect(exactRisk(50, 100, 100, 1, 0.25)).toBeCloseTo(1.0051, 4);
    expect(exactRisk(120, 100, 100, 1, 0.25)).toBeCloseTo(1.5658, 4);
  });

  // 95% intervals each miss with probability 5%: over these 13 cells, more than 2 misses would
  // happen by chance with probability about 3% (binomial), so ≤ 2 is the criterion (common practice).
  let total = 0;
  let missed = 0;

  it('model map (x = width, n = 40, D = 100, σ² = 0.04): cell means within their intervals of the exact risk', () => {
    const table = linearSweep({ seeds: 24, widths: [10, 20, 60, 80, 100], trainSizes: [40], dims: 100, sigma2: 0.04, signal: 1, testSize: 2000 });
    const map = buildMap(table, { kind: 'model', metric: 'test_loss', raster: { nx: 16, ny: 16 } });
    expect(map.x.values).toEqual([10, 20, 60, 80, 100]);
    expect(map.cells.every((c) => c.cell.stats.n === 24)).toBe(true);
    const m = misses(map, (c) => exactRisk(40, c.width, 100, 1, 0.04));
    total += map.cells.length;
    missed += m.length;
    // The double-descent shape itself: risk at p = 60 (past n) above p = 100 (REFERENCES §1: 1.566 vs 0.667).
    const mean = (p: number) => map.cells.find((c) => c.x === p)!.cell.stats.mean;
    expect(mean(60)).toBeGreaterThan(mean(100));
    expect(m.length).toBeLessThanOrEqual(2);
  });

  it('sample map (x = train size, y = width, D = 100, σ² = 0.25): cell means within their intervals of the exact risk', () => {
    const table = linearSweep({ seeds: 24, widths: [20, 100], trainSizes: [50, 70, 120, 200], dims: 100, sigma2: 0.25, signal: 1, testSize: 2000 });
    const map = buildMap(table, { kind: 'sample', metric: 'test_loss', raster: { nx: 16, ny: 16 } });
    expect(map.cells).toHaveLength(8);
    const m = misses(map, (c) => exactRisk(c.train_size, c.width, 100, 1, 0.25));
    total += map.cells.length;
    missed += m.length;
    expect(total).toBe(13);
    expect(missed).toBeLessThanOrEqual(2);
  });
});
