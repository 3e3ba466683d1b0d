import { describe, expect, it } from 'vitest';
import { featuresSweep } from '../../src/simulate/featuresSweep.js';
import { planJobs, planSweep, simulatedRunId } from '../../src/simulate/planSweep.js';
import { epochGrid } from '../../src/simulate/epochGrid.js';
import type { PlanCsvRun } from '../../src/plan/parsePlanCsv.js';
import type { RowTable } from '../../src/store/RowTable.js';

const preset = { seeds: 1, widths: [1], trainSizes: [2], labelNoise: [0], epochsPerDecade: 4, testSize: 300, measureTime: false };
const run = (over: Partial<PlanCsvRun>): PlanCsvRun => ({ line: 2, run: '', condition: '', width: 24, train_size: 40, label_noise: 0.1, seed: 0, epochs: 1000, resume_from: null, ...over });
const rowsOf = (t: RowTable, id: string) => {
  const out: { epochs: number; test_error: number; test_loss: number; train_error: number }[] = [];
  for (let i = 0; i < t.length; i++) if (t.run[i] === id) out.push({ epochs: t.epochs[i], test_error: t.test_error[i], test_loss: t.test_loss[i], train_error: t.train_error[i] });
  return out;
};

describe('planSweep (simulate --plan)', () => {
  it('a planned run is the run simulate gives in a sweep holding it (nested streams), under the plan or simulator id', () => {
    // The full sweep: widths 8–64, both noise levels, seeds 0–1.
    const full = featuresSweep({ ...preset, seeds: 2, widths: [8, 24, 40, 64], trainSizes: [40], labelNoise: [0.1, 0.2], maxEpochs: 1000 });
    const t = planSweep({ runs: [run({ run: 'mine' }), run({ width: 64, seed: 1, label_noise: 0.2 })], preset });
    expect(new Set(t.run)).toEqual(new Set(['mine', simulatedRunId('rf', { seed: 1, train_size: 40, width: 64, label_noise: 0.2 })]));
    for (const [id, ref] of [['mine', 'rf-s0-n40-w24-q0.1'], ['rf-s1-n40-w64-q0.2', 'rf-s1-n40-w64-q0.2']]) {
      const a = rowsOf(t, id), b = rowsOf(full, ref);
      expect(a.map((r) => r.epochs)).toEqual(epochGrid({ max: 1000, perDecade: 4 }));
      expect(a.map((r) => r.test_error)).toEqual(b.map((r) => r.test_error));
      a.forEach((r, k) => expect(r.test_loss).toBeCloseTo(b[k].test_loss, 9));
    }
    // Only the planned (width, noise) pairs: the job computes 24 and 64 at both noise levels.
    expect(t.length).toBe(2 * epochGrid({ max: 1000, perDecade: 4 }).length);
  });

  it('resume_from continues the curve: exactly the epochs after it, as the whole run has them', () => {
    const whole = planSweep({ runs: [run({ run: 'r', epochs: 4000 })], preset });
    const resumed = planSweep({ runs: [run({ run: 'r', epochs: 4000, resume_from: 1000 })], preset });
    const w = rowsOf(whole, 'r'), r = rowsOf(resumed, 'r');
    expect(r.map((x) => x.epochs)).toEqual(w.filter((x) => x.epochs > 1000).map((x) => x.epochs));
    expect(r.map((x) => x.test_error)).toEqual(w.filter((x) => x.epochs > 1000).map((x) => x.test_error));
    // The planned target is always logged, even off the log-spaced grid.
    expect(rowsOf(planSweep({ runs: [run({ run: 'x', epochs: 777 })], preset }), 'x').at(-1)!.epochs).toBe(777);
  });

  it('groups work by seed, train size and target epochs; re-running a plan gives the same rows', () => {
    const runs = [run({}), run({ width: 8 }), run({ seed: 1 }), run({ train_size: 60 }), run({ epochs: 10 })];
    expect(planJobs({ runs, preset }).map((j) => [j.task.seed, j.task.trainSize, j.options.widths])).toEqual([
      [0, 40, [8, 24]], [1, 40, [24]], [0, 60, [24]], [0, 40, [24]],
    ]);
    const a = planSweep({ runs, preset });
    const b = planSweep({ runs, preset });
    expect(Array.from(a.test_error)).toEqual(Array.from(b.test_error));
    expect(a.run).toEqual(b.run);
  });
});
