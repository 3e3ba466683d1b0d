import { describe, expect, it } from 'vitest';
import { findHurts } from '../../src/analysis/findHurts.js';
import { findRidge } from '../../src/analysis/findRidge.js';
import { buildCells } from '../../src/cells/buildCells.js';
import { buildMap } from '../../src/grid/buildMap.js';
import { linearSweep } from '../../src/simulate/linearSweep.js';

// Linear-Gaussian sweeps whose risk has an exact formula (REFERENCES §1, Belkin, Hsu & Xu 2019,
// Thm 1): σ² = 0.25, ‖β‖² = 1, minimum-norm least squares. Grids keep |p − n| >= 4, where the
// risk's variance is finite (REFERENCES §1).
const NS = [30, 50, 70, 85, 96, 104, 120, 150, 200, 300];
const PS = [20, 40, 60, 80, 96, 104, 120, 150, 200];

/** Exact risk, sample-wise with p = D = 100 (REFERENCES §1 formulas, ‖β_Tc‖² = 0). */
function riskSampleWise(n: number, p = 100, s2 = 0.25): number {
  return n <= p - 2 ? (1 - n / p) + s2 * (1 + n / (p - n - 1)) : s2 * ((n - 1) / (n - p - 1));
}

describe('ridge and hurts on linear-Gaussian sweeps', () => {
  // 20 seeds: test loss is heavy-tailed next to n = p (REFERENCES §4), and more seeds near the
  // threshold is the usual advice (REFERENCES §5); with 12 one of 8 seed sets missed the check.
  it('sample-wise, p = 100: the hurts segment peaks within one grid step of n = p, with its onset below', () => {
    const table = linearSweep({ seeds: 20, widths: [100], trainSizes: NS, dims: 100, sigma2: 0.25, signal: 1 });
    const res = findHurts(buildCells(table, { metric: 'test_loss' }));
    expect(res.segments.length).toBeGreaterThanOrEqual(1);
    const s = res.segments[0];
    const iPeak = NS.indexOf(s.peak);
    expect(Math.min(Math.abs(iPeak - NS.indexOf(96)), Math.abs(iPeak - NS.indexOf(104)))).toBeLessThanOrEqual(1);
    expect(s.onset).toBeLessThan(100);
    // Below p the exact risk is lowest at n = 50 on this grid (1.059, 1.005, 1.153 at n = 30, 50, 70):
    // "between n = 50 and n ≈ p, more data hurts" (REFERENCES §1).
    expect(riskSampleWise(50)).toBeCloseTo(1.0051, 3);
    expect([30, 50]).toContain(s.onset);
    expect(s.p).toBeLessThan(0.05);
    // It recovers: the exact risk falls back below the n = 50 level between n = 120 (1.5658·…) and 200 (0.5025).
    expect(s.recovery).not.toBeNull();
    expect(s.recovery!).toBeGreaterThan(104);
    expect(s.recovery!).toBeLessThan(200);
  });

  it('model-wise, n = 100: the ridge peak sits within one grid step of p = n', () => {
    const table = linearSweep({ seeds: 8, widths: PS, trainSizes: [100], dims: 200, sigma2: 0.25, signal: 1 });
    const map = buildMap(table, { kind: 'model', metric: 'test_loss', method: 'linear', raster: { nx: 8, ny: 8 } });
    const ridge = findRidge(map, { boot: 500 });
    expect(ridge.rows).toHaveLength(1);
    const pk = ridge.rows[0].peak;
    expect(pk).not.toBeNull();
    expect(pk!.x).toBeGreaterThanOrEqual(80);
    expect(pk!.x).toBeLessThanOrEqual(120);
    expect(pk!.low).toBeGreaterThanOrEqual(80);
    expect(pk!.high).toBeLessThanOrEqual(120);
  });

  it('with optimal ridge regularisation no significant peak and no hurts segment is reported', () => {
    // Optimally tuned ridge makes the risk monotone (REFERENCES §2; Nakkiran, Venkat, Kakade & Ma 2020).
    const model = linearSweep({ seeds: 8, widths: PS, trainSizes: [100], dims: 200, ridge: 'optimal' });
    const map = buildMap(model, { kind: 'model', metric: 'test_loss', method: 'linear', raster: { nx: 8, ny: 8 } });
    expect(findRidge(map, { boot: 100 }).rows.every((r) => r.peak === null)).toBe(true);
    const sample = linearSweep({ seeds: 20, widths: [100], trainSizes: NS, dims: 100, ridge: 'optimal' });
    expect(findHurts(buildCells(sample, { metric: 'test_loss' })).segments).toEqual([]);
  });
});
