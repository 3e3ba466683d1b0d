import { readFileSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { FileStamp } from '../store/Manifest.js';
import { formatOfBytes, rawFromBytes, readConfigFile } from './readSource.js';
import type { SourceFormat } from './readSource.js';
import { normalizeRaw } from './normalizeRaw.js';
import type { Normalized, Scale } from './normalizeRaw.js';
import type { Target } from './synonyms.js';
import { NUMERIC_COLUMNS } from '../store/RowTable.js';
import type { NumericColumn, RowTable, TextCodes, TextColumn } from '../store/RowTable.js';
import { ingestText } from '../messages.js';
import { dictionaryEncode } from '../store/dictionaryEncode.js';
import { attachTextCodes, lazyProperty, TEXT_COLUMNS } from '../store/textCodes.js';

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

/**
 * A RowTable as a worker posts it: text as dictionary codes, and every number column that holds
 * one value in all rows sent as that value (most columns of a run's log are constant: its
 * configuration, and metrics it never logged). The varying columns share one buffer, so a file's
 * table crosses threads as one transfer of about a third of its size.
 */
export interface PackedTable {
  length: number;
  /** A column, or the value every row holds. */
  numeric: Record<string, Float64Array | number>;
  extra: Record<string, Float64Array>;
  source_line: Int32Array;
  /** `codes` null: every row holds the dictionary's one entry. */
  text: Record<TextColumn, { dict: string[]; codes: Int32Array | null }>;
}

/** The value every element of `a` holds (NaN counts as equal to NaN; -0 and 0 differ), or undefined. */
function constantOf(a: Float64Array): number | undefined {
  if (a.length === 0) return undefined;
  const v = a[0];
  if (v !== v) {
    for (let i = 1; i < a.length; i++) if (a[i] === a[i]) return undefined;
  } else {
    for (let i = 1; i < a.length; i++) if (a[i] !== v) return undefined;
    if (v === 0) for (let i = 0; i < a.length; i++) if (Object.is(a[i], -0) !== Object.is(v, -0)) return undefined;
  }
  return v;
}

export function packTable(t: RowTable): { packed: PackedTable; transfer: ArrayBuffer[] } {
  const n = t.length;
  const numeric: Record<string, Float64Array | number> = {};
  const varying: NumericColumn[] = [];
  for (const c of NUMERIC_COLUMNS) {
    const v = constantOf(t[c]);
    if (v === undefined) varying.push(c);
    else numeric[c] = v;
  }
  const extraNames = Object.keys(t.extra);
  // One fresh buffer for what varies; the full-width table it came from is freed with the file.
  const buffer = Buffer.allocUnsafeSlow((varying.length + extraNames.length) * n * 8 + n * 4).buffer as ArrayBuffer;
  let offset = 0;
  const copy = (a: Float64Array) => {
    const b = new Float64Array(buffer, offset, n);
    b.set(a);
    offset += n * 8;
    return b;
  };
  for (const c of varying) numeric[c] = copy(t[c]);
  const extra: Record<string, Float64Array> = {};
  for (const e of extraNames) extra[e] = copy(t.extra[e]);
  const source_line = new Int32Array(buffer, offset, n);
  source_line.set(t.source_line);
  const transfer = [buffer];
  const text = {} as PackedTable['text'];
  for (const name of TEXT_COLUMNS) {
    const coded = dictionaryEncode(t[name]);
    const single = coded.dict.length === 1;
    text[name] = { dict: coded.dict, codes: single ? null : coded.codes };
    if (!single) transfer.push(coded.codes.buffer as ArrayBuffer);
  }
  return { packed: { length: n, numeric, extra, source_line, text }, transfer };
}

/** Read-only zeros: the codes of text columns with a one-entry dictionary (shared, never written). */
let zeros = new Int32Array(0);
function zeroCodes(n: number): Int32Array {
  if (zeros.length < n) zeros = new Int32Array(Math.max(n, 4096));
  return zeros.subarray(0, n);
}

export function unpackTable(p: PackedTable): RowTable {
  const n = p.length;
  const constants: Partial<Record<NumericColumn, number>> = {};
  const t = {
    length: n,
    run: [], condition: [], source: [], status: [], // replaced by the codes below
    source_line: p.source_line,
    extra: p.extra,
    constants,
  } as unknown as { -readonly [K in keyof RowTable]: RowTable[K] };
  for (const c of NUMERIC_COLUMNS) {
    const v = p.numeric[c];
    if (typeof v !== 'number') {
      t[c] = v;
      continue;
    }
    constants[c] = v;
    // Made only if read; from then on the array is the truth (it may be written to).
    lazyProperty(t, c, () => {
      delete constants[c];
      return new Float64Array(n).fill(v);
    });
  }
  // Text stays coded: the merge copies codes, and the string arrays are built only if read.
  const codes = {} as Record<TextColumn, TextCodes>;
  for (const name of TEXT_COLUMNS) {
    const x = p.text[name];
    codes[name] = { dict: x.dict, codes: x.codes ?? zeroCodes(n) };
  }
  attachTextCodes(t, codes);
  return t;
}
