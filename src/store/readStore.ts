import { existsSync, readFileSync } from 'node:fs';
import type { RowTable } from './RowTable.js';
import { emptyTable } from './RowTable.js';
import { STORE_FORMAT } from './Manifest.js';
import type { Manifest } from './Manifest.js';
import { rowsFromArrow } from './rowsArrow.js';
import { storeFiles } from './storeFiles.js';
import { UserError } from '../UserError.js';
import { storeText } from '../messages.js';

/** Reads only the manifest (cheap: lets a re-ingest of unchanged files skip rows.arrow). Null when absent. */
export function readManifest(dir: string): Manifest | null {
  const f = storeFiles(dir);
  if (!existsSync(f.manifest)) return null;
  let m: Manifest;
  try {
    m = JSON.parse(readFileSync(f.manifest, 'utf8')) as Manifest;
  } catch (err) {
    throw new UserError(storeText.badManifest(dir, (err as Error).message));
  }
  if (m.format !== STORE_FORMAT) throw new UserError(storeText.notAStore(dir));
  return m;
}

/**
 * Reads a store written by `datlas ingest`. Throws UserError (exit 1) when there is none.
 * An ingest renames rows.arrow just before manifest.json; a read that falls between the two
 * sees different row counts and tries again briefly before calling the store inconsistent.
 */
export async function readStore(dir: string): Promise<{ table: RowTable; manifest: Manifest }> {
  for (let attempt = 0; ; attempt++) {
    const manifest = readManifest(dir);
    if (!manifest) throw new UserError(storeText.noStore(dir));
    const f = storeFiles(dir);
    let table: RowTable;
    if (!existsSync(f.rows)) {
      if (manifest.rows === 0) return { table: emptyTable(0), manifest };
      table = emptyTable(0);
    } else {
      try {
        table = rowsFromArrow(readFileSync(f.rows));
      } catch (err) {
        throw new UserError(storeText.badRows(dir, (err as Error).message));
      }
    }
    if (table.length === manifest.rows) return { table, manifest };
    if (attempt >= 5) throw new UserError(storeText.inconsistent(dir, manifest.rows, table.length));
    await new Promise((r) => setTimeout(r, 100));
  }
}
