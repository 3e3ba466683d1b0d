import { composePlan } from '../plan/composePlan.js';
import type { ComposePlanOptions } from '../plan/composePlan.js';
import { planJson } from '../plan/planJson.js';
import type { PlanJson } from '../plan/planJson.js';
import { rowsOf } from './rowsOf.js';
import type { RowsInput } from './rowsOf.js';
import { specOf } from './specOf.js';
import type { SpecInput } from './specOf.js';

export interface PlanOptions extends Omit<ComposePlanOptions, 'table' | 'spec'> {
  spec: SpecInput;
}

/**
 * The next runs to launch, as `datlas plan --json`: missing and partial runs first, then new
 * widths bisecting uncertain ridge points and extra seeds where a peak or hurts segment is
 * borderline, ranked by value per cost and cut to the budget.
 */
export function planRuns(rows: RowsInput, opts: PlanOptions): PlanJson {
  const { spec, ...rest } = opts;
  return planJson(composePlan({ ...rest, table: rowsOf(rows), spec: specOf(spec) }).plan);
}
