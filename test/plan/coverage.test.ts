import { describe, expect, it } from 'vitest';
import { coverage } from '../../src/plan/coverage.js';
import { gapGroups } from '../../src/plan/gapGroups.js';
import { fitCostModel } from '../../src/plan/costModel.js';
import { planRuns } from '../../src/plan/planRuns.js';
import { storeRuns } from '../../src/plan/storeRuns.js';
import { key, spec, storeFor } from './fixtures.js';
import { tableFromRows, tableToRows } from '../../src/store/tableFromRows.js';

const run = (width: number, train_size: number, label_noise: number, seed: number, condition = 'adam') => ({ condition, width, train_size, label_noise, seed });

const removed = [run(64, 4000, 0.2, 2), run(128, 4000, 0.2, 2), run(256, 4000, 0.2, 2), run(8, 1000, 0, 0)];
const truncated = [{ run: run(16, 1000, 0.2, 1), at: 100 }, { run: run(32, 4000, 0, 0), at: 10 }];
const diverged = [run(256, 1000, 0.2, 0)];
const extra = [run(512, 1000, 0, 0), run(8, 1000, 0, 7), run(8, 1000, 0, 0, 'sgd')];
const table = storeFor(spec, { removed, truncated, diverged, extra });

describe('coverage', () => {
  const cov = coverage(table, spec);

  it('lists exactly the removed, truncated and diverged runs', () => {
    const byStatus = (s: string) => cov.runs.filter((r) => r.status === s).map(key).sort();
    expect(byStatus('missing')).toEqual(removed.map(key).sort());
    expect(byStatus('partial')).toEqual(truncated.map((t) => key(t.run)).sort());
    expect(byStatus('diverged')).toEqual(diverged.map(key).sort());
    expect(cov.counts).toEqual({ complete: 6 * 2 * 2 * 3 - 7, partial: 2, missing: 4, diverged: 1 });
    expect(cov.runs.find((r) => key(r) === key(truncated[0].run))!.epoch).toBe(100);
  });

  it('lists store runs outside the spec as extra, naming what is outside', () => {
    expect(cov.extra.map((e) => e.outside)).toEqual([['width'], ['seed'], ['condition']]);
  });

  it('keeps the better of two runs for one planned run', () => {
    // A relaunch of the truncated run that finished supersedes it.
    const again = storeFor(spec, { removed, truncated, diverged });
    const relaunch = storeFor({ ...spec, axes: { width: [16], train_size: [1000], label_noise: [0.2] }, seeds: [1] });
    const merged = tableFromRows([...tableToRows(again), ...tableToRows(relaunch).map((r) => ({ ...r, run: `${r.run}-again` }))]);
    const c2 = coverage(merged, spec);
    expect(c2.counts.partial).toBe(1);
    expect(c2.superseded).toBe(1);
  });

  it('groups gaps compactly: widths × train sizes sharing the same seeds', () => {
    const groups = gapGroups(cov, spec);
    const g = groups.find((x) => x.status === 'missing' && x.label_noise === 0.2)!;
    expect(g).toMatchObject({ widths: [64, 128, 256], trainSizes: [4000], seeds: [2], count: 3 });
    expect(groups.filter((x) => x.status === 'missing')).toHaveLength(2);
    const p = groups.find((x) => x.status === 'partial' && x.label_noise === 0)!;
    expect(p).toMatchObject({ widths: [32], trainSizes: [4000], seeds: [0], epochRange: [10, 10] });
    // Every gap appears in exactly one group.
    expect(groups.reduce((s, x) => s + x.count, 0)).toBe(7);
  });

  it("puts exactly the gaps first in the plan, resumes partial runs from their last epoch", () => {
    const model = fitCostModel({ runs: storeRuns(table), reference: { width: 8, train_size: 1000, epochs: 1000 } });
    const plan = planRuns({ spec, coverage: cov, model });
    const gaps = [...removed, ...truncated.map((t) => t.run), ...diverged].map(key).sort();
    expect(plan.runs.slice(0, gaps.length).map(key).sort()).toEqual(gaps);
    const r = plan.runs.find((x) => key(x) === key(truncated[1].run))!;
    expect(r).toMatchObject({ reason: 'resume', resume_from: 10, epochs: 1000 });
    // Relative units: 1 = one run of the reference (width 8, n 1000, 1000 epochs); a = 2.
    expect(r.cost).toBeCloseTo((32 / 8) ** 2 * 4 * (990 / 1000), 10);
    expect(plan.runs.find((x) => key(x) === key(diverged[0]))).toMatchObject({ reason: 'missing', status: 'diverged' });
    const noResume = planRuns({ spec, coverage: cov, model, resume: false });
    expect(noResume.runs.find((x) => key(x) === key(truncated[1].run))).toMatchObject({ reason: 'missing', resume_from: null });
    const skip = planRuns({ spec, coverage: cov, model, rerunDiverged: false });
    expect(skip.runs).toHaveLength(6);
  });

  it('cuts the ranked list to the budget, keeping cheaper later runs that still fit', () => {
    const model = fitCostModel({ runs: [], reference: { width: 8, train_size: 1000, epochs: 1000 } });
    const all = planRuns({ spec, coverage: cov, model });
    const budget = 20;
    const cut = planRuns({ spec, coverage: cov, model, budget });
    expect(cut.cost).toBeLessThanOrEqual(budget);
    expect(cut.runs.length).toBeLessThan(all.runs.length);
    expect(cut.runs.length + cut.dropped.runs).toBe(all.runs.length);
    expect(cut.cost + cut.dropped.cost).toBeCloseTo(all.cost, 9);
    // Greedy by rank: nothing dropped would still fit.
    const droppedCosts = all.runs.filter((r) => !cut.runs.some((k) => key(k) === key(r))).map((r) => r.cost);
    for (const c of droppedCosts) expect(cut.cost + c).toBeGreaterThan(budget);
  });
});
