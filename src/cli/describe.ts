import type { Argv } from 'yargs';
import type { CommandSpec } from './CommandSpec.js';
import { layoutText } from '../messages.js';

interface DescribeArgs {
  store: string;
}

const shortList = (v: number[]) => (v.length <= 12 ? v.join(', ') : `${v.slice(0, 6).join(', ')}, … ${v.slice(-3).join(', ')} (${v.length} values)`);

export const command: CommandSpec<DescribeArgs> = {
  usage: 'describe',
  describe: 'what the store holds: rows, runs, axes, seeds, conditions, metrics and where each column came from',
  example: ['describe --store atlas-store', 'list the axes values, seeds and conditions, and the source column behind each canonical one'],
  builder: (y: Argv) => y.option('store', { type: 'string', default: 'atlas-store', describe: 'store directory' }),
  async run(args) {
    const { readStore } = await import('../store/readStore.js');
    const { readRejected } = await import('../store/rejectedCsv.js');
    const { describeStore } = await import('../store/describeStore.js');
    const { table, manifest } = await readStore(args.store);
    const d = describeStore(table, manifest, readRejected(args.store));
    if (args.json) {
      process.stdout.write(`${JSON.stringify(d)}\n`);
      return 0;
    }
    const out = [layoutText.describeHead(args.store, d.rows, d.runs), 'columns:'];
    for (const [t, s] of Object.entries(d.columns)) out.push(layoutText.describeColumn(t, s));
    out.push('axes:');
    for (const a of ['width', 'train_size', 'label_noise', 'params'] as const) {
      const v = d.axes[a];
      if (v) out.push(layoutText.describeAxis(a, shortList(v)));
    }
    if (d.axes.epochs) out.push(layoutText.describeAxis('epochs', `${d.axes.epochs.min} to ${d.axes.epochs.max} (${d.axes.epochs.distinct} distinct)`));
    out.push(layoutText.describeAxis('seeds', shortList(d.seeds)));
    out.push(`conditions: ${d.conditions.length}`);
    for (const c of d.conditions.slice(0, 20)) out.push(`  ${layoutText.conditionRuns(c.condition, c.runs)}`);
    out.push(`metrics: ${d.metrics.join(', ')}`);
    if (d.extra.length) out.push(`extra columns: ${d.extra.join(', ')}`);
    const reasons = Object.entries(d.rejected);
    if (reasons.length) {
      out.push('rejected:');
      for (const [r, n] of reasons) out.push(`  ${n} × ${r}`);
    }
    process.stdout.write(`${out.join('\n')}\n`);
    return 0;
  },
};
