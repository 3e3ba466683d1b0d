import { findHurts as hurtsOfCells } from '../analysis/findHurts.js';
import type { HurtsOptions as CellHurtsOptions } from '../analysis/findHurts.js';
import type { HurtsResult } from '../analysis/Hurts.js';
import { buildCells } from '../cells/buildCells.js';
import { analysisText } from '../messages.js';
import { defaultMetric } from '../store/RowTable.js';
import type { Metric } from '../store/RowTable.js';
import { UserError } from '../UserError.js';
import { rowsOf } from './rowsOf.js';
import type { RowsInput } from './rowsOf.js';

export interface HurtsOptions extends CellHurtsOptions {
  /** Metric (default test_error, or test_loss when the rows have no error). */
  metric?: Metric;
}

/**
 * Where more data hurts, as `datlas hurts --json`: along train_size at each fixed width, epochs,
 * noise and condition (or those `at` fixes), each significant rise with onset, peak, recovery and
 * p. Throws a UserError when no slice matches `at` or every slice holds one train size.
 */
export function findHurts(rows: RowsInput, opts: HurtsOptions = {}): HurtsResult {
  const table = rowsOf(rows);
  const { metric = defaultMetric(table), at = {}, ...rest } = opts;
  // A fixed epoch budget need not be logged exactly: runs are aligned to it along their own curves.
  const epochs = typeof at.epochs === 'number' ? [at.epochs] : undefined;
  const result = hurtsOfCells(buildCells(table, { metric, epochs }), { ...rest, at });
  if (result.slices === 0) throw new UserError(result.singleSize ? analysisText.hurtsOneSize(result.singleSize) : analysisText.noCells(at));
  return result;
}
