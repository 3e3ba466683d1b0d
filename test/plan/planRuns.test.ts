import { describe, expect, it } from 'vitest';
import { coverage } from '../../src/plan/coverage.js';
import { fitCostModel } from '../../src/plan/costModel.js';
import { planRuns } from '../../src/plan/planRuns.js';
import type { Candidate } from '../../src/plan/refine.js';
import { spec, storeFor } from './fixtures.js';

const group = (width: number, value: number, seeds = [0, 1, 2]): Candidate => ({
  reason: 'refine',
  sharpens: 'model-peak',
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

  it('--max-runs caps the number of runs; alone it ranks by value per run, with a budget by value per cost', () => {
    const cands = [group(64, 2, [0]), group(12, 1, [0]), group(24, 0.5, [0, 1])];
    // Per run: w64 → 2, w12 → 1, w24 → 0.25; two slots.
    const capped = planRuns({ spec, coverage: cov, model, candidates: cands, maxRuns: 2 });
    expect(capped.runs.map((r) => r.width)).toEqual([64, 12]);
    expect(capped.maxRuns).toBe(2);
    expect(capped.dropped.runs).toBe(2);
    // A group never splits: with three slots the two-run w24 group does not fit after w64 and w12.
    expect(planRuns({ spec, coverage: cov, model, candidates: cands, maxRuns: 3 }).runs.map((r) => r.width)).toEqual([64, 12]);
    // With a budget as well, value per cost decides (w12: 1 / 2.25 beats w64: 2 / 64), both caps hold.
    const both = planRuns({ spec, coverage: cov, model, candidates: cands, maxRuns: 1, budget: 1000 });
    expect(both.runs.map((r) => r.width)).toEqual([12]);
  });
});
