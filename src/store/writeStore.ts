import { mkdirSync } from 'node:fs';
import type { RowTable } from './RowTable.js';
import type { Manifest } from './Manifest.js';
import type { Reject } from '../ingest/normalizeRaw.js';
import { atomicWrite, writeAll } from './atomicWrite.js';
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
  atomicWrite(f.rows, (fd) => {
    // Small chunks are gathered so the file gets few large writes.
    let parts: Uint8Array[] = [];
    let size = 0;
    const flush = () => {
      if (size === 0) return;
      writeAll(fd, parts.length === 1 ? parts[0] : Buffer.concat(parts, size));
      parts = [];
      size = 0;
    };
    rowsToArrow(table, {
      write(b) {
        parts.push(b);
        size += b.byteLength;
        if (size >= 1 << 20) flush();
      },
    });
    flush();
  });
  atomicWrite(f.manifest, `${JSON.stringify({ ...manifest, rows: table.length, extra: Object.keys(table.extra) }, null, 2)}\n`);
}
