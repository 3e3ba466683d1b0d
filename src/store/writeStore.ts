import { mkdirSync } from 'node:fs';
import type { RowTable } from './RowTable.js';
import type { Manifest } from './Manifest.js';
import type { Reject } from '../ingest/normalizeRaw.js';
import { atomicWrite } from './atomicWrite.js';
import { formatRejected } from './rejectedCsv.js';
import { rowsToArrow } from './rowsArrow.js';
import { storeFiles } from './storeFiles.js';

/**
 * Writes a store (call under its lock). Each file is written atomically; the manifest goes last,
 * so a reader that finds a manifest finds the rows it describes (their count is checked on read).
 */
export function writeStore(opts: { dir: string; table: RowTable; manifest: Manifest; rejected: readonly Reject[] }): void {
  const { dir, table, manifest, rejected } = opts;
  mkdirSync(dir, { recursive: true });
  const f = storeFiles(dir);
  atomicWrite(f.rejected, formatRejected(rejected));
  atomicWrite(f.rows, rowsToArrow(table));
  atomicWrite(f.manifest, `${JSON.stringify({ ...manifest, rows: table.length, extra: Object.keys(table.extra) }, null, 2)}\n`);
}
