import type { Argv } from 'yargs';
import { readdir } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { general, simulateMessages as t } from '../messages.js';
import { usageError } from '../UserError.js';
import type { CommandSpec, GlobalOptions } from './CommandSpec.js';
import { progressBar } from './progress.js';

const PRESETS = ['quick', 'demo', 'epochs', 'linear'] as const;
const SHAPES = ['csv', 'jsonl', 'dirs'] as const;

interface SimulateArgs {
  preset: string;
  out?: string;
  shape: string;
  seeds?: string;
  widths?: string;
  trainSizes?: string;
  labelNoise?: string;
  epochs?: string;
  evalNoise?: string;
  workers?: string;
  ridge?: string;
  testSize?: string;
  force: boolean;
  plan?: string;
}

function parseList(flag: string, text: string | undefined): number[] | undefined {
  if (text === undefined) return undefined;
  const parts = String(text).split(',').map((s) => s.trim());
  const values = parts.map(Number);
  if (!parts.length || parts.some((s) => s === '') || values.some((v) => !Number.isFinite(v))) throw usageError(general.badList(flag, String(text)));
  return values;
}

function parseCount(flag: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const v = Number(text);
  if (!Number.isInteger(v) || v < 1) throw usageError(t.badCount(flag, String(text)));
  return v;
}

function requireAll(flag: string, values: number[] | undefined, ok: (v: number) => boolean, what: string): void {
  if (values && !values.every(ok)) throw usageError(t.badValues(flag, what));
}

export const command: CommandSpec<SimulateArgs> = {
  usage: 'simulate',
  describe: 'simulate a double-descent sweep (random features trained by gradient descent, or linear-Gaussian) and write its run logs',
  example: ['simulate --preset demo --out demo-sweep --shape dirs', 'the three-axis demo sweep, one folder per run (config.json + metrics.csv), ready for datlas ingest'],
  builder: (y: Argv) =>
    y
      .option('preset', { type: 'string', default: 'quick', describe: 'quick (seconds), demo (three axes, under a minute), epochs (epoch-wise double descent), linear (exact-risk ground truth)' })
      .option('out', { type: 'string', describe: 'directory for the run logs (default sweep-PRESET)' })
      .option('shape', { type: 'string', default: 'csv', describe: 'csv: one file per sweep; jsonl: one file per run; dirs: one folder per run with config.json + metrics.csv' })
      .option('seeds', { type: 'string', describe: 'number of seeds (0..K−1)' })
      .option('widths', { type: 'string', describe: 'comma-separated widths (random features N; linear: features used p)' })
      .option('train-sizes', { type: 'string', describe: 'comma-separated training-set sizes n' })
      .option('label-noise', { type: 'string', describe: 'comma-separated fractions of flipped training labels, in [0, 1)' })
      .option('epochs', { type: 'string', describe: 'last logged epoch (log-spaced epochs from 1)' })
      .option('workers', { type: 'string', describe: 'worker threads (default: the number of cores)' })
      .option('ridge', { type: 'string', describe: "linear preset: ridge λ >= 0 or 'optimal' (default 0: minimum-norm least squares)" })
      .option('test-size', { type: 'string', describe: 'fresh test points per seed' })
      .option('eval-noise', { type: 'string', describe: 'per-epoch evaluation noise on test error (sd, e.g. 0.01), with single-epoch spikes at 1% of epochs' })
      .option('force', { type: 'boolean', default: false, describe: 'write into a non-empty --out directory' })
      .option('plan', { type: 'string', describe: 'run exactly the runs of a plan CSV (datlas plan --emit csv); resume_from continues a run' }),
  async run(args) {
    const preset = String(args.preset);
    if (!(PRESETS as readonly string[]).includes(preset)) throw usageError(t.badPreset(preset, PRESETS));
    const shape = String(args.shape);
    if (!(SHAPES as readonly string[]).includes(shape)) throw usageError(t.badShape(shape, SHAPES));
    if (args.plan !== undefined) return simulatePlan(args, shape);
    const seeds = parseCount('--seeds', args.seeds);
    const workers = parseCount('--workers', args.workers) ?? availableParallelism();
    const testSize = parseCount('--test-size', args.testSize);
    const widths = parseList('--widths', args.widths);
    const trainSizes = parseList('--train-sizes', args.trainSizes);
    const labelNoise = parseList('--label-noise', args.labelNoise);
    const epochs = args.epochs === undefined ? undefined : Number(args.epochs);
    const evalNoise = args.evalNoise === undefined ? undefined : Number(args.evalNoise);
    if (evalNoise !== undefined && !(Number.isFinite(evalNoise) && evalNoise >= 0 && evalNoise < 1)) throw usageError(t.badEvalNoise(String(args.evalNoise)));
    if (preset === 'linear' && evalNoise !== undefined) throw usageError(t.evalNoiseNeedsFeatures);
    requireAll('--widths', widths, (v) => Number.isInteger(v) && v >= 1, 'widths must be whole numbers >= 1');
    requireAll('--train-sizes', trainSizes, (v) => Number.isInteger(v) && v >= 2, 'train sizes must be whole numbers >= 2');
    requireAll('--label-noise', labelNoise, (v) => v >= 0 && v < 1, 'label noise must be in [0, 1)');
    if (epochs !== undefined && !(Number.isInteger(epochs) && epochs >= 1 && epochs <= 1e9)) throw usageError(t.badCount('--epochs', String(args.epochs)));
    let ridge: number | 'optimal' | undefined;
    if (args.ridge !== undefined) {
      if (preset !== 'linear') throw usageError(t.ridgeNeedsLinear(preset));
      ridge = args.ridge === 'optimal' ? 'optimal' : Number(args.ridge);
      if (ridge !== 'optimal' && !(Number.isFinite(ridge) && ridge >= 0)) throw usageError(t.badRidge(String(args.ridge)));
    }
    if (preset === 'linear' && labelNoise) throw usageError(t.noiseNeedsFeatures);
    if (preset === 'linear' && epochs !== undefined) throw usageError(t.epochsNeedFeatures);

    // The library's simulate() does the work, so the command and the function cannot drift.
    const { simulate } = await import('../api/simulate.js');
    const summary = await simulate({
      preset: preset as (typeof PRESETS)[number],
      shape: shape as (typeof SHAPES)[number],
      ...(args.out !== undefined && { out: args.out }),
      force: args.force,
      workers,
      ...(seeds !== undefined && { seeds }),
      ...(widths && { widths }),
      ...(trainSizes && { trainSizes }),
      ...(labelNoise && { labelNoise }),
      ...(epochs !== undefined && { epochs }),
      ...(testSize !== undefined && { testSize }),
      ...(ridge !== undefined && { ridge }),
      ...(evalNoise !== undefined && { evalNoise }),
      progress: (total, linear) =>
        progressBar({ label: 'simulate', total, quiet: args.quiet || args.json, minTotal: linear ? 200 : 2, stage: linear ? 'fitting runs' : 'training runs' }),
    });
    if (args.json) {
      process.stdout.write(JSON.stringify(summary) + '\n');
    } else {
      process.stdout.write(t.wrote(summary.runs, summary.rows, summary.files, summary.out, summary.seconds, shape) + '\n');
      if (!args.quiet) {
        process.stderr.write((preset === 'linear' ? t.linearNote : t.peakNote) + '\n');
        process.stderr.write(t.nextStep(summary.out) + '\n');
      }
    }
    return 0;
  },
};

