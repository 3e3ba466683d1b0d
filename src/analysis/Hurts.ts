import type { Metric } from '../store/RowTable.js';

/** A stretch of train sizes over which more data raised test error. */
export interface HurtsSegment {
  /** The slice it was found in: width, epochs, label_noise, condition. */
  fixed: Record<string, number | string>;
  /** Last train size before the rise. */
  onset: number;
  /** Bootstrap interval of the onset (train sizes of cells), at the result's level. */
  onsetLow?: number;
  onsetHigh?: number;
  /** Train size at the top of the rise. */
  peak: number;
  /** Train size where the error falls back to the onset level (interpolated in log size); null when not reached. */
  recovery: number | null;
  /** Mean error at the peak minus mean error at the onset. */
  rise: number;
  /** p-value of the rise (Welch t-test, or bootstrap when a cell has one seed). */
  p: number;
  test: 'welch' | 'bootstrap';
  /**
   * Search-wide p: how often a flat slice of pure noise with the same per-cell noise shows a rise
   * this tall (in pair standard errors) anywhere. A segment needs both p and pSearch below alpha.
   */
  pSearch?: number;
  /**
   * The larger of p and pSearch, adjusted for the slices scanned (Benjamini–Hochberg); the
   * segment is listed when this is below alpha.
   */
  pAdjusted?: number;
  /** Mean metric at the onset and at the peak, and the seeds behind each. */
  onsetError?: number;
  peakError?: number;
  onsetSeeds?: number;
  peakSeeds?: number;
  /** Where the noise of a bootstrap test came from (see RidgeRow.noiseFrom). */
  noiseFrom?: 'seeds' | 'curve';
  /** Largest train size of the slice (how far recovery was looked for). */
  lastSize?: number;
}

export interface HurtsResult {
  metric: Metric;
  fixed: Record<string, number | string>;
  segments: HurtsSegment[];
  /** Significance level used, and how many train-size slices (two or more sizes) were scanned. */
  alpha?: number;
  slices?: number;
  /** Slices matching `at` that hold a single train size (nothing to scan). */
  singleSize?: number;
  /** Correction across slices, and how many slices hold a rise after it. */
  correction?: 'benjamini-hochberg' | 'none';
  slicesWithRise?: number;
}
