import type { Metric } from '../store/RowTable.js';

/** A stretch of train sizes over which more data raised test error. */
export interface HurtsSegment {
  /** The slice it was found in: width, epochs, label_noise, condition. */
  fixed: Record<string, number | string>;
  /** Last train size before the rise. */
  onset: number;
  /** Train size at the top of the rise. */
  peak: number;
  /** Train size where the error falls back to the onset level (interpolated in log size); null when not reached. */
  recovery: number | null;
  /** Mean error at the peak minus mean error at the onset. */
  rise: number;
  /** p-value of the rise (Welch t-test, or bootstrap when a cell has one seed). */
  p: number;
  test: 'welch' | 'bootstrap';
}

export interface HurtsResult {
  metric: Metric;
  fixed: Record<string, number | string>;
  segments: HurtsSegment[];
}
