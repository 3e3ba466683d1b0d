import { readStore } from '../store/readStore.js';
import { Store } from './Store.js';
import type { Arquero } from './Store.js';

/**
 * Opens a store written by `datlas ingest` (or `ingest()`): reads rows.arrow and manifest.json as
 * of the last commit. Throws a UserError when `dir` holds no store.
 */
export async function openStore(dir: string): Promise<Store> {
  const [{ table, manifest }, arquero] = await Promise.all([readStore(dir), import('arquero') as Promise<Arquero>]);
  return new Store({ dir, manifest, table, arquero });
}
