import { existsSync, readFileSync, statSync } from 'node:fs';
import { emptyTable } from '../store/RowTable.js';
import type { RowTable } from '../store/RowTable.js';
import { emptyManifest, STORE_FORMAT, STORE_VERSION } from '../store/Manifest.js';
import type { FileStamp, Manifest, SourceEntry } from '../store/Manifest.js';
import { lockStore } from '../store/storeLock.js';
import { readManifest, readStore } from '../store/readStore.js';
import { writeStore } from '../store/writeStore.js';
import { parseRejected } from '../store/rejectedCsv.js';
import { storeFiles } from '../store/storeFiles.js';
import { atomicWrite } from '../store/atomicWrite.js';
import { rawFromBytes, sniffFormat } from './readSource.js';
import type { SourceFormat } from './readSource.js';
import { sha256 } from './readSourceFile.js';
import type { FileJob, PortableOptions } from './readSourceFile.js';
import { parseFiles } from './parseFiles.js';
import { normalizeRaw } from './normalizeRaw.js';
import type { Normalized, Scale } from './normalizeRaw.js';
import type { Reject } from '../store/Reject.js';
import { dropSources, mergeTables } from './mergeTables.js';
import { walkInputs } from './walkInputs.js';
import type { InputSource } from './walkInputs.js';
import type { Target } from './synonyms.js';
import { ingestText } from '../messages.js';
import { groupLayouts, mergedMapping } from './groupLayouts.js';
import type { LayoutGroup } from './groupLayouts.js';
import { DEFAULT_LIMITS } from './ReadLimits.js';
import type { ReadLimits } from './ReadLimits.js';

export interface IngestOptions {
  paths: string[];
  store: string;
  map?: Partial<Record<Target, string>>;
  set?: Record<string, string>;
  seedFrom?: RegExp;
  scale?: Partial<Record<Target, Scale>>;
  /** Names of a JSON document's value-key levels, outermost first (`--keys seed,label_noise`). */
  keys?: string[];
  /** Columns that join the condition whatever they hold (`--condition COL`). */
  condition?: string[];
  /** Any rejection fails the ingest and leaves the store untouched. */
  strict?: boolean;
  /** Seconds to wait for another ingest's lock. */
  wait?: number;
  /** What one line may hold; defaults: DEFAULT_LIMITS (README, "Limits"). */
  limits?: Partial<ReadLimits>;
  /** Reads stdin when a path is `-`. */
  readStdin?: () => Uint8Array;
  /** Worker threads for parsing (default: by core count, when there is enough to read). */
  workers?: number;
  minBytesForWorkers?: number;
  /** Makes a progress reporter once the number of sources is known (ticked once per source). */
  progress?: (total: number) => Promise<{ tick(): void; done(): void }>;
}

export interface IngestResult {
  read: number;
  accepted: number;
  duplicates: number;
  rejected: number;
  pending: number;
  /** Records read that are not runs (blocks of means over seeds): counted, never stored. */
  skipped: number;
  conflicts: number;
  /** Sources named or found this time. */
  sources: number;
  /** Sources skipped because their content was already in the store. */
  unchanged: number;
  /** Sources that could not be read at all (each counted as one rejected record). */
  failed: number;
  /** Rows stored earlier that lost a conflict to a newer source. */
  displaced: number;
  /** Rows and sources in the store afterwards. */
  storeRows: number;
  storeSources: number;
  /** Whether the store was written. */
  wrote: boolean;
  /** Under --strict with rejections: nothing was written. */
  strictFailed: boolean;
  /** Paths that do not exist. */
  missing: string[];
  /**
   * Every input passed over, with the reason: named paths that cannot be opened, link loops,
   * dangling links, named pipes and other special files, compressed files, other file types.
   */
  skippedSources: { path: string; reason: string }[];
  /** This ingest's rejections (all of them; rejected.csv holds the store's). */
  rejects: Reject[];
  notes: string[];
  /** canonical → source column(s) this ingest read. */
  mapping: Record<string, string>;
  /** Sources grouped by how they were read. */
  layouts: LayoutGroup[];
}


interface Parsed {
  src: InputSource;
  key: string;
  given: string;
  stamp: FileStamp;
  config?: FileStamp;
  format: string;
  norm: Normalized | null;
  failure: string | null;
}

/**
 * Merges log files into a store: walk, skip unchanged sources (size+mtime, then content hash),
 * parse and normalise the rest, merge with dedupe and conflict resolution, write atomically
 * under the store lock. Every row read is accounted for in the result.
 */
