import { existsSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Argv } from 'yargs';
import type { CommandSpec } from './CommandSpec.js';
import { UserError, usageError } from '../UserError.js';
import { general, planText } from '../messages.js';
import { loadSpec, loadStore, writeOut, DEFAULT_STORE } from './coverage.js';
import type { CostModel } from '../plan/costModel.js';
import { formatNumber } from '../formatNumber.js';
import type { PlanResult } from '../plan/Plan.js';
import type { SweepSpec } from '../plan/SweepSpec.js';

const EMITS = ['csv', 'json', 'shell', 'slurm'] as const;
type Emit = (typeof EMITS)[number];

interface PlanArgs {
  spec?: string;
  store?: string;
  budget?: string;
  maxRuns?: number;
  emit?: Emit;
  command?: string;
  out?: string;
  init?: string;
  force: boolean;
  refine: boolean;
  skipDiverged: boolean;
  resolution: number;
  maxParallel: number;
  sbatch?: string[];
  limit: number;
  allowCollapse: boolean;
}

/** --budget: a plain number in the model's units, or a time (90m, 48h, 2d) when costs are seconds. */
export { parseBudget } from '../plan/parseBudget.js';

const sig = (v: number) => formatNumber(v);
const num = (v: number) => formatNumber(v, 4);

function describeModel(model: CostModel, spec: SweepSpec): string {
  if (model.units === 'relative')
    return planText.modelRelative(`width ${num(spec.axes.width[0])}, n ${num(spec.axes.train_size[0])}, ${num(spec.epochs)} epochs`);
  if (!model.exponentFitted) return planText.modelWidthOnly(model.runs, formatNumber(model.c));
  return planText.modelFitted(
    model.a.toFixed(2),
    model.aSe === null ? null : model.aSe.toFixed(2),
    model.runs,
    formatNumber(model.c),
    model.spread === null ? null : Math.exp(model.spread).toFixed(2),
  );
}

/** A cost as text: seconds become s/min/h, relative units stay numbers. */
function costText(v: number, model: CostModel): string {
  if (model.units === 'relative') return sig(v);
  if (v < 120) return `${sig(v)} s`;
  if (v < 7200) return `${sig(v / 60)} min`;
  return `${sig(v / 3600)} h`;
}

function runTable(plan: PlanResult, spec: SweepSpec, limit: number): string[] {
  const many = spec.conditions.length > 1;
  const head = ['#', 'reason', ...(many ? ['condition'] : []), 'width', 'train_size', 'noise', 'seed', 'epochs', 'cost', 'sharpens', 'why'];
  const rows = plan.runs.slice(0, limit > 0 ? limit : undefined).map((r, i) => [
    String(i),
    r.reason === 'resume' ? `resume@${num(r.resume_from!)}` : r.reason,
    ...(many ? [JSON.stringify(r.condition)] : []),
    num(r.width),
    num(r.train_size),
    num(r.label_noise),
    String(r.seed),
    num(r.epochs),
    costText(r.cost, plan.model),
    r.sharpens ?? '',
    r.why,
  ]);
  const widths = head.map((h, j) => Math.max(h.length, ...rows.map((r) => (j === head.length - 1 ? 0 : r[j].length))));
  const line = (cells: string[]) => cells.map((c, j) => (j === cells.length - 1 ? c : c.padEnd(widths[j]))).join('  ');
  const out = [line(head), ...rows.map(line)];
  if (rows.length < plan.runs.length) out.push(`… ${plan.runs.length - rows.length} more (--limit 0 lists all)`);
  return out;
}

