import { readFileSync } from 'node:fs';
import type { RowTable } from './RowTable.js';
import { emptyTable } from './RowTable.js';
import { STORE_FORMAT } from './Manifest.js';
import type { Manifest } from './Manifest.js';
import { readRowsArrow } from './rowsArrow.js';
import { storeFiles } from './storeFiles.js';
import { readCommit } from './storeCommit.js';
import { UserError } from '../UserError.js';
import { storeText } from '../messages.js';

/**
 * Reads a store file as of its last commit: while a commit is being applied (or was cut short by
 * a killed writer) the new content is still in a temporary beside the target. The temporary may
 * be renamed under our feet; then the target holds the same content. Null when absent.
 */
function readCommitted(dir: string, target: string): Buffer | null {
  const pending = readCommit(dir)?.files.find((f) => f.target === target);
  if (pending) {
    try {
      return readFileSync(pending.tmp);
    } catch {
      // renamed meanwhile: the target is the new file
    }
  }
  try {
    return readFileSync(target);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw err;
  }
}

function parseManifest(dir: string, bytes: Buffer): Manifest {
  let m: Manifest;
  try {
    m = JSON.parse(bytes.toString('utf8')) as Manifest;
  } catch (err) {
    throw new UserError(storeText.badManifest(dir, (err as Error).message));
  }
  if (!m || m.format !== STORE_FORMAT) throw new UserError(storeText.notAStore(dir));
  return m;
}

/** Reads only the manifest (cheap: lets a re-ingest of unchanged files skip rows.arrow). Null when absent. */
export function readManifest(dir: string): Manifest | null {
  const bytes = readCommitted(dir, storeFiles(dir).manifest);
  return bytes ? parseManifest(dir, bytes) : null;
}

/**
 * Reads a store written by `datlas ingest`. Throws UserError (exit 1) when there is none.
 * rows.arrow and manifest.json carry one commit id; a read that straddles a concurrent commit
 * sees two ids (or, for stores without ids, two row counts) and reads again.
 */
export async function readStore(dir: string): Promise<{ table: RowTable; manifest: Manifest }> {
  const f = storeFiles(dir);
  for (let attempt = 0; ; attempt++) {
    const manifest = readManifest(dir);
    if (!manifest) throw new UserError(storeText.noStore(dir));
    const bytes = readCommitted(dir, f.rows);
    let table: RowTable;
    let commit: string | null = null;
    if (!bytes) {
      if (manifest.rows === 0) return { table: emptyTable(0), manifest };
      table = emptyTable(0);
    } else {
      try {
        ({ table, commit } = readRowsArrow(bytes));
      } catch (err) {
        throw new UserError(storeText.badRows(dir, (err as Error).message));
      }
    }
    const sameCommit = manifest.commit === undefined || commit === null ? true : manifest.commit === commit;
    if (sameCommit && table.length === manifest.rows) return { table, manifest };
    if (attempt >= 20) {
      throw new UserError(table.length === manifest.rows ? storeText.mixedWrites(dir) : storeText.inconsistent(dir, manifest.rows, table.length));
    }
    await new Promise((r) => setTimeout(r, 50));
  }
}