export async function ingestSources(opts: IngestOptions): Promise<IngestResult> {
  const { store, map = {}, set = {}, seedFrom, scale = {}, strict = false, wait = 30 } = opts;
  const walk = walkInputs(opts.paths, { skip: [store] });
  const result: IngestResult = {
    read: 0, accepted: 0, duplicates: 0, rejected: 0, pending: 0, skipped: 0, conflicts: 0, sources: walk.sources.length, unchanged: 0,
    failed: 0, displaced: 0, storeRows: 0, storeSources: 0, wrote: false, strictFailed: false,
    missing: walk.missing.map((m) => m.path), rejects: [], notes: [], mapping: {}, layouts: [],
    skippedSources: [...walk.missing.map((m) => ({ path: m.path, reason: m.reason === 'ENOENT' ? 'no such file or folder' : m.reason })), ...walk.skipped.map((s) => ({ path: s.path, reason: s.reason }))],
  };
  for (const m of walk.missing) result.notes.push(ingestText.cannotOpen(m.path, m.reason));
  const other = walk.skipped.filter((s) => s.other);
  for (const s of walk.skipped) if (!s.other) result.notes.push(ingestText.skippedSource(s.path, s.reason));
  if (other.length > 0) result.notes.push(ingestText.otherFiles(other.length, other.slice(0, 3).map((s) => s.path)));
  if (walk.sources.length === 0) return result;

  const lock = await lockStore(store, wait);
  try {
    const manifest: Manifest = readManifest(store) ?? emptyManifest();
    const todo: Parsed[] = [];
    const touched = { value: false };
    const bar = opts.progress ? await opts.progress(walk.sources.length) : null;
    const options: PortableOptions = {
      map, set, scale, seedFrom: seedFrom ? { source: seedFrom.source, flags: seedFrom.flags } : null, keys: opts.keys, condition: opts.condition,
      limits: { ...DEFAULT_LIMITS, ...opts.limits },
    };
    // Stat first: a source with the stored size and mtime is unchanged (no read, no hash).
    const jobs: FileJob[] = [];
    const jobSrc: InputSource[] = [];
    const sizes: number[] = [];
    for (const src of walk.sources) {
      if (src.kind === 'stdin') {
        const p = readStdinSource(src, manifest, options, opts.readStdin);
        bar?.tick();
        if (p) todo.push(p);
        else result.unchanged++;
        continue;
      }
      const prev = manifest.sources[src.key];
      let st: { size: number; mtimeMs: number };
      let cst: { size: number; mtimeMs: number } | null = null;
      try {
        st = src.size !== undefined && src.mtime !== undefined ? { size: src.size, mtimeMs: src.mtime } : statSync(src.given);
        if (src.config) cst = statSync(src.config);
      } catch (err) {
        const e = err as NodeJS.ErrnoException;
        bar?.tick();
        todo.push({ src, key: src.key, given: src.given, stamp: { path: src.given, size: 0, mtime: 0, sha256: '' }, format: '', norm: null, failure: ingestText.unreadable(e.code ?? e.message) });
        continue;
      }
      const sameConfig = !src.config || (prev?.config && cst && prev.config.size === cst.size && prev.config.mtime === cst.mtimeMs);
      if (prev && prev.size === st.size && prev.mtime === st.mtimeMs && sameConfig) {
        result.unchanged++;
        bar?.tick();
        continue;
      }
      jobs.push({ given: src.given, config: src.config, mtime: st.mtimeMs, prevSha: prev?.sha256, prevConfigSha: prev?.config?.sha256, options });
      jobSrc.push(src);
      sizes.push(st.size);
    }
    const outcomes = await parseFiles(jobs, sizes, { workers: opts.workers, minBytesForWorkers: opts.minBytesForWorkers, onFile: () => bar?.tick() });
    outcomes.forEach((o, k) => {
      const src = jobSrc[k];
      if (o.kind === 'unchanged') {
        // Touched but not changed: remember the new stamp so the next check is fast again.
        const prev = manifest.sources[src.key];
        prev.mtime = o.stamp.mtime;
        if (o.config) prev.config = o.config;
        touched.value = true;
        result.unchanged++;
        return;
      }
      todo.push({
        src, key: src.key, given: src.given, stamp: o.stamp, config: o.config, format: o.format,
        norm: o.kind === 'parsed' ? o.norm : null, failure: o.kind === 'failed' ? o.failure : null,
      });
    });
    bar?.done();
    if (todo.length === 0) {
      // Touched-but-unchanged sources got new stamps: keep the next check on the fast path.
      if (touched.value) atomicWrite(storeFiles(store).manifest, `${JSON.stringify(manifest, null, 2)}\n`);
      result.storeRows = manifest.rows;
      result.storeSources = Object.keys(manifest.sources).length;
      return result;
    }

    // Earlier rows and rejections of re-read sources are replaced.
    const replaced = new Set<string>();
    for (const p of todo) {
      replaced.add(p.given);
      const prev = manifest.sources[p.key];
      if (prev) replaced.add(prev.path);
    }
    const files = storeFiles(store);
    const existing: RowTable = existsSync(files.manifest) ? (await readStore(store)).table : emptyTable(0);
    const kept = dropSources(existing, replaced);
    const oldRejects = existsSync(files.rejected) ? parseRejected(readFileSync(files.rejected, 'utf8')).filter((r) => !replaced.has(r.source)) : [];

    // A plan file found among the logs is named and passed over whole (its rows are not results).
    for (const p of todo) {
      if (!p.norm?.notLog) continue;
      result.skippedSources.push({ path: p.given, reason: p.norm.notLog });
      result.notes.push(ingestText.skippedSource(p.given, p.norm.notLog));
    }
    const ok = todo.filter((p) => p.norm && !p.norm.notLog);
    result.layouts = groupLayouts(ok.filter((p) => p.norm!.layout).map((p) => ({ source: p.given, layout: p.norm!.layout! })));
    result.mapping = mergedMapping(result.layouts);
    const mtimeBySource = new Map<string, number>();
    for (const e of Object.values(manifest.sources)) mtimeBySource.set(e.path, e.mtime);
    const merged = mergeTables({
      existing: kept,
      existingMtime: (s) => mtimeBySource.get(s) ?? 0,
      incoming: ok.map((p) => ({ table: p.norm!.table, mtime: p.stamp.mtime })),
    });

    const now = new Date().toISOString();
    const rejects: Reject[] = [];
    ok.forEach((p, k) => {
      const n = p.norm!;
      const rejected = n.rejects.length + merged.conflictLost[k];
      result.read += n.read;
      result.accepted += merged.accepted[k];
      result.duplicates += merged.duplicates[k];
      result.rejected += rejected;
      result.pending += n.pending;
      result.skipped += n.skipped;
      rejects.push(...n.rejects);
      result.notes.push(...n.notes);
      // Fields named, not spread: spreading a stamp that came from a worker (a deserialised
      // object) cost ~25 µs each, 50 ms over 2,000 sources.
      const entry: SourceEntry = {
        path: p.given, size: p.stamp.size, mtime: p.stamp.mtime, sha256: p.stamp.sha256, format: p.format, mapping: n.mapping, ingestedAt: now,
        read: n.read, accepted: merged.accepted[k], duplicates: merged.duplicates[k], rejected, pending: n.pending, skipped: n.skipped,
      };
      if (n.layout && Object.keys(n.layout.passedOver).length > 0) entry.passedOver = n.layout.passedOver;
      if (p.config) entry.config = p.config;
      manifest.sources[p.key] = entry;
    });
    for (const p of todo) {
      if (p.norm) continue;
      result.failed++;
      result.read++;
      result.rejected++;
      rejects.push({ source: p.given, line: 0, field: '', reason: p.failure! });
      delete manifest.sources[p.key]; // retried next time
    }
    rejects.push(...merged.rejects);
    if (merged.merged > 0) result.notes.push(ingestText.mergedRows(merged.merged));
    result.conflicts = merged.conflicts;
    result.displaced = merged.displaced;
    result.rejects = rejects;
    // The displaced rows were counted by an earlier ingest; they now sit in rejected.csv.
    if (strict && result.rejected > 0) {
      result.strictFailed = true;
      result.storeRows = manifest.rows;
      result.storeSources = Object.keys(manifest.sources).length;
      return result;
    }
    manifest.format = STORE_FORMAT;
    manifest.version = STORE_VERSION;
    manifest.updated = now;
    manifest.mapping = { map: { ...map }, set: { ...set }, seedFrom: seedFrom ? seedFrom.source : null, scale: { ...scale } };
    manifest.counts = { read: result.read, accepted: result.accepted, duplicates: result.duplicates, rejected: result.rejected, pending: result.pending, skipped: result.skipped, conflicts: result.conflicts };
    writeStore({ dir: store, table: merged.table, manifest, rejected: [...oldRejects, ...rejects] });
    result.wrote = true;
    result.storeRows = merged.table.length;
    result.storeSources = Object.keys(manifest.sources).length;
    return result;
  } finally {
    lock.release();
  }
}

