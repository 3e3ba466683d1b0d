/** manifest.json of a store: what was ingested, from where, how it was mapped, and the counts. */
export const STORE_FORMAT = 'descent-atlas-store';
export const STORE_VERSION = 1;

export interface FileStamp {
  path: string;
  size: number;
  /** Modification time, ms since the epoch. */
  mtime: number;
  sha256: string;
}

export interface IngestCounts {
  read: number;
  accepted: number;
  duplicates: number;
  rejected: number;
  pending: number;
  /** Records read that are not runs (summaries over seeds); absent in stores written before it. */
  skipped?: number;
}

export interface SourceEntry extends FileStamp, IngestCounts {
  /** Format read (csv, tsv, text, jsonl, json, arrow). */
  format: string;
  /** A run directory's config file, when the source is one. */
  config?: FileStamp;
  /** canonical column → where it came from in this source (what `describe` shows). */
  mapping: Record<string, string>;
  /** canonical column → other columns of this source that could have served, passed over. */
  passedOver?: Record<string, string[]>;
  ingestedAt: string;
}

export interface MappingOptions {
  map: Record<string, string>;
  set: Record<string, string>;
  seedFrom: string | null;
  scale: Record<string, string>;
}

export interface Manifest {
  format: typeof STORE_FORMAT;
  version: number;
  updated: string;
  /** Rows in rows.arrow (checked on read). */
  rows: number;
  /** Id of the write that made this store; rows.arrow carries the same id in its schema metadata. */
  commit?: string;
  /** Extra numeric columns carried beside the canonical ones. */
  extra: string[];
  /** Keyed by absolute path (or `-:<sha256>` for stdin). */
  sources: Record<string, SourceEntry>;
  /** Options of the last ingest. */
  mapping: MappingOptions;
  /** Counts of the last ingest (read == accepted + duplicates + rejected + pending + skipped). */
  counts: IngestCounts & { conflicts: number };
}

export function emptyManifest(): Manifest {
  return {
    format: STORE_FORMAT,
    version: STORE_VERSION,
    updated: new Date(0).toISOString(),
    rows: 0,
    extra: [],
    sources: {},
    mapping: { map: {}, set: {}, seedFrom: null, scale: {} },
    counts: { read: 0, accepted: 0, duplicates: 0, rejected: 0, pending: 0, skipped: 0, conflicts: 0 },
  };
}
