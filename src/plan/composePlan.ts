import type { RowTable } from '../store/RowTable.js';
import { planText } from '../messages.js';
import { fitCostModel } from './costModel.js';
import { coverage } from './coverage.js';
import type { CoverageResult } from './coverage.js';
import { parseBudget } from './parseBudget.js';
import type { PlanResult } from './Plan.js';
import { planRuns } from './planRuns.js';
import { proposeRefinements } from './refine.js';
import type { Candidate } from './refine.js';
import { storeRuns } from './storeRuns.js';
import type { SweepSpec } from './SweepSpec.js';

export interface ComposePlanOptions {
  table: RowTable;
  spec: SweepSpec;
  /** Cost cap: a number in the cost model's units, or a time (`48h`) when wall time is logged. */
  budget?: number | string | null;
  /** Cap on the number of runs (alone: refinement ranks by value per run); null or undefined: none. */
  maxRuns?: number | null;
  /** Propose new widths and seeds from the ridge and hurts analyses (default true). */
  refine?: boolean;
  /** Octaves within which a ridge point counts as located and refining stops (default 0.25). */
  resolution?: number;
  /** Partial runs resume from their last epoch (default true). */
  resume?: boolean;
  /** Re-launch diverged runs (default true). */
  rerunDiverged?: boolean;
}

/** `datlas plan`'s composition: coverage against the spec, the cost model, refinements, then the ranked, budgeted runs. */
export function composePlan(opts: ComposePlanOptions): { plan: PlanResult; coverage: CoverageResult } {
  const { table, spec, refine = true, resolution = 0.25, maxRuns = null, resume = true, rerunDiverged = true } = opts;
  const cov = coverage(table, spec);
  const model = fitCostModel({
    runs: storeRuns(table),
    reference: { width: spec.axes.width[0], train_size: spec.axes.train_size[0], epochs: spec.epochs },
  });
  const budget = parseBudget(opts.budget, model);
  let candidates: Candidate[] = [];
  const notes: string[] = [];
  if (refine && table.length > 0) {
    const ref = proposeRefinements({ table, spec, resolution });
    candidates = ref.candidates;
    if (ref.peaks.length) notes.push(planText.refinePeaks(ref.peaks.length, ref.peaks.filter((p) => p.significant).length));
    // The stop rule, or how far the slices are from it.
    const count = (st: string) => ref.slices.filter((x) => x.status === st).length;
    if (ref.done) notes.push(planText.stopLocated(count('located'), ref.slices.length, resolution, count('no-peak')));
    else if (ref.slices.length) notes.push(planText.refineStatus(count('located'), count('refining'), count('no-peak'), resolution));
    notes.push(...ref.notes);
  }
  const plan = planRuns({ spec, coverage: cov, model, candidates, budget, maxRuns, resume, rerunDiverged });
  plan.notes.push(...notes);
  return { plan, coverage: cov };
}
