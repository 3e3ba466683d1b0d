import { seededRng } from '../analysis/seededRng.js';
import type { RowTable } from '../store/RowTable.js';
import { textReader } from '../store/RowTable.js';

export interface EvalNoiseOptions {
  /** Standard deviation of the per-epoch evaluation noise, in error units (0 turns it off). */
  sd: number;
  /** Chance per logged epoch of a single-epoch spike (default 0.01). */
  spikeRate?: number;
  /** Spike size range, in multiples of sd (default 3 to 10): an evaluation that went wrong once. */
  spikeSd?: [number, number];
  /** Seed of the noise (default 1). */
  seed?: number;
}

/** FNV-1a of a run id, so each run's noise is its own stream whatever order the rows come in. */
function hashRun(run: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < run.length; i++) h = Math.imul(h ^ run.charCodeAt(i), 0x01000193);
  return h >>> 0;
}

/**
 * Per-epoch evaluation noise on the simulator's test error, as a real log has it (a finite test
 * set, evaluated once per logged epoch): independent Gaussian noise of `sd` on every row, and with
 * probability `spikeRate` a single-epoch upward spike of 3–10 sd. Values stay in [0, 1]. The
 * simulator's own tables are fresh, so the column is changed in place and the table returned.
 */
export function addEvalNoise(table: RowTable, opts: EvalNoiseOptions): RowTable {
  const sd = opts.sd;
  if (!(sd > 0)) return table;
  const rate = opts.spikeRate ?? 0.01;
  const [lo, hi] = opts.spikeSd ?? [3, 10];
  const seed = opts.seed ?? 1;
  const run = textReader(table, 'run');
  const streams = new Map<string, ReturnType<typeof seededRng>>();
  const e = table.test_error;
  for (let i = 0; i < table.length; i++) {
    if (!Number.isFinite(e[i])) continue;
    const id = run(i);
    let rng = streams.get(id);
    if (!rng) streams.set(id, (rng = seededRng((hashRun(id) ^ Math.imul(seed, 0x9e3779b1)) >>> 0)));
    let v = e[i] + sd * rng.normal();
    if (rng.next() < rate) v += sd * (lo + (hi - lo) * rng.next());
    e[i] = Math.min(1, Math.max(0, v));
  }
  return table;
}