/** Reads stdin (hashing it: the same content twice is a no-op); null = already in the store. */
function readStdinSource(src: InputSource, manifest: Manifest, options: PortableOptions, readStdin: IngestOptions['readStdin']): Parsed | null {
  let bytes: Uint8Array;
  try {
    bytes = readStdin ? readStdin() : readFileSync(0);
  } catch (err) {
    const e = err as NodeJS.ErrnoException;
    return { src, key: '-', given: '-', stamp: { path: '-', size: 0, mtime: 0, sha256: '' }, format: '', norm: null, failure: ingestText.unreadable(e.code ?? e.message) };
  }
  const hash = sha256(bytes);
  const key = `-:${hash}`;
  if (manifest.sources[key]) return null;
  const stamp: FileStamp = { path: '-', size: bytes.byteLength, mtime: Date.now(), sha256: hash };
  let format = '';
  try {
    format = sniffFormat(bytes);
    const norm = normalizeRaw(rawFromBytes(bytes, format as SourceFormat, { limits: options.limits, source: '-', keys: options.keys }), {
      source: '-', map: options.map, set: options.set, scale: options.scale, condition: options.condition,
      seedFrom: options.seedFrom ? new RegExp(options.seedFrom.source, options.seedFrom.flags) : undefined,
    });
    return { src, key, given: '-', stamp, format, norm, failure: null };
  } catch (err) {
    return { src, key, given: '-', stamp, format, norm: null, failure: (err as Error).message.split('\n')[0] };
  }
}
