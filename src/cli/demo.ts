import { existsSync, mkdirSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Argv } from 'yargs';
import { packageRoot } from './packageInfo.js';
import type { CommandSpec } from './CommandSpec.js';
import { UserError } from '../UserError.js';
import { report as msg } from '../messages.js';
import type { RowTable } from '../store/RowTable.js';

interface DemoArgs {
  out: string;
  fresh: boolean;
}

/** The committed demo sweep (written by `datlas simulate --preset demo`), relative to the package root. */
export const DEMO_SWEEP = 'sample-sweeps/demo';
/** The spec plans one train size more than the committed sweep ran: those runs are the "still missing" ones. */
export const PLANNED_EXTRA_TRAIN_SIZE = 1024;

/** The package root: the nearest folder up from this module with our package.json (works from src/ and dist/). */
function distinct(col: Float64Array): number[] {
  return [...new Set(col)].filter((v) => Number.isFinite(v)).sort((a, b) => a - b);
}

/**
 * The demo's spec: the axes the sweep ran, plus one larger train size whose runs were planned
 * but not launched yet (so coverage and plan have gaps to show). YAML, as a user would write it.
 */
/** How a spec written by the demo begins (older versions used the words "sweep spec"). */
const DEMO_SPEC_HEAD = '# Demo ';

export function demoSpec(table: RowTable): string {
  const widths = distinct(table.width);
  const sizes = distinct(table.train_size);
  const noise = distinct(table.label_noise);
  const seeds = distinct(table.seed);
  const epochs = Math.max(...distinct(table.epochs));
  const planned = [...sizes, PLANNED_EXTRA_TRAIN_SIZE].filter((v, i, a) => a.indexOf(v) === i).sort((a, b) => a - b);
  return [
    '# Demo grid spec written by `datlas demo`: the axes the simulated sweep ran, plus train size',
    `# ${PLANNED_EXTRA_TRAIN_SIZE}, planned but not run yet, so coverage and plan have gaps to show.`,
    'name: demo-random-features',
    'axes:',
    `  width: [${widths.join(', ')}]`,
    `  train_size: [${planned.join(', ')}]`,
    `  label_noise: [${noise.join(', ')}]`,
    `seeds: [${seeds.join(', ')}]`,
    `epochs: ${epochs}`,
    '',
  ].join('\n');
}

/** Every file under a directory (the committed sweep may be one CSV or a folder per run). */
function hasFiles(dir: string): boolean {
  if (!existsSync(dir)) return false;
  if (!statSync(dir).isDirectory()) return true;
  return readdirSync(dir).length > 0;
}

const rel = (p: string) => {
  const r = relative(process.cwd(), p);
  return r && !r.startsWith('..') ? r : p;
};

export const command: CommandSpec<DemoArgs> = {
  usage: 'demo',
  describe: 'the whole pipeline on the built-in demo sweep: ingest, spec with gaps, report and plan',
  example: ['demo --out demo-out', 'ingests sample-sweeps/demo and writes demo-out/report/report.pdf, report.html, png/ and plan.csv'],
  builder: (y: Argv) =>
    y
      .option('out', { type: 'string', default: 'demo-out', describe: 'output directory' })
      .option('fresh', { type: 'boolean', default: false, describe: 'simulate the demo sweep anew instead of using the committed one' }),
  async run(args) {
    const started = Date.now();
    const out = resolve(args.out);
    mkdirSync(out, { recursive: true });
    const say = (line: string) => {
      if (!args.quiet && !args.json) process.stderr.write(`${line}\n`);
    };

    // 1. The run logs: the committed sweep, or a fresh simulation written like a real sweep's logs.
    let logs: string;
    if (args.fresh) {
      const [{ presets }, { featuresSweepParallel }, { writeSweepLogs }] = await Promise.all([
        import('../simulate/presets.js'),
        import('../simulate/parallelSweep.js'),
        import('../simulate/writeSweepLogs.js'),
      ]);
      logs = join(out, 'sweep');
      rmSync(logs, { recursive: true, force: true });
      say(msg.demoSimulating(rel(logs)));
      const table = await featuresSweepParallel({ ...presets.demo(), workers: availableParallelism() });
      await writeSweepLogs({ table, dir: logs, shape: 'csv' });
    } else {
      logs = join(packageRoot(), DEMO_SWEEP);
      if (!hasFiles(logs)) throw new UserError(msg.demoSweepMissing(logs));
    }

    // 2. Ingest into a store of the demo's own (rebuilt each time so a fresh and a committed sweep never mix).
    const store = join(out, 'atlas-store');
    if (existsSync(join(store, 'manifest.json'))) rmSync(store, { recursive: true, force: true });
    const { ingestSources } = await import('../ingest/ingestSources.js');
    const ingest = await ingestSources({ paths: [logs], store });
    if (!ingest.wrote) throw new UserError(msg.demoIngestFailed(rel(logs)));
    const { readStore } = await import('../store/readStore.js');
    const { table, manifest } = await readStore(store);

    // 3. The spec, with planned runs still missing.
    const specPath = join(out, 'grid.yaml');
    writeFileSync(specPath, demoSpec(table));
    // Earlier versions wrote the spec as sweep.yaml: remove that file when it is the demo's own.
    const oldSpec = join(out, 'sweep.yaml');
    if (existsSync(oldSpec) && readFileSync(oldSpec, 'utf8').startsWith(DEMO_SPEC_HEAD)) rmSync(oldSpec);
    const { parseSpec } = await import('../plan/parseSpec.js');
    const spec = parseSpec(readFileSync(specPath, 'utf8'), specPath);

    // 4. Report and plan.
    const { makeReport, reportSummary } = await import('./report.js');
    const { model, files, plan } = await makeReport({
      table,
      manifest,
      spec,
      out: join(out, 'report'),
      title: msg.demoTitle,
      quiet: args.quiet || args.json,
    });
    const planPath = join(out, 'plan.csv');
    if (plan) {
      const { planCsv } = await import('../plan/planCsv.js');
      writeFileSync(planPath, planCsv(plan));
    }
    const seconds = (Date.now() - started) / 1000;

    if (args.json) {
      const { reportJson } = await import('../report/reportJson.js');
      process.stdout.write(
        `${JSON.stringify({ logs, store, spec: specPath, planCsv: plan ? planPath : null, files, seconds, ingest: { read: ingest.read, accepted: ingest.accepted }, ...reportJson(model) })}\n`,
      );
      return 0;
    }
    const lines = [
      msg.demoHead(rel(logs), ingest.accepted, seconds),
      msg.wrote('store', rel(store)),
      msg.wrote('spec (some planned runs still missing)', rel(specPath)),
      ...(plan ? [msg.wrote(`plan (${plan.runs.length} runs, CSV)`, rel(planPath))] : []),
      ...reportSummary(model, { ...files, pdf: rel(files.pdf), html: rel(files.html), json: rel(files.json), png: files.png.map(rel) }),
      '',
      msg.demoNext(rel(files.html), rel(store), rel(specPath)),
    ];
    process.stdout.write(`${lines.join('\n')}\n`);
    return 0;
  },
};
