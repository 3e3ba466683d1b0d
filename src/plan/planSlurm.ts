import { UserError } from '../UserError.js';
import { planText as msg } from '../messages.js';
import { fillTemplate } from './commandTemplate.js';
import type { CommandTemplate } from './commandTemplate.js';
import type { PlanResult } from './Plan.js';
import { PLAN_CSV_COLUMNS } from './planCsv.js';
import { exportRuns } from './exportRuns.js';

/**
 * A Slurm job-array script: task k reads line k + 2 of the plan CSV (line 1 is the header),
 * parses it (RFC 4180 quoting, spreadsheet guard undone), and runs the template with the
 * placeholders bound to that run's values as quoted shell variables, so no value is ever
 * re-read as shell code. `#SBATCH --array=0-N%P` runs at most P tasks at once. The plan CSV must
 * hold `exportRuns(opts).plan` (no two tasks run the same command; see exportRuns).
 */
export function planSlurm(opts: {
  plan: PlanResult;
  template: CommandTemplate;
  csvPath: string;
  maxParallel: number;
  jobName?: string;
  sbatch?: string[];
  allowCollapse?: boolean;
}): string {
  const { template, csvPath, maxParallel, jobName = 'datlas-plan', sbatch = [] } = opts;
  if (opts.plan.runs.length === 0) throw new UserError(msg.slurmEmpty());
  const { plan } = exportRuns(opts);
  for (const r of plan.runs)
    for (const v of [r.condition, r.run]) if (/[\r\n]/.test(v)) throw new UserError(msg.slurmLineBreak(v));
  const n = plan.runs.length;
  const command = fillTemplate(template, null, (_v, name) => `"\${P_${name}}"`);
  const columns = PLAN_CSV_COLUMNS.filter((c) => c !== 'why');
  return [
    '#!/usr/bin/env bash',
    `#SBATCH --job-name=${jobName.replace(/[^A-Za-z0-9_.-]/g, '_')}`,
    `#SBATCH --array=0-${n - 1}%${Math.max(1, Math.min(maxParallel, n))}`,
    ...sbatch.map((s) => `#SBATCH ${s}`),
    `# ${n} runs planned by datlas plan. Task k runs line k + 2 of the plan CSV (line 1 is its header).`,
    '# Try one task locally: SLURM_ARRAY_TASK_ID=0 bash THIS_FILE',
    'set -euo pipefail',
    `PLAN_CSV="\${PLAN_CSV:-${csvPath.replace(/[\\"$`]/g, '\\$&')}}"`,
    'TASK="${SLURM_ARRAY_TASK_ID:?run with sbatch (job array) or set SLURM_ARRAY_TASK_ID}"',
    '',
    '# Splits one RFC 4180 CSV line into FIELDS (quoted fields, doubled quotes).',
    'parse_csv_line() {',
    "  local text=$1 field='' c i=0 inq=0 n",
    '  n=${#text}',
    '  FIELDS=()',
    '  while [ "$i" -lt "$n" ]; do',
    '    c=${text:i:1}',
    '    if [ "$inq" -eq 1 ]; then',
    '      if [ "$c" = \'"\' ]; then',
    '        if [ "${text:i+1:1}" = \'"\' ]; then field+=\'"\'; i=$((i + 1)); else inq=0; fi',
    '      else field+=$c; fi',
    '    elif [ "$c" = \'"\' ]; then inq=1',
    '    elif [ "$c" = , ]; then FIELDS+=("$field"); field=\'\'',
    '    else field+=$c; fi',
    '    i=$((i + 1))',
    '  done',
    '  FIELDS+=("$field")',
    '}',
    '',
    "# Undoes the spreadsheet guard: one apostrophe before = + - @ tab CR (after any apostrophes).",
    'uninert() {',
    '  local v=$1 s=$1',
    "  while [ \"${s:0:1}\" = \"'\" ]; do s=${s:1}; done",
    "  if [ \"${v:0:1}\" = \"'\" ]; then",
    "    case ${s:0:1} in [=+@-]|$'\\t'|$'\\r') v=${v:1} ;; esac",
    '  fi',
    "  printf '%s' \"$v\"",
    '}',
    '',
    '# Header (line 1) and this task\'s line (TASK + 2), read with bash alone.',
    "header='' line='' k=0",
    'while IFS= read -r l || [ -n "$l" ]; do',
    '  if [ "$k" -eq 0 ]; then header=$l; elif [ "$k" -eq $((TASK + 1)) ]; then line=$l; break; fi',
    '  k=$((k + 1))',
    'done < "$PLAN_CSV"',
    "header=${header%$'\\r'}; line=${line%$'\\r'}",
    'if [ -z "$line" ]; then echo "datlas plan: no run $TASK in $PLAN_CSV" >&2; exit 1; fi',
    'parse_csv_line "$header"; names=("${FIELDS[@]}")',
    'parse_csv_line "$line"',
    'declare -A col=()',
    'for j in "${!names[@]}"; do col[${names[$j]}]=$j; done',
    `for name in ${columns.join(' ')}; do`,
    '  if [ -z "${col[$name]+x}" ]; then echo "datlas plan: column $name missing in $PLAN_CSV" >&2; exit 1; fi',
    '  printf -v "P_$name" \'%s\' "$(uninert "${FIELDS[${col[$name]}]}")"',
    'done',
    '# A fresh run resumes from epoch 0 (as in the shell export).',
    'if [ -z "$P_resume_from" ]; then P_resume_from=0; fi',
    'if [ "$P_index" != "$TASK" ]; then echo "datlas plan: line $((TASK + 2)) of $PLAN_CSV is run $P_index, not $TASK" >&2; exit 1; fi',
    `echo "datlas plan: task $TASK: run $P_run (reason $P_reason)" >&2`,
    '',
    '# The command template (placeholders bound to the variables above):',
    command,
    '',
  ].join('\n');
}
