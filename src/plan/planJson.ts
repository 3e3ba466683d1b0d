import type { PlannedRun, PlanResult } from './Plan.js';
import type { CostModel } from './costModel.js';
import { roundCost } from './planCsv.js';

/** `plan --json` (docs/schemas/plan.schema.json). */
export interface PlanJson {
  budget: number | null;
  /** Cap on the number of runs (--max-runs); null when none. */
  max_runs: number | null;
  cost: number;
  units: CostModel['units'];
  model: Pick<CostModel, 'a' | 'c' | 'exponentFitted' | 'runs' | 'aSe' | 'spread'>;
  dropped: { runs: number; cost: number };
  notes: string[];
  runs: Omit<PlannedRun, 'score'>[];
}

/** `plan --json` (DESIGN.md §6): {"budget","cost","runs":[{...axes,"seed","epochs","reason","cost"}]} plus the cost model. */
export function planJson(plan: PlanResult): PlanJson {
  const { model } = plan;
  return {
    budget: plan.budget,
    max_runs: plan.maxRuns ?? null,
    cost: roundCost(plan.cost),
    units: model.units,
    model: { a: model.a, c: model.c, exponentFitted: model.exponentFitted, runs: model.runs, aSe: model.aSe, spread: model.spread },
    dropped: { runs: plan.dropped.runs, cost: roundCost(plan.dropped.cost) },
    notes: plan.notes,
    runs: plan.runs.map((r) => ({
      condition: r.condition,
      width: r.width,
      train_size: r.train_size,
      label_noise: r.label_noise,
      seed: r.seed,
      epochs: r.epochs,
      reason: r.reason,
      cost: roundCost(r.cost),
      resume_from: r.resume_from,
      run: r.run,
      status: r.status,
      why: r.why,
      ...(r.sharpens ? { sharpens: r.sharpens } : {}),
    })),
  };
}
