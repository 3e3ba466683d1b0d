import type { RowTable } from '../store/RowTable.js';
import { eachRunKey } from '../store/rowKeys.js';

/** One run of the store, summarised for coverage and cost fitting. */
export interface StoreRun {
  run: string;
  condition: string;
  label_noise: number;
  width: number;
  train_size: number;
  seed: number;
  /** Last logged epoch. */
  lastEpoch: number;
  /** Any row of the run marked diverged. */
  diverged: boolean;
  /** Last logged cumulative wall time (seconds) and the epoch it was logged at; NaN when never logged. */
  wallSeconds: number;
  wallEpoch: number;
  rows: number;
}

/**
 * The runs of a table, in order of first appearance. Rows are grouped by run (rowKeys.runKey:
 * id, configuration and seed, so an id reused for another configuration or seed is another run).
 */
export function storeRuns(table: RowTable): StoreRun[] {
  const byKey = new Map<string, StoreRun>();
  eachRunKey(table, null, (key, i) => {
    let r = byKey.get(key);
    if (!r) {
      r = {
        run: table.run[i],
        condition: table.condition[i],
        label_noise: table.label_noise[i],
        width: table.width[i],
        train_size: table.train_size[i],
        seed: table.seed[i],
        lastEpoch: -Infinity,
        diverged: false,
        wallSeconds: NaN,
        wallEpoch: NaN,
        rows: 0,
      };
      byKey.set(key, r);
    }
    r.rows++;
    const e = table.epochs[i];
    if (e > r.lastEpoch) r.lastEpoch = e;
    if (table.status[i] === 'diverged') r.diverged = true;
    const w = table.wall_seconds[i];
    if (Number.isFinite(w) && Number.isFinite(e) && !(e < r.wallEpoch)) {
      // Wall time is cumulative: keep the value logged at the latest epoch.
      r.wallEpoch = e;
      r.wallSeconds = w;
    }
  });
  return [...byKey.values()];
}
