import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { dirname, extname } from 'node:path';
import type { Argv } from 'yargs';
import type { CommandSpec } from './CommandSpec.js';
import { UserError, usageError } from '../UserError.js';
import { general, planText } from '../messages.js';
import type { RowTable } from '../store/RowTable.js';
import { formatNumber } from '../formatNumber.js';
import type { SweepSpec } from '../plan/SweepSpec.js';

interface CoverageArgs {
  spec?: string;
  store?: string;
  out?: string;
  limit: number;
}

export const DEFAULT_STORE = 'atlas-store';

/** Reads and validates a spec file (`-` = stdin). */
export async function loadSpec(file: string | undefined): Promise<SweepSpec> {
  if (!file) throw usageError(planText.specFlagNeeded());
  const { parseSpec } = await import('../plan/parseSpec.js');
  let text: string;
  if (file === '-') text = readFileSync(0, 'utf8');
  else {
    if (!existsSync(file)) throw new UserError(planText.specMissing(file));
    if (statSync(file).isDirectory()) throw usageError(general.isAFolder(file));
    text = readFileSync(file, 'utf8');
  }
  return parseSpec(text, file);
}

/**
 * Reads the store. With `emptyIfAbsent` and no --store given, a missing default store is an
 * empty sweep (planning the first batch), reported on stderr.
 */
export async function loadStore(opts: { store?: string; emptyIfAbsent: boolean; quiet: boolean }): Promise<RowTable> {
  const dir = opts.store ?? DEFAULT_STORE;
  const { readManifest, readStore } = await import('../store/readStore.js');
  if (opts.emptyIfAbsent && opts.store === undefined && !readManifest(dir)) {
    const { emptyTable } = await import('../store/RowTable.js');
    if (!opts.quiet) process.stderr.write(`${planText.emptyStore(dir)}\n`);
    return emptyTable(0);
  }
  return (await readStore(dir)).table;
}

const num = (v: number) => formatNumber(v, 4);

/** Writes a file, creating its folder. */
export function writeOut(path: string, data: string | Buffer): void {
  const dir = dirname(path);
  if (dir && !existsSync(dir)) mkdirSync(dir, { recursive: true });
  writeFileSync(path, data);
}

export const command: CommandSpec<CoverageArgs> = {
  usage: 'coverage',
  describe: 'which planned runs are complete, partial, missing or diverged',
  example: ['coverage --spec grid.yaml --out coverage.png', 'list the gaps of the sweep and draw the width × train-size grid'],
  builder: (y: Argv) =>
    y
      .option('spec', { type: 'string', describe: 'grid spec (YAML or JSON; write one with datlas plan --init)' })
      .option('store', { type: 'string', describe: `store directory (default ./${DEFAULT_STORE})` })
      .option('out', { type: 'string', describe: 'coverage image (.png, .svg or .pdf; its vega-lite spec is written beside)' })
      .option('limit', { type: 'number', default: 30, describe: 'gap lines to print (0 = all)' }),
  async run(args) {
    const spec = await loadSpec(args.spec);
    if (args.out !== undefined && !['.png', '.svg', '.pdf'].includes(extname(args.out).toLowerCase())) throw usageError(planText.badImageExt(args.out));
    const table = await loadStore({ store: args.store, emptyIfAbsent: false, quiet: args.quiet });
    const { coverage } = await import('../plan/coverage.js');
    const cov = coverage(table, spec);
    if (args.out) {
      const { coverageSpec } = await import('../render/coverageSpec.js');
      const { renderSpec } = await import('../render/renderSpec.js');
      const vl = coverageSpec({ coverage: cov, spec });
      const format = extname(args.out).slice(1).toLowerCase() as 'png' | 'svg' | 'pdf';
      writeOut(args.out, await renderSpec(vl, { format }));
      const specPath = args.out.replace(/\.[^./]+$/, '.vl.json');
      writeOut(specPath, JSON.stringify(vl, null, 2));
      if (!args.quiet) process.stderr.write(`${general.wroteFile(args.out)}\n`);
    }
    if (args.json) {
      const { coverageJson } = await import('../api/coverage.js');
      process.stdout.write(`${JSON.stringify(coverageJson(cov, spec))}\n`);
      return 0;
    }
    const { gapGroups } = await import('../plan/gapGroups.js');
    const { formatGap } = await import('../plan/formatGap.js');
    const total = cov.runs.length;
    const shape = [
      `${spec.axes.width.length} width${spec.axes.width.length === 1 ? '' : 's'}`,
      `${spec.axes.train_size.length} train size${spec.axes.train_size.length === 1 ? '' : 's'}`,
      `${spec.axes.label_noise.length} noise level${spec.axes.label_noise.length === 1 ? '' : 's'}`,
      ...(spec.conditions.length > 1 ? [`${spec.conditions.length} condition${spec.conditions.length === 1 ? '' : 's'}`] : []),
      `${spec.seeds.length} seed${spec.seeds.length === 1 ? '' : 's'}`,
    ].join(' × ');
    const lines = [planText.coverageHead(spec.file, total, shape, num(spec.epochs))];
    const pct = total ? `${Math.floor((100 * cov.counts.complete) / total)}%` : '—';
    lines.push(planText.coverageCounts(cov.counts, pct));
    const groups = gapGroups(cov, spec);
    if (groups.length === 0) lines.push(planText.coverageAllDone());
    else {
      lines.push(planText.gapsHead());
      const shown = args.limit > 0 ? groups.slice(0, args.limit) : groups;
      for (const g of shown) lines.push(`  ${formatGap(g, spec)}`);
      if (shown.length < groups.length) lines.push(planText.gapsMore(groups.length - shown.length));
    }
    if (cov.extra.length) {
      const by = new Map<string, number>();
      for (const e of cov.extra) {
        const what = e.outside.map((k) => `${k} ${k === 'condition' ? JSON.stringify(e.condition) : num(e[k as 'width'])}`).join(', ');
        by.set(what, (by.get(what) ?? 0) + 1);
      }
      const parts = [...by].slice(0, 6).map(([w, n]) => `${w}: ${n}`);
      if (by.size > 6) parts.push('…');
      lines.push(planText.extraRuns(cov.extra.length, parts.join('; ')));
      const widthOnly = cov.extra.filter((e) => e.outside.length === 1 && e.outside[0] === 'width').length;
      if (widthOnly) lines.push(planText.extraWidthsHint(widthOnly));
      const seedOnly = cov.extra.filter((e) => e.outside.length === 1 && e.outside[0] === 'seed');
      if (seedOnly.length) {
        const ids = [...new Set(seedOnly.map((e) => e.seed))].sort((a, b) => a - b).slice(0, 12);
        lines.push(planText.extraSeedsHint(seedOnly.length, ids.join(', '), spec.seeds.join(', ')));
      }
    }
    if (cov.superseded) lines.push(planText.supersededRuns(cov.superseded));
    process.stdout.write(`${lines.join('\n')}\n`);
    return 0;
  },
};
