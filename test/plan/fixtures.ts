import { tableFromRows } from '../../src/store/tableFromRows.js';
import type { RowRecord } from '../../src/store/tableFromRows.js';
import type { RowTable } from '../../src/store/RowTable.js';
import { parseSpec } from '../../src/plan/parseSpec.js';
import { specRuns } from '../../src/plan/SweepSpec.js';
import type { SpecRun, SweepSpec } from '../../src/plan/SweepSpec.js';

export const SPEC_TEXT = `
axes:
  width: {from: 8, to: 256, count: 6}
  train_size: [1000, 4000]
  label_noise: [0, 0.2]
conditions: [adam]
seeds: 3
epochs: 1000
`;

export const spec: SweepSpec = parseSpec(SPEC_TEXT, 'sweep.yaml');

export const key = (r: Pick<SpecRun, 'condition' | 'label_noise' | 'width' | 'train_size' | 'seed'>) =>
  `${r.condition}|${r.label_noise}|${r.width}|${r.train_size}|${r.seed}`;

export interface StoreEdits {
  removed?: SpecRun[];
  truncated?: { run: SpecRun; at: number }[];
  diverged?: SpecRun[];
  extra?: SpecRun[];
  /** Wall seconds per epoch of a run; default none logged. */
  wallPerEpoch?: (r: SpecRun) => number;
}

/** A store holding every run of `s` at log-spaced epochs up to the target, with the edits applied. */
export function storeFor(s: SweepSpec, edits: StoreEdits = {}): RowTable {
  const removed = new Set((edits.removed ?? []).map(key));
  const truncated = new Map((edits.truncated ?? []).map((t) => [key(t.run), t.at]));
  const diverged = new Set((edits.diverged ?? []).map(key));
  const rows: Partial<RowRecord>[] = [];
  const epochs = [1, 10, 100, s.epochs];
  for (const r of [...specRuns(s), ...(edits.extra ?? [])]) {
    const k = key(r);
    if (removed.has(k)) continue;
    const last = truncated.get(k) ?? s.epochs;
    const run = `run-${k}`;
    for (const e of epochs.filter((e) => e <= last)) {
      const bad = diverged.has(k) && e >= 100;
      rows.push({
        run,
        condition: r.condition,
        width: r.width,
        train_size: r.train_size,
        label_noise: r.label_noise,
        seed: r.seed,
        epochs: e,
        test_error: bad ? NaN : 0.3 + 0.01 * r.seed,
        train_error: 0.1,
        status: bad ? 'diverged' : 'ok',
        wall_seconds: edits.wallPerEpoch ? edits.wallPerEpoch(r) * e : NaN,
      });
    }
  }
  return tableFromRows(rows);
}

/** The table as a CSV run log (canonical column names), for ingesting through the CLI. */
export function tableCsv(t: RowTable): string {
  const cols = ['run', 'condition', 'width', 'train_size', 'label_noise', 'seed', 'epochs', 'test_error', 'train_error', 'wall_seconds', 'status'] as const;
  const lines: string[] = [cols.join(',')];
  for (let i = 0; i < t.length; i++) {
    lines.push(
      cols
        .map((c) => {
          const v = (t[c] as ArrayLike<number | string>)[i];
          // Diverged runs log NaN errors, as real training scripts print them.
          if (typeof v === 'number' && Number.isNaN(v)) return c === 'test_error' || c === 'train_error' ? 'nan' : '';
          return String(v);
        })
        .join(','),
    );
  }
  return lines.join('\n') + '\n';
}
