import type { Argv } from 'yargs';
import type { HurtsResult } from '../analysis/Hurts.js';
import { analysisText as t } from '../messages.js';
import type { Metric } from '../store/RowTable.js';
import { UserError } from '../UserError.js';
import { correctionName } from '../analysis/correctionName.js';
import type { CommandSpec } from './CommandSpec.js';
import { parseAt } from './parseAt.js';
import { checkNumber } from './ridge.js';

interface HurtsArgs {
  at?: string[];
  metric?: Metric;
  alpha: number;
  boot: number;
  seed: number;
  store: string;
  limit: number;
  correction: string;
}

function hurtsText(r: HurtsResult, limit: number): string {
  if (r.segments.length === 0)
    return t.hurtsNone(r.metric, r.slices ?? 0, r.alpha ?? 0.05) + (r.correction === 'benjamini-hochberg' && (r.slices ?? 0) > 1 ? `\n${t.hurtsSummary(0, r.slices ?? 0, r.alpha ?? 0.05)}` : '');
  const lines: string[] = [];
  for (const s of r.segments.slice(0, limit)) {
    lines.push(t.hurtsSlice(s.fixed));
    lines.push(`  ${t.hurtsSegment({ onset: s.onset, peak: s.peak, recovery: s.recovery, rise: s.rise, p: s.p, metric: r.metric, last: s.lastSize ?? s.peak, pSearch: s.pSearch })}`);
    if (r.correction === 'benjamini-hochberg' && s.pAdjusted !== undefined) lines.push(t.hurtsAdjusted(s.pAdjusted));
    if (s.test === 'bootstrap') lines.push(t.hurtsBootstrap(s.noiseFrom ?? 'seeds'));
  }
  if (r.segments.length > limit) lines.push(t.hurtsMore(r.segments.length - limit));
  if (r.correction === 'benjamini-hochberg') lines.push(t.hurtsSummary(r.slicesWithRise ?? 0, r.slices ?? 0, r.alpha ?? 0.05));
  return lines.join('\n');
}

export const command: CommandSpec<HurtsArgs> = {
  usage: 'hurts',
  describe: 'find train-size ranges where more data raises test error (onset, peak, recovery, p)',
  example: ['hurts --at width=64,epochs=4000,label_noise=0.2', 'at that width, epoch budget and noise: where extra data hurts, and where it stops hurting'],
  builder: (y: Argv) =>
    y
      .option('at', { type: 'string', array: true, describe: 'fix width, epochs, label_noise or condition (axis=value); unset ones are all scanned' })
      .option('metric', { type: 'string', choices: ['test_error', 'test_loss', 'train_error', 'train_loss'], describe: 'metric (default test_error, else test_loss)' })
      .option('alpha', { type: 'number', default: 0.05, describe: 'significance level of a rise (Welch test, and the search-wide check)' })
      .option('boot', { type: 'number', default: 1000, describe: 'bootstrap rounds when a compared cell has one seed' })
      .option('seed', { type: 'number', default: 1, describe: 'random seed of the bootstrap and the search-wide check' })
      .option('correction', { type: 'string', default: 'benjamini-hochberg', describe: 'across slices: benjamini-hochberg (bh for short; false discovery rate at --alpha) or none (each slice alone)' })
      .option('limit', { type: 'number', default: 20, describe: 'segments shown in the text output (all are in --json)' })
      .option('store', { type: 'string', default: 'atlas-store', describe: 'store directory' }),
  async run(args) {
    checkNumber('--alpha', args.alpha, (v) => v > 0 && v < 1, 'a level in (0, 1)');
    checkNumber('--boot', args.boot, (v) => v >= 1 && v <= 1e6 && Number.isInteger(v), 'a whole number of rounds (1 to 1,000,000)');
    checkNumber('--seed', args.seed, Number.isInteger, 'a whole number');
    checkNumber('--limit', args.limit, (v) => v >= 0 && Number.isInteger(v), 'a whole number >= 0');
    const correction = correctionName(args.correction);
    const at = parseAt(args.at);
    const { readStore } = await import('../store/readStore.js');
    const { buildCells } = await import('../cells/buildCells.js');
    const { findHurts } = await import('../analysis/findHurts.js');
    const { defaultMetric } = await import('../store/RowTable.js');
    const { table } = await readStore(args.store);
    (await import('../store/assertRows.js')).assertRows(table, args.store);
    const metric = args.metric ?? defaultMetric(table);
    // A fixed epoch budget need not be logged exactly: runs are aligned to it along their own curves.
    const epochs = typeof at.epochs === 'number' ? [at.epochs] : undefined;
    const cells = buildCells(table, { metric, epochs });
    const result = findHurts(cells, { at, alpha: args.alpha, boot: args.boot, seed: args.seed, correction });
    if (result.slices === 0) throw new UserError(result.singleSize ? t.hurtsOneSize(result.singleSize) : t.noCells(at));
    if (args.json) process.stdout.write(`${JSON.stringify(result)}\n`);
    else process.stdout.write(`${hurtsText(result, args.limit)}\n`);
    return 0;
  },
};