/** simulate --plan FILE: the planned runs only, each as `simulate` would have logged it. */
async function simulatePlan(args: SimulateArgs & GlobalOptions, shape: string): Promise<number> {
  const preset = String(args.preset);
  const { planCsvText } = await import('../messages.js');
  if (preset === 'linear') throw usageError(planCsvText.linearPreset);
  const clash = (['seeds', 'widths', 'trainSizes', 'labelNoise', 'epochs', 'ridge', 'evalNoise'] as const).filter((k) => args[k] !== undefined);
  if (clash.length) throw usageError(planCsvText.planFlagsClash(clash.map((k) => `--${k.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`).join(', ')));
  const workers = parseCount('--workers', args.workers) ?? availableParallelism();
  const testSize = parseCount('--test-size', args.testSize);
  const file = String(args.plan);
  const { existsSync, readFileSync } = await import('node:fs');
  const { UserError } = await import('../UserError.js');
  if (file !== '-' && !existsSync(file)) throw new UserError(planCsvText.noFile(file));
  const text = readFileSync(file === '-' ? 0 : file, 'utf8');
  const { parsePlanCsv } = await import('../plan/parsePlanCsv.js');
  const runs = parsePlanCsv(text, file);
  if (runs.length === 0) throw new UserError(planCsvText.noRuns(file));
  const out = args.out ?? 'sweep-plan';
  if (!args.force) {
    const entries = await readdir(out).catch(() => [] as string[]);
    if (entries.length > 0) throw usageError(t.outNotEmpty(out));
  }
  const { presets } = await import('../simulate/presets.js');
  const { planJobs, planRows } = await import('../simulate/planSweep.js');
  const { featuresJobsParallel } = await import('../simulate/parallelSweep.js');
  const { writeSweepLogs } = await import('../simulate/writeSweepLogs.js');
  const started = performance.now();
  const base = presets[preset as 'quick' | 'demo' | 'epochs']();
  const jobs = planJobs({ runs, preset: { ...base, ...(testSize !== undefined && { testSize }) } });
  const total = jobs.reduce((s, j) => s + j.options.widths.length, 0);
  const bar = await progressBar({ label: 'simulate', total, quiet: args.quiet || args.json, minTotal: 2 });
  const tables = await featuresJobsParallel({ jobs, workers, onRun: () => bar.tick() });
  bar.done();
  const table = planRows({ runs, jobs, tables });
  const files = await writeSweepLogs({ table, dir: out, shape: shape as 'csv' | 'jsonl' | 'dirs' });
  const seconds = (performance.now() - started) / 1000;
  const resumed = runs.filter((r) => r.resume_from !== null).length;
  const withCondition = runs.filter((r) => r.condition !== '').length;
  if (args.json) {
    process.stdout.write(JSON.stringify({ preset, plan: file, out, shape, runs: runs.length, resumed, rows: table.length, files: files.length, workers, seconds: Number(seconds.toFixed(3)) }) + '\n');
  } else {
    process.stdout.write(planCsvText.wrotePlan(runs.length, resumed, table.length, files.length, out, seconds, shape) + '\n');
    if (!args.quiet) {
      if (withCondition) process.stderr.write(`note: ${planCsvText.conditionIgnored(withCondition)}\n`);
      process.stderr.write(t.nextStep(out) + '\n');
    }
  }
  return 0;
}
