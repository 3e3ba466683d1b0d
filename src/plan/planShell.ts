import { fillTemplate, placeholderValues } from './commandTemplate.js';
import type { CommandTemplate } from './commandTemplate.js';
import type { PlanResult } from './Plan.js';
import { roundCost } from './planCsv.js';
import { shellQuote } from './shellQuote.js';
import { exportRuns } from './exportRuns.js';

/**
 * A bash script with one command per planned run, in plan order: the template with each
 * placeholder replaced by its value quoted as one shell word. No two lines are the same command:
 * a template that leaves out a varying setting is refused (see exportRuns).
 */
export function planShell(opts: { plan: PlanResult; template: CommandTemplate; allowCollapse?: boolean }): string {
  const { template } = opts;
  const { plan } = exportRuns(opts);
  const head = [
    '#!/usr/bin/env bash',
    `# ${plan.runs.length} runs planned by datlas plan; total cost ${roundCost(plan.cost)} ${plan.model.units === 'seconds' ? 'seconds (fitted)' : '(relative units)'}.`,
    '# Placeholders are filled with shell-quoted values: do not quote them again in the template.',
    'set -euo pipefail',
  ];
  const body = plan.runs.map((r, i) => fillTemplate(template, placeholderValues(r, i), (v) => shellQuote(v)));
  return [...head, ...body].join('\n') + '\n';
}