export const command: CommandSpec<PlanArgs> = {
  usage: 'plan',
  describe: 'rank the next runs: gaps first, then new widths and seeds that sharpen the peak, within a budget',
  example: [
    'plan --spec grid.yaml --budget 48h --emit slurm --command "python train.py --width {width} --n {train_size} --noise {label_noise} --seed {seed} --epochs {epochs}" --out next.sbatch',
    'a Slurm job array (and next.csv) for the best runs that fit 48 hours of compute',
  ],
  builder: (y: Argv) =>
    y
      .option('spec', { type: 'string', describe: 'grid spec (YAML or JSON)' })
      .option('store', { type: 'string', describe: `store directory (default ./${DEFAULT_STORE}; absent default = nothing run yet)` })
      .option('budget', { type: 'string', describe: 'cost cap: a number in cost units, or a time (90m, 48h, 2d) when wall time is logged' })
      .option('max-runs', { type: 'number', describe: 'cap on the number of runs (alone: refinement ranks by value per run; with --budget both caps hold)' })
      .option('emit', { choices: EMITS, describe: 'export: csv, json, shell (one command per run) or slurm (job array)' })
      .option('command', { type: 'string', describe: 'command template: {width} {train_size} {label_noise} {seed} {epochs} {run} {condition} {resume_from} {index}' })
      .option('out', { type: 'string', describe: 'file for --emit (slurm: default plan.sbatch, with the plan CSV beside it)' })
      .option('init', { type: 'string', describe: 'write a commented example spec to FILE (default grid.yaml; - = stdout) and exit' })
      .option('force', { type: 'boolean', default: false, describe: 'let --init overwrite an existing file' })
      .option('refine', { type: 'boolean', default: true, describe: 'propose new widths and seeds from the ridge and hurts analyses (--no-refine: gaps only)' })
      .option('skip-diverged', { type: 'boolean', default: false, describe: 'do not re-launch diverged runs' })
      .option('resolution', { type: 'number', default: 0.25, describe: 'octaves: refine a ridge point until the measured values beside its peak, and its interval, are within this; then stop' })
      .option('max-parallel', { type: 'number', default: 32, describe: 'slurm: tasks running at once (#SBATCH --array=0-N%P)' })
      .option('sbatch', { type: 'string', array: true, describe: 'slurm: extra #SBATCH options without the leading dashes, e.g. --sbatch time=04:00:00 --sbatch gres=gpu:1' })
      .option('limit', { type: 'number', default: 40, describe: 'runs to print (0 = all)' })
      .option('allow-collapse', { type: 'boolean', default: false, describe: 'shell/slurm: let --command leave out a setting that varies among the runs; each distinct command is launched once' }),
  async run(args) {
    if (args.init !== undefined) {
      const { SPEC_EXAMPLE } = await import('../plan/specExample.js');
      const file = args.init === '' ? 'grid.yaml' : args.init;
      if (file === '-') {
        process.stdout.write(SPEC_EXAMPLE);
        return 0;
      }
      if (existsSync(file) && !args.force) throw new UserError(planText.initExists(file));
      writeFileSync(file, SPEC_EXAMPLE);
      if (!args.quiet) process.stderr.write(`${planText.wroteInit(file)}\n`);
      return 0;
    }
    if ((args.emit === 'shell' || args.emit === 'slurm') && !args.command) throw usageError(planText.needCommand(args.emit));
    if (args.emit && args.emit !== 'slurm' && !args.out && args.json) throw usageError(planText.stdoutClash());
    if (!(args.resolution > 0)) throw usageError(planText.badResolution(String(args.resolution)));
    if (args.maxRuns !== undefined && !(Number.isInteger(args.maxRuns) && args.maxRuns >= 1)) throw usageError(planText.badMaxRuns(String(args.maxRuns)));
    if (!(Number.isInteger(args.maxParallel) && args.maxParallel >= 1)) throw usageError(planText.badParallel(String(args.maxParallel)));
    const { parseTemplate } = await import('../plan/commandTemplate.js');
    const template = args.command ? parseTemplate(args.command) : null;
    const spec = await loadSpec(args.spec);
    const table = await loadStore({ store: args.store, emptyIfAbsent: true, quiet: args.quiet });

    const { composePlan } = await import('../plan/composePlan.js');
    const { plan } = composePlan({
      table, spec, budget: args.budget, maxRuns: args.maxRuns ?? null, refine: args.refine, resolution: args.resolution,
      resume: template ? template.resumes : true, rerunDiverged: !args.skipDiverged,
    });
    const model = plan.model;

    if (args.emit) {
      const { planCsv } = await import('../plan/planCsv.js');
      let exported = plan;
      if (template && (args.emit === 'shell' || args.emit === 'slurm')) {
        // Checked before anything is written: a template that drops a varying setting launches duplicates.
        const { exportRuns } = await import('../plan/exportRuns.js');
        const e = exportRuns({ plan, template, allowCollapse: args.allowCollapse });
        exported = e.plan;
        if (e.collapsed && !args.quiet) process.stderr.write(`note: ${planText.collapsedRuns(e.collapsed)}\n`);
      }
      const { planJson } = await import('../plan/planJson.js');
      let text: string;
      let out = args.out;
      if (args.emit === 'csv') text = planCsv(plan);
      else if (args.emit === 'json') text = `${JSON.stringify(planJson(plan), null, 2)}\n`;
      else if (args.emit === 'shell') text = (await import('../plan/planShell.js')).planShell({ plan: exported, template: template!, allowCollapse: args.allowCollapse });
      else {
        out ??= 'plan.sbatch';
        const csvPath = out.replace(/\.[^./]+$/, '') + '.csv';
        const { planSlurm } = await import('../plan/planSlurm.js');
        text = planSlurm({ plan: exported, allowCollapse: args.allowCollapse, template: template!, csvPath: resolve(csvPath), maxParallel: args.maxParallel, sbatch: (args.sbatch ?? []).map((o) => (String(o).startsWith('-') ? String(o) : `--${o}`)), jobName: spec.name });
        writeOut(csvPath, planCsv(exported));
        if (exported.runs.length > 1001 && !args.quiet) process.stderr.write(`note: ${planText.slurmBigArray(exported.runs.length)}\n`);
        if (!args.quiet) process.stderr.write(`${general.wroteFile(csvPath)}\n`);
      }
      if (out) {
        writeOut(out, text);
        if (!args.quiet) process.stderr.write(`${general.wroteFile(out)}\n`);
      } else {
        process.stdout.write(text);
        return 0;
      }
    }
    if (args.json) {
      const { planJson } = await import('../plan/planJson.js');
      process.stdout.write(`${JSON.stringify(planJson(plan))}\n`);
      return 0;
    }
    const lines: string[] = [];
    if (plan.runs.length === 0) lines.push(plan.dropped.runs ? planText.planNoneFits(String(args.budget)) : planText.planEmpty());
    else {
      lines.push(planText.planHead(plan.runs.length, costText(plan.cost, model), model.units === 'relative' ? 'relative units' : ''));
      lines.push(...runTable(plan, spec, args.limit));
    }
    if (plan.dropped.runs)
      lines.push(args.budget === undefined ? planText.planCapped(plan.dropped.runs, args.maxRuns!) : planText.planDropped(plan.dropped.runs, costText(plan.dropped.cost, model), `${args.budget}${args.maxRuns ? ` or --max-runs ${args.maxRuns}` : ''}`));
    lines.push(describeModel(model, spec));
    for (const n of plan.notes) lines.push(`note: ${n}`);
    process.stdout.write(`${lines.join('\n')}\n`);
    return 0;
  },
};
