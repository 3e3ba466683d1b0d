import { planText } from '../messages.js';
import { usageError } from '../UserError.js';
import type { CostModel } from './costModel.js';

const UNIT_SECONDS: Record<string, number> = { s: 1, m: 60, h: 3600, d: 86400 };

/** A budget: a plain number in the model's units, or a time (90m, 48h, 2d) when costs are seconds. */
export function parseBudget(text: string | number | null | undefined, model: CostModel): number | null {
  if (text === undefined || text === null) return null;
  if (typeof text === 'number') {
    if (!(text >= 0)) throw usageError(planText.badBudget(String(text)));
    return text;
  }
  const m = /^\s*(\d+(?:\.\d*)?|\.\d+)(?:e([+-]?\d+))?\s*([smhd]?)\s*$/i.exec(String(text));
  if (!m) throw usageError(planText.badBudget(String(text)));
  const v = Number(m[1]) * 10 ** Number(m[2] ?? 0);
  const unit = m[3].toLowerCase();
  if (!unit) return v;
  if (model.units !== 'seconds') throw usageError(planText.budgetNeedsSeconds(String(text)));
  return v * UNIT_SECONDS[unit];
}
