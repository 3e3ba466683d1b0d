import { describeStore } from '../store/describeStore.js';
import type { StoreDescription } from '../store/describeStore.js';
import { readRejected } from '../store/rejectedCsv.js';
import { readStore } from '../store/readStore.js';
import type { Store } from './Store.js';

/** What `datlas describe --json` prints (DESIGN.md §6; docs/schemas/describe.schema.json). */
export type DescribeResult = StoreDescription;

/** What a store holds, as `datlas describe --json`: a store directory or an opened store. */
export async function describe(store: string | Store): Promise<DescribeResult> {
  const { table, manifest, dir } = typeof store === 'string' ? { ...(await readStore(store)), dir: store } : store;
  return describeStore(table, manifest, readRejected(dir));
}
