import { usageError } from '../UserError.js';
import { planText as msg } from '../messages.js';
import { fillTemplate, placeholderValues } from './commandTemplate.js';
import type { CommandTemplate, Placeholder } from './commandTemplate.js';
import type { PlanResult } from './Plan.js';

/**
 * The placeholders that tell one planned run from another. {run} and {index} are ids, not
 * settings; {resume_from} only says where the same run restarts.
 */
export const RUN_SETTINGS = ['condition', 'width', 'train_size', 'label_noise', 'seed', 'epochs'] as const satisfies readonly Placeholder[];

export interface TemplateGap {
  /** Settings that vary among the planned runs but the template leaves out, with their values. */
  missing: { name: Placeholder; values: string[] }[];
  /** Runs whose filled command equals an earlier run's. */
  duplicates: number;
}

/** Which varying settings a template leaves out, and how many commands it would repeat. */
export function templateGap(plan: PlanResult, template: CommandTemplate): TemplateGap {
  const used = new Set(template.parts.flatMap((p) => ('name' in p ? [p.name] : [])));
  const missing: TemplateGap['missing'] = [];
  for (const name of RUN_SETTINGS) {
    if (used.has(name)) continue;
    const values = [...new Set(plan.runs.map((r, i) => placeholderValues(r, i)[name]))];
    if (values.length > 1) missing.push({ name, values });
  }
  const seen = new Set<string>();
  let duplicates = 0;
  plan.runs.forEach((r, i) => {
    const c = fillTemplate(template, placeholderValues(r, i), (v) => v);
    if (seen.has(c)) duplicates++;
    else seen.add(c);
  });
  return { missing, duplicates };
}

/**
 * The runs a shell or Slurm export may launch with this template. A template that leaves out a
 * setting that varies among the runs would launch several runs as the same job (or a job that
 * cannot know its setting): a usage error naming the settings, unless `allowCollapse`, which
 * keeps the first run of each distinct command (the user says the left-out settings do not
 * matter to their script).
 */
export function exportRuns(opts: { plan: PlanResult; template: CommandTemplate; allowCollapse?: boolean }): { plan: PlanResult; collapsed: number } {
  const { plan, template, allowCollapse = false } = opts;
  const gap = templateGap(plan, template);
  if (gap.missing.length && !allowCollapse) throw usageError(msg.templateDropsSettings(gap.missing, gap.duplicates, plan.runs.length));
  if (gap.duplicates === 0) return { plan, collapsed: 0 };
  const seen = new Set<string>();
  const runs = plan.runs.filter((r, i) => {
    const c = fillTemplate(template, placeholderValues(r, i), (v) => v);
    if (seen.has(c)) return false;
    seen.add(c);
    return true;
  });
  const cost = runs.reduce((s, r) => s + r.cost, 0);
  return { plan: { ...plan, runs, cost }, collapsed: plan.runs.length - runs.length };
}
