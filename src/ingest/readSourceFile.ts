import { readFileSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { FileStamp } from '../store/Manifest.js';
import { formatOfBytes, rawFromBytes, readConfigFile } from './readSource.js';
import type { SourceFormat } from './readSource.js';
import { normalizeRaw } from './normalizeRaw.js';
import type { Normalized, Scale } from './normalizeRaw.js';
import type { Target } from './synonyms.js';
import { NUMERIC_COLUMNS } from '../store/RowTable.js';
import type { RowTable } from '../store/RowTable.js';
import { ingestText } from '../messages.js';
import { dictionaryEncode } from '../store/dictionaryEncode.js';
import { attachTextCodes } from '../store/textCodes.js';

/** Normalisation options in a form that can cross to a worker thread (the regex as text). */
export interface PortableOptions {
  map: Partial<Record<Target, string>>;
  set: Record<string, string>;
  seedFrom: { source: string; flags: string } | null;
  scale: Partial<Record<Target, Scale>>;
}

/** One file to read: its path as given, a run directory's config, and what the store has for it. */
export interface FileJob {
  given: string;
  config?: string;
  mtime: number;
  prevSha?: string;
  prevConfigSha?: string;
  options: PortableOptions;
}

export type FileOutcome =
  | { kind: 'unchanged'; stamp: FileStamp; config?: FileStamp }
  | { kind: 'parsed'; stamp: FileStamp; config?: FileStamp; format: string; norm: Normalized }
  | { kind: 'failed'; stamp: FileStamp; config?: FileStamp; format: string; failure: string };

// node:crypto (~6 ms to load) only once a file is actually read: a re-ingest of unchanged files
// hashes nothing.
const requireHere = createRequire(import.meta.url);
let crypto: typeof import('node:crypto') | null = null;
export const sha256 = (b: Uint8Array) => (crypto ??= requireHere('node:crypto') as typeof import('node:crypto')).createHash('sha256').update(b).digest('hex');

/**
 * Reads, hashes, parses and normalises one file. Pure apart from reading the file, so a pool
 * of worker threads can run it over many files at once.
 */
export function readSourceFile(job: FileJob): FileOutcome {
  let bytes: Uint8Array;
  let stamp: FileStamp = { path: job.given, size: 0, mtime: job.mtime, sha256: '' };
  let config: FileStamp | undefined;
  try {
    bytes = readFileSync(job.given);
    stamp = { path: job.given, size: bytes.byteLength, mtime: job.mtime, sha256: sha256(bytes) };
    if (job.config) {
      const cb = readFileSync(job.config);
      config = { path: job.config, size: cb.byteLength, mtime: statSync(job.config).mtimeMs, sha256: sha256(cb) };
    }
  } catch (err) {
    const e = err as NodeJS.ErrnoException;
    return { kind: 'failed', stamp, config, format: '', failure: ingestText.unreadable(e.code ?? e.message) };
  }
  if (job.prevSha === stamp.sha256 && (!job.config || job.prevConfigSha === config?.sha256)) return { kind: 'unchanged', stamp, config };
  let format = '';
  try {
    format = formatOfBytes(job.given, bytes);
    const raw = rawFromBytes(bytes, format as SourceFormat);
    if (job.config) raw.constants = { ...readConfigFile(job.config), ...raw.constants };
    const o = job.options;
    const norm = normalizeRaw(raw, {
      source: job.given,
      map: o.map,
      set: o.set,
      scale: o.scale,
      seedFrom: o.seedFrom ? new RegExp(o.seedFrom.source, o.seedFrom.flags) : undefined,
    });
    return { kind: 'parsed', stamp, config, format, norm };
  } catch (err) {
    return { kind: 'failed', stamp, config, format, failure: (err as Error).message.split('\n')[0] };
  }
}

/** A RowTable with its text columns as dictionary codes: cheap to post between threads. */
export interface PackedTable {
  length: number;
  numeric: Record<string, Float64Array>;
  extra: Record<string, Float64Array>;
  source_line: Int32Array;
  text: Record<'run' | 'condition' | 'source' | 'status', { dict: string[]; codes: Int32Array }>;
}

export function packTable(t: RowTable): { packed: PackedTable; transfer: ArrayBuffer[] } {
  const numeric: Record<string, Float64Array> = {};
  for (const c of NUMERIC_COLUMNS) numeric[c] = t[c];
  const packed: PackedTable = {
    length: t.length,
    numeric,
    extra: t.extra,
    source_line: t.source_line,
    text: { run: dictionaryEncode(t.run), condition: dictionaryEncode(t.condition), source: dictionaryEncode(t.source), status: dictionaryEncode(t.status) },
  };
  const transfer = [...Object.values(numeric), ...Object.values(t.extra), t.source_line, ...Object.values(packed.text).map((x) => x.codes)]
    .map((a) => a.buffer as ArrayBuffer);
  return { packed, transfer: [...new Set(transfer)] };
}

export function unpackTable(p: PackedTable): RowTable {
  // Built directly (no emptyTable(0) to overwrite: ten typed arrays per file, 2,000 files).
  const n = p.numeric;
  const t: RowTable = {
    length: p.length,
    run: [], condition: [], source: [], status: [], // replaced by the codes below
    source_line: p.source_line,
    seed: n.seed, width: n.width, epochs: n.epochs, train_size: n.train_size, label_noise: n.label_noise,
    test_error: n.test_error, train_error: n.train_error, test_loss: n.test_loss, train_loss: n.train_loss, wall_seconds: n.wall_seconds,
    extra: p.extra,
  };
  // Text stays coded: the merge copies codes, and the string arrays are built only if read.
  attachTextCodes(t, p.text);
  return t;
}
