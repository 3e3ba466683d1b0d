import type { Metric } from '../store/RowTable.js';

/** Seed statistics of one value in one cell. `low`/`high` are the two-sided 95% Student-t interval of the mean. */
export interface SeedStats {
  n: number;
  mean: number;
  median: number;
  /** Sample standard deviation (n − 1); NaN for one seed. */
  sd: number;
  /** Standard error sd/√n; NaN for one seed. */
  se: number;
  /** null when n < 2: one seed has no interval. */
  low: number | null;
  high: number | null;
}

/** Where a cell sits in the sweep. */
export interface CellKey {
  condition: string;
  label_noise: number;
  width: number;
  train_size: number;
  epochs: number;
}

/** One grid point: the seeds' values of a metric (and of train error) at one configuration and epoch. */
export interface Cell extends CellKey {
  metric: Metric;
  /** Statistics of `metric` over the seeds with a finite value. */
  stats: SeedStats;
  /** Statistics of train_error over seeds; null when no seed logged it. */
  train: SeedStats | null;
  /** Per seed, in the same order: seed id, metric value, train error (NaN where not logged), run id. */
  seeds: number[];
  values: number[];
  trainValues: number[];
  runs: string[];
  /** Seeds whose run is marked diverged at this cell (their values are not in `stats`). */
  diverged: number;
  /** Run ids of the diverged seeds (not in `seeds`/`values`). */
  divergedRuns?: string[];
}
