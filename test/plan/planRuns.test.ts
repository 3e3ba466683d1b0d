import { describe, expect, it } from 'vitest';
import { coverage } from '../../src/plan/coverage.js';
import { fitCostModel } from '../../src/plan/costModel.js';
import { planRuns } from '../../src/plan/planRuns.js';
import type { Candidate } from '../../src/plan/refine.js';
import { spec, storeFor } from './fixtures.js';

const group = (width: number, value: number, seeds = [0, 1, 2]): Candidate => ({
  reason: 'refine',
  value,
  why: `w${width}`,
  runs: seeds.map((seed) => ({ condition: 'adam', label_noise: 0.2, train_size: 1000, width, seed })),
});

describe('planRuns ranking', () => {
  const cov = coverage(storeFor(spec), spec);
  // Relative units, a = 2: a run at width w, n 1000, target epochs costs (w / 8)².
  const model = fitCostModel({ runs: [], reference: { width: 8, train_size: 1000, epochs: spec.epochs } });

  it('orders refinement groups by value per cost and keeps each group whole', () => {
    const plan = planRuns({ spec, coverage: cov, model, candidates: [group(64, 3), group(12, 1), group(24, 1)] });
    // value / cost: w12 → 1 / (3 · 2.25); w24 → 1 / (3 · 9); w64 → 3 / (3 · 64).
    expect(plan.runs.map((r) => r.width)).toEqual([12, 12, 12, 24, 24, 24, 64, 64, 64]);
    expect(plan.runs[0].cost).toBeCloseTo(2.25, 12);
    expect(plan.runs[0].score).toBeCloseTo(1 / 6.75, 12);
    expect(plan.cost).toBeCloseTo(3 * (2.25 + 9 + 64), 9);
  });

  it('skips a group that no longer fits the budget and takes a cheaper later one', () => {
    // w16 has the best value per cost but 3 · 4 = 12 > 10; w12 (3 · 2.25 = 6.75) fits.
    const plan = planRuns({ spec, coverage: cov, model, candidates: [group(16, 100), group(12, 1)], budget: 10 });
    expect(plan.runs.map((r) => r.width)).toEqual([12, 12, 12]);
    expect(plan.dropped).toEqual({ runs: 3, cost: 12 });
  });
});
