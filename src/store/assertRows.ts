import { UserError } from '../UserError.js';
import { storeText } from '../messages.js';
import type { RowTable } from './RowTable.js';

/** A command that draws or analyses the sweep cannot work on a store with no rows: say so (exit 1). */
export function assertRows(table: RowTable, dir: string): void {
  if (table.length === 0) throw new UserError(storeText.empty(dir));
}
