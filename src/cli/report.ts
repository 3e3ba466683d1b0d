import { createHash } from 'node:crypto';
import { basename, dirname, resolve } from 'node:path';
import type { Argv } from 'yargs';
import type { CommandSpec } from './CommandSpec.js';
import { usageError } from '../UserError.js';
import { report as msg } from '../messages.js';
import type { Manifest } from '../store/Manifest.js';
import type { RowTable } from '../store/RowTable.js';
import type { SweepSpec } from '../plan/SweepSpec.js';
import type { PlanResult } from '../plan/Plan.js';
import type { CoverageResult } from '../plan/coverage.js';
import type { ReportModel } from '../report/ReportModel.js';
import type { ReportFiles } from '../report/writeReport.js';
import { DEFAULT_STORE, loadSpec } from './coverage.js';

interface ReportArgs {
  store?: string;
  spec?: string;
  out: string;
  title?: string;
  budget?: string;
  'png-scale': number;
  /** Old spelling of --png-scale (hidden). */
  scale?: number;
}

/** Short content hash of the store: sha256 over its sources' hashes (sorted), 12 hex digits. */
export function storeHash(manifest: Manifest): string | null {
  const hashes = Object.values(manifest.sources)
    .map((s) => s.sha256)
    .sort();
  if (hashes.length === 0) return null;
  return createHash('sha256').update(hashes.join('\n')).digest('hex').slice(0, 12);
}

/** Modification time of the newest source, ISO; null when the store lists none. */
export function dataDate(manifest: Manifest): string | null {
  const times = Object.values(manifest.sources).map((s) => s.mtime).filter((t) => Number.isFinite(t));
  return times.length ? new Date(Math.max(...times)).toISOString() : null;
}

/**
 * Coverage and plan of a spec against a table: `datlas plan`'s own composition (composePlan, as
 * the library's planRuns), so the report's runs are the ones `datlas plan --json` lists.
 */
export async function coverageAndPlan(opts: { table: RowTable; spec: SweepSpec; budget?: string }): Promise<{ coverage: CoverageResult; plan: PlanResult }> {
  const { composePlan } = await import('../plan/composePlan.js');
  return composePlan({ table: opts.table, spec: opts.spec, budget: opts.budget });
}

export interface MakeReportOptions {
  table: RowTable;
  manifest: Manifest;
  spec: SweepSpec | null;
  out: string;
  title: string;
  budget?: string;
  /** PNG pixel ratio (default 2). */
  scale?: number;
  quiet: boolean;
}

/** Analyses, figures and files of a report (shared by `datlas report` and `datlas demo`). */
export async function makeReport(opts: MakeReportOptions): Promise<{ model: ReportModel; files: ReportFiles; plan: PlanResult | null }> {
  const [{ buildReport }, { writeReport }, { progressBar }] = await Promise.all([
    import('../report/buildReport.js'),
    import('../report/writeReport.js'),
    import('./progress.js'),
  ]);
  const cp = opts.spec ? await coverageAndPlan({ table: opts.table, spec: opts.spec, budget: opts.budget }) : null;
  // Roughly: 3 maps × (1 + variants); the bar is a guide, not a count of work.
  const bar = await progressBar({ label: 'report', total: 30, quiet: opts.quiet, minTotal: 1, stage: 'analysing' });
  const model = buildReport({
    table: opts.table,
    title: opts.title,
    dataDate: dataDate(opts.manifest),
    storeHash: storeHash(opts.manifest),
    coverage: cp?.coverage ?? null,
    spec: opts.spec,
    plan: cp?.plan ?? null,
    onStep: (stage) => {
      bar.stage(stage);
      bar.tick();
    },
  });
  bar.done();
  // Drawing and writing: a bar of its own, one step per stage.
  const stages = model.maps.length + 2;
  const draw = await progressBar({ label: 'report', total: stages, quiet: opts.quiet, minTotal: 1, stage: 'drawing' });
  const files = await writeReport({
    model,
    outDir: opts.out,
    scale: opts.scale,
    onStage: (stage) => {
      draw.stage(stage);
      draw.tick();
    },
  });
  draw.done();
  return { model, files, plan: cp?.plan ?? null };
}

/** Human summary: where the files went, then the findings and what to read with care. */
export function reportSummary(model: ReportModel, files: ReportFiles): string[] {
  const lines = [
    msg.wrote('PDF deck', files.pdf),
    msg.wrote('HTML page (self-contained)', files.html),
    msg.wrote(`PNG images (${files.png.length})`, files.png.length ? dirname(files.png[0]) : '-'),
    msg.wrote('JSON summary', files.json),
    '',
    msg.findingsHead,
    ...model.findings.map((f) => `  • ${f}`),
  ];
  if (model.cautions.length) lines.push('', msg.cautionsHead, ...model.cautions.map((c) => `  ! ${c}`));
  if (model.skipped.length) lines.push('', ...model.skipped.map((s) => `  ${msg.skippedKind(s.kind, s.reason)}`));
  return lines;
}

export const command: CommandSpec<ReportArgs> = {
  usage: 'report',
  describe: 'group-meeting report: PDF deck, self-contained HTML page and PNGs with maps, ridges, hurts, coverage and plan',
  example: ['report --store atlas-store --spec grid.yaml --out report --title "Width sweep, CIFAR-10"', 'writes report/report.pdf, report/report.html and report/png/'],
  builder: (y: Argv) =>
    y
      .option('store', { type: 'string', describe: `store directory (default ./${DEFAULT_STORE})` })
      .option('spec', { type: 'string', describe: 'grid spec (YAML or JSON): adds coverage and the proposed next runs' })
      .option('out', { type: 'string', default: 'report', describe: 'output directory' })
      .option('title', { type: 'string', describe: 'title of the deck and page (default: the spec name or the store folder)' })
      .option('budget', { type: 'string', describe: 'cost cap for the proposed runs (as in datlas plan --budget)' })
      .option('png-scale', { type: 'number', default: 2, describe: 'pixel ratio of the PNG images (1 = screen size, 2 = crisp on slides)' })
      .option('scale', { type: 'number', hidden: true, describe: 'old spelling of --png-scale' }),
  async run(args) {
    const { readStore } = await import('../store/readStore.js');
    const storeDir = args.store ?? DEFAULT_STORE;
    const { table, manifest } = await readStore(storeDir);
    (await import('../store/assertRows.js')).assertRows(table, storeDir);
    const spec = args.spec ? await loadSpec(args.spec) : null;
    const title = args.title ?? spec?.name ?? msg.defaultTitle(basename(resolve(storeDir)));
    const pngScale = args.scale ?? args['png-scale'];
    if (!(pngScale > 0 && pngScale <= 8)) throw usageError(msg.badScale(String(pngScale)));
    const { model, files } = await makeReport({ table, manifest, spec, out: args.out, title, budget: args.budget, scale: pngScale, quiet: args.quiet || args.json });
    if (args.json) {
      const { reportJson } = await import('../report/reportJson.js');
      process.stdout.write(`${JSON.stringify({ files, ...reportJson(model) })}\n`);
      return 0;
    }
    process.stdout.write(`${reportSummary(model, files).join('\n')}\n`);
    return 0;
  },
};
