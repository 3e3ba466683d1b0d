import { csvLine } from './csvCell.js';
import type { PlanResult } from './Plan.js';

/** Columns of the plan CSV, in order (the Slurm script finds them by name). */
export const PLAN_CSV_COLUMNS = [
  'index', 'run', 'condition', 'width', 'train_size', 'label_noise', 'seed', 'epochs', 'resume_from', 'reason', 'cost', 'why', 'sharpens',
] as const;

/** The plan as CSV (RFC 4180, CRLF line endings, spreadsheet-inert text cells), one run per line after the header. */
export function planCsv(plan: PlanResult): string {
  const lines = [csvLine([...PLAN_CSV_COLUMNS])];
  plan.runs.forEach((r, i) => {
    lines.push(
      csvLine([i, r.run, r.condition, r.width, r.train_size, r.label_noise, r.seed, r.epochs, r.resume_from, r.reason, roundCost(r.cost), r.why, r.sharpens ?? '']),
    );
  });
  return lines.join('\r\n') + '\r\n';
}

/** Costs to 4 significant digits: enough to rank, and no false precision in a cost model. */
export function roundCost(v: number): number {
  return Number(v.toPrecision(4));
}
