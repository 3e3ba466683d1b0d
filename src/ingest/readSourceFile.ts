import { closeSync, fstatSync, openSync, readFileSync, readSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { FileStamp } from '../store/Manifest.js';
import { formatOfBytes, rawFromBytes, readConfigFile } from './readSource.js';
import type { SourceFormat } from './readSource.js';
import type { ReadLimits } from './ReadLimits.js';
import { normalizeRaw } from './normalizeRaw.js';
import { hasConfigPrefix } from './fieldKinds.js';
import type { Normalized, Scale } from './normalizeRaw.js';
import type { Target } from './synonyms.js';
import { NUMERIC_COLUMNS } from '../store/RowTable.js';
import type { NumericColumn, RowTable, RunStatus, TextCodes, TextColumn } from '../store/RowTable.js';
import { ingestText } from '../messages.js';
import { dictionaryEncode } from '../store/dictionaryEncode.js';
import { decodeCodes, TEXT_COLUMNS } from '../store/textCodes.js';

/** Normalisation options in a form that can cross to a worker thread (the regex as text). */
export interface PortableOptions {
  map: Partial<Record<Target, string>>;
  set: Record<string, string>;
  seedFrom: { source: string; flags: string } | null;
  scale: Partial<Record<Target, Scale>>;
  /** Names of a JSON document's value-key levels (`--keys`). */
  keys?: string[];
  /** Columns that join the condition (`--condition`). */
  condition?: string[];
  /** What one line may hold (ReadLimits; plain numbers, so it crosses threads as is). */
  limits?: ReadLimits;
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

/** The buffer files are read into, reused from file to file (grown as needed). */
let scratch = Buffer.allocUnsafeSlow(1 << 16);

/**
 * A file's bytes in the reused buffer: valid until the next call. A fresh buffer per file (what
 * readFileSync gives) is fresh memory each time, and faulting it in was the largest single cost of
 * a worker's reading (~0.25 s over 1,000 files). Nothing read from the bytes keeps a view of
 * them: text is decoded to a string, Arrow columns are copied.
 */
function readReused(path: string): Buffer {
  const fd = openSync(path, 'r');
  try {
    let size = fstatSync(fd).size;
    let n = 0;
    for (;;) {
      if (scratch.length < size + 1) {
        // Grown keeping what was read so far (a file that grew while it was read).
        const bigger = Buffer.allocUnsafeSlow(Math.max(size + 1, scratch.length * 2));
        bigger.set(scratch.subarray(0, n));
        scratch = bigger;
      }
      // One byte of room past the stated size tells a file that grew since the stat.
      const got = readSync(fd, scratch, n, scratch.length - n, null);
      if (got === 0) break;
      n += got;
      if (n === scratch.length) size = n * 2;
    }
    return scratch.subarray(0, n);
  } finally {
    closeSync(fd);
  }
}

/**
 * Reads, hashes, parses and normalises one file. Pure apart from reading the file, so a pool
 * of worker threads can run it over many files at once.
 */
export function readSourceFile(job: FileJob): FileOutcome {
  let bytes: Uint8Array;
  let stamp: FileStamp = { path: job.given, size: 0, mtime: job.mtime, sha256: '' };
  let config: FileStamp | undefined;
  try {
    bytes = readReused(job.given);
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
    const o = job.options;
    const raw = rawFromBytes(bytes, format as SourceFormat, { limits: o.limits, source: job.given, keys: o.keys });
    if (job.config) {
      raw.constants = { ...readConfigFile(job.config), ...raw.constants };
      // Beside a config file the metrics file holds outcomes: its scalars never split conditions
      // (key levels and config-like blocks inside it still do).
      if (raw.settingColumns) {
        const levels = new Set((raw.jsonLayout?.levels ?? []).map((l) => l.column));
        const keep = (c: string) => levels.has(c) || hasConfigPrefix(c);
        raw.outcomeColumns = new Set([...raw.settingColumns].filter((c) => !keep(c)));
        raw.settingColumns = new Set([...raw.settingColumns].filter(keep));
      }
    }
    const norm = normalizeRaw(raw, {
      source: job.given,
      map: o.map,
      set: o.set,
      scale: o.scale,
      condition: o.condition,
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
  return new WorkerTable(p);
}

/**
 * A worker's table on this thread. Constant number columns are built only when read (reading
 * one drops its `constants` entry: the array is then the truth and may be written to); text
 * stays coded, its strings decoded only when read. Getters on the class, not per-table
 * properties: 2,000 tables with a dozen defined properties each cost the main thread ~75 ms while
 * the workers ran, and left objects slow to index.
 */
class WorkerTable implements RowTable {
  readonly length: number;
  readonly source_line: Int32Array;
  readonly extra: Record<string, Float64Array>;
  readonly constants: Partial<Record<NumericColumn, number>> = {};
  readonly codes: Record<TextColumn, TextCodes>;
  private readonly numeric: Record<string, Float64Array | number>;
  private readonly strings: Partial<Record<TextColumn, string[]>> = {};

  constructor(p: PackedTable) {
    const n = p.length;
    this.length = n;
    this.source_line = p.source_line;
    this.extra = p.extra;
    this.numeric = p.numeric;
    for (const c of NUMERIC_COLUMNS) {
      const v = p.numeric[c];
      if (typeof v === 'number') this.constants[c] = v;
    }
    const x = p.text;
    const coded = (name: TextColumn): TextCodes => ({ dict: x[name].dict, codes: x[name].codes ?? zeroCodes(n) });
    this.codes = { run: coded('run'), condition: coded('condition'), source: coded('source'), status: coded('status') };
  }

  private num(c: NumericColumn): Float64Array {
    const v = this.numeric[c];
    if (typeof v !== 'number') return v;
    const built = new Float64Array(this.length).fill(v);
    this.numeric[c] = built;
    delete this.constants[c];
    return built;
  }

  private text(name: TextColumn): string[] {
    return (this.strings[name] ??= decodeCodes(this.codes[name]));
  }

  get seed() { return this.num('seed'); }
  get width() { return this.num('width'); }
  get epochs() { return this.num('epochs'); }
  get train_size() { return this.num('train_size'); }
  get label_noise() { return this.num('label_noise'); }
  get test_error() { return this.num('test_error'); }
  get train_error() { return this.num('train_error'); }
  get test_loss() { return this.num('test_loss'); }
  get train_loss() { return this.num('train_loss'); }
  get wall_seconds() { return this.num('wall_seconds'); }
  get run() { return this.text('run'); }
  get condition() { return this.text('condition'); }
  get source() { return this.text('source'); }
  get status() { return this.text('status') as RunStatus[]; }
}
