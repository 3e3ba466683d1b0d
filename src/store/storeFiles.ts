import { join } from 'node:path';

/** The files of a store directory. */
export function storeFiles(dir: string) {
  return {
    rows: join(dir, 'rows.arrow'),
    manifest: join(dir, 'manifest.json'),
    rejected: join(dir, 'rejected.csv'),
    lock: join(dir, 'lock'),
    /** Present only while a write is being committed (or after a writer was killed mid-commit). */
    commit: join(dir, 'commit.json'),
  };
}
