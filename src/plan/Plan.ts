import type { CostModel } from './costModel.js';
import type { CoverageStatus } from './coverage.js';

/** Why a run is in the plan (DESIGN.md §6). */
export const PLAN_REASONS = ['missing', 'resume', 'refine', 'seeds'] as const;
export type PlanReason = (typeof PLAN_REASONS)[number];

export interface PlannedRun {
  condition: string;
  label_noise: number;
  width: number;
  train_size: number;
  seed: number;
  /** Target epochs of the run. */
  epochs: number;
  reason: PlanReason;
  /** Cost of this launch (the remaining epochs for a resume), in the model's units. */
  cost: number;
  /** Epoch to resume from (resume only), else null. */
  resume_from: number | null;
  /** Run id: the store's id for a resumed or re-launched run, else a generated one. */
  run: string;
  /** Coverage status of the planned run this replaces; 'new' for refinement and extra seeds. */
  status: CoverageStatus | 'new';
  /** Expected value per unit cost that ranked it (missing, resume and re-launches rank first). */
  score: number;
  /** One line on why: the gap, or the ridge point / hurts segment it sharpens. */
  why: string;
  /** The quantity a refinement run is expected to sharpen (refine.ts SHARPENS); absent for gaps. */
  sharpens?: string;
}

export interface PlanResult {
  budget: number | null;
  /** Cap on the number of runs kept; null: no cap. */
  maxRuns?: number | null;
  /** Total cost of the runs kept. */
  cost: number;
  model: CostModel;
  runs: PlannedRun[];
  /** Candidates left out by the budget or the run cap. */
  dropped: { runs: number; cost: number };
  /** Things the user should know (diverged runs re-launched, no ridge found, ...). */
  notes: string[];
}
