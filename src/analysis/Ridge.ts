import type { Metric } from '../store/RowTable.js';

/** A double-descent peak along x in one map row. */
export interface Peak {
  /** Refined location (parabola in transformed x), data units. */
  x: number;
  /** Bootstrap (or curve-noise) interval of the location, data units. */
  low: number;
  high: number;
  /** Mean metric at the peak cell. */
  error: number;
  /** Height over the higher of the two flanking minima, in metric units. */
  prominence: number;
  /** Prominence divided by the pooled standard error. */
  prominenceSe: number;
  /** The measured x of the cell holding the maximum. */
  cellX: number;
  /** Seeds behind the peak cell's mean. */
  seeds?: number;
  /**
   * Search-wide p-value: how often a flat row of pure noise with the same per-cell noise has a
   * bump at least this many SE tall anywhere. Absent when the check was not run.
   */
  p?: number;
  /** p adjusted for the rows scanned (Benjamini–Hochberg); the peak counts when this is below alpha. */
  pAdjusted?: number;
  /**
   * True when the peak was found on a smoothed single-value curve (one seed, or means with no
   * seed spread): error and prominence are those of the smooth, the interval a residual bootstrap.
   */
  smoothed?: boolean;
  /** Octaves of rise before the peak and of fall after it, along the smooth. */
  rise?: number;
  fall?: number;
}

export interface RidgeRow {
  y: number;
  peak: Peak | null;
  /** Further significant peaks in the row, less prominent than `peak`. */
  others: Peak[];
  /** Smallest x with mean train error <= epsilon; null when not reached. */
  threshold: number | null;
  /**
   * True when train error is already <= epsilon at the first cell of the row (last, for
   * train_size): the threshold lies at or beyond the sweep's edge and `threshold` is that edge.
   */
  thresholdAtEdge?: boolean;
  /** peak.x / threshold, null when either is missing. */
  ratio: number | null;
  /** Where the noise scale came from: seeds (≥ 2 per cell) or the curve itself (single seed). */
  noiseFrom: 'seeds' | 'curve';
  /** The per-seed (seeds) or per-point (curve) noise standard deviation used, metric units. */
  noiseSd?: number;
  /**
   * When `peak` is null: the most prominent local maximum, which fell short of the prominence
   * bar (a bump inside seed noise); its low/high are its cell x. Null when the row has no local maximum.
   */
  insideNoise?: Peak | null;
  /** cells: peaks of the cell means; smoothed-curve: peaks of the smoothed single-value curve. */
  model?: 'cells' | 'smoothed-curve';
  /** Smoothing bandwidth (kernel sd, octaves) of a smoothed-curve row. */
  bandwidth?: number;
  /** The smooth of a smoothed-curve row, at its bins (x in data units). */
  smooth?: { x: number[]; y: number[] };
}

export interface RidgeResult {
  map: string;
  x: string;
  y: string;
  metric: Metric;
  fixed: Record<string, number | string>;
  minProminence: number;
  epsilon: number;
  /** Bootstrap rounds, random seed and interval coverage used. */
  boot?: number;
  seed?: number;
  level?: number;
  /** Search-wide significance level of a peak. */
  alpha?: number;
  /** Multiple-testing correction across rows, and the rows in its family. */
  correction?: 'benjamini-hochberg' | 'none';
  rowsScanned?: number;
  /** Smallest rise and fall of a smoothed-curve peak, octaves. */
  minExtent?: number;
  rows: RidgeRow[];
}
