import { ingestSources } from '../ingest/ingestSources.js';
import type { IngestOptions as SourcesOptions, IngestResult } from '../ingest/ingestSources.js';
import type { Scale } from '../ingest/normalizeRaw.js';
import type { Target } from '../ingest/synonyms.js';
import { ingestText } from '../messages.js';
import { UserError } from '../UserError.js';

/**
 * Options of `ingest()`: those of `datlas ingest` (every option of ingestSources passes through,
 * e.g. `map`, `scale`, `strict`, `wait`), with `set` values as numbers or strings and `seedFrom`
 * as a RegExp or its source text.
 */
export interface IngestOptions extends Omit<SourcesOptions, 'paths' | 'store' | 'set' | 'seedFrom' | 'readStdin'> {
  /** Store directory (default ./atlas-store). */
  store?: string;
  /** canonical column → source column or dotted JSON path (`{ width: 'config.model.width' }`). */
  map?: Partial<Record<Target, string>>;
  /** Values for logs that lack them (`{ label_noise: 0.2 }`); other keys join the condition. */
  set?: Record<string, string | number>;
  /** Regular expression taking the seed from the file path (first group). */
  seedFrom?: RegExp | string;
  /** column → 'percent' | 'fraction', overriding the per-column detection. */
  scale?: Partial<Record<Target, Scale>>;
  /** Any rejected row fails the ingest and leaves the store unchanged (`strictFailed` in the result). */
  strict?: boolean;
  /** Seconds to wait for another ingest holding the store lock (default 30). */
  wait?: number;
  /** Keep notes (unreadable paths, skipped columns) off stderr; they are in the result either way. */
  quiet?: boolean;
}

/** What `datlas ingest --json` prints: read == accepted + duplicates + rejected + pending + skipped. */
export interface IngestSummary {
  read: number;
  accepted: number;
  duplicates: number;
  rejected: number;
  pending: number;
  skipped: number;
  conflicts: number;
  sources: number;
  unchanged: number;
  failed: number;
  displaced: number;
  storeRows: number;
  storeSources: number;
  wrote: boolean;
  strictFailed: boolean;
  /** canonical column → where it came from in this ingest's sources (several joined by ' | '). */
  mapping: IngestResult['mapping'];
  /** The layouts read (one per distinct shape of source), with their column mappings. */
  layouts: IngestResult['layouts'];
  store: string;
  missing: string[];
  rejectedFile: string;
  notes: string[];
}

/** The JSON form of an ingest's result (shared by the CLI's --json and `ingest()`). */
export function ingestSummary(r: IngestResult, store: string): IngestSummary {
  const { rejects: _rejects, notes, missing, ...counts } = r;
  return { ...counts, store, missing, rejectedFile: `${store}/rejected.csv`, notes };
}

/**
 * Merges run logs into a store, as `datlas ingest PATH...`: every row read ends in the store, the
 * duplicates count, or rejected.csv. Throws a UserError when no path names a readable source.
 */
export async function ingest(paths: string | string[], opts: IngestOptions = {}): Promise<IngestSummary> {
  const { store = 'atlas-store', set = {}, quiet = false, seedFrom: seedText, ...rest } = opts;
  const list = typeof paths === 'string' ? [paths] : [...paths];
  if (list.length === 0) throw new UserError(ingestText.noPaths);
  let seedFrom = seedText instanceof RegExp ? seedText : undefined;
  if (typeof seedText === 'string') {
    try {
      seedFrom = new RegExp(seedText);
    } catch (err) {
      throw new UserError(ingestText.badSeedFrom(seedText, (err as Error).message), 2);
    }
  }
  const r = await ingestSources({ ...rest, paths: list, store, set: Object.fromEntries(Object.entries(set).map(([k, v]) => [k, String(v)])), seedFrom });
  if (!quiet) for (const note of r.notes) process.stderr.write(`note: ${note}\n`);
  if (r.sources === 0) throw new UserError(r.missing.length ? ingestText.cannotOpen(r.missing[0], 'ENOENT') : ingestText.nothingFound(list.join(' ')));
  return ingestSummary(r, store);
}
