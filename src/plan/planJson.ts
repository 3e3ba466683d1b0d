import type { PlanResult } from './Plan.js';
import { roundCost } from './planCsv.js';

/** `plan --json` (DESIGN.md §6): {"budget","cost","runs":[{...axes,"seed","epochs","reason","cost"}]} plus the cost model. */
export function planJson(plan: PlanResult): Record<string, unknown> {
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
