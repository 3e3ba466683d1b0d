import { mkdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { RowTable } from './RowTable.js';
import type { Manifest } from './Manifest.js';
import type { Reject } from './Reject.js';
import { writeAll, writeSynced } from './atomicWrite.js';
import { formatRejected } from './rejectedCsv.js';
import { COMMIT_KEY, rowsToArrow } from './rowsArrow.js';
import { storeFiles } from './storeFiles.js';
import { commitFiles, tmpName } from './storeCommit.js';

/**
 * Writes a store (call under its lock). The three files are written beside their targets, then
 * committed together (storeCommit.ts): a process killed at any point leaves the old store or the
 * new one, never a mix. rows.arrow and manifest.json carry the same commit id, so a reader can
 * tell that the two belong together.
 */
export function writeStore(opts: { dir: string; table: RowTable; manifest: Manifest; rejected: readonly Reject[] }): void {
  const { dir, table, manifest, rejected } = opts;
  mkdirSync(dir, { recursive: true });
  const f = storeFiles(dir);
  // node:crypto loads here, not with the module: commands that only read the store never need it.
  const { randomBytes } = createRequire(import.meta.url)('node:crypto') as typeof import('node:crypto');
  const commit = randomBytes(8).toString('hex');
  const tmp = { rejected: tmpName(f.rejected, commit), rows: tmpName(f.rows, commit), manifest: tmpName(f.manifest, commit) };
  writeSynced(tmp.rejected, formatRejected(rejected));
  writeSynced(tmp.rows, (fd) => {
    // Small chunks are copied into one reused buffer so the file gets few large writes; a large
    // one (a whole number column) goes straight to the file: copying 100 MB through gather
    // buffers cost more than the writes it saved.
    const staging = Buffer.allocUnsafeSlow(1 << 20);
    let size = 0;
    const flush = () => {
      if (size > 0) writeAll(fd, staging.subarray(0, size));
      size = 0;
    };
    rowsToArrow(
      table,
      {
        write(b) {
          if (b.byteLength >= 1 << 18) {
            flush();
            writeAll(fd, b);
            return;
          }
          if (size + b.byteLength > staging.byteLength) flush();
          staging.set(b, size);
          size += b.byteLength;
        },
      },
      { [COMMIT_KEY]: commit },
    );
    flush();
  });
  writeSynced(tmp.manifest, `${JSON.stringify({ ...manifest, commit, rows: table.length, extra: Object.keys(table.extra) }, null, 2)}\n`);
  commitFiles(dir, commit, [
    { tmp: tmp.rejected, target: f.rejected },
    { tmp: tmp.rows, target: f.rows },
    { tmp: tmp.manifest, target: f.manifest },
  ]);
}
