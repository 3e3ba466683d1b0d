import { join } from 'node:path';

/** The files of a store directory. */
export function storeFiles(dir: string) {
  return {
    rows: join(dir, 'rows.arrow'),
    manifest: join(dir, 'manifest.json'),
    rejected: join(dir, 'rejected.csv'),
    lock: join(dir, 'lock'),
  };
}
