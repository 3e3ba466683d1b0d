import { lstatSync, readdirSync, readlinkSync, realpathSync, statSync } from 'node:fs';
import type { Dirent, Stats } from 'node:fs';
import { extname, join, resolve, sep } from 'node:path';
import { formatOfName, runDirectoryFiles } from './readSource.js';
import { ingestText } from '../messages.js';

/** One thing to ingest: a file, a run directory (config + metrics), or stdin. */
export interface InputSource {
  /** Manifest key: absolute path of the metrics file (stdin gets its key once read). */
  key: string;
  /** Path as the user gave it (joined below a given folder). */
  given: string;
  kind: 'file' | 'rundir' | 'stdin';
  /** A run directory's config file (as given). */
  config?: string;
  /** Size and mtime from the walk's stat (saves a second stat on the unchanged-file check). */
  size?: number;
  mtime?: number;
}

export interface WalkResult {
  sources: InputSource[];
  /** Paths that do not exist or cannot be listed: path → reason. */
  missing: { path: string; reason: string }[];
  /**
   * Entries passed over, each with the reason in words: link loops, dangling links, named pipes
   * and other special files, compressed or binary files, files of formats ingest does not read.
   * `other` marks the last kind (summed up in one note rather than one per file).
   */
  skipped: { path: string; reason: string; other?: boolean }[];
}

/** Extensions of files that are often logs packed up (or binary dumps): each gets a note of its own. */
const PACKED = new Set(['.gz', '.bz2', '.xz', '.zst', '.zip', '.tgz', '.tar', '.7z', '.bin']);

/** What kind of special file a stat describes ('' for a regular file or folder). */
function specialKind(st: Stats): string {
  if (st.isFIFO()) return 'named pipe (FIFO)';
  if (st.isSocket()) return 'socket';
  if (st.isCharacterDevice()) return 'character device';
  if (st.isBlockDevice()) return 'block device';
  return '';
}

/**
 * A path's stat through links; on failure the reason in words (a loop, a dangling link, or the
 * system's code).
 */
function statOrWhy(path: string): { st: Stats } | { why: string } {
  try {
    const st = statSync(path, { throwIfNoEntry: false });
    if (st) return { st };
    const link = lstatSync(path, { throwIfNoEntry: false });
    if (link?.isSymbolicLink()) {
      let target = '';
      try {
        target = readlinkSync(path);
      } catch {
        // Gone between the two calls: still a link to nothing.
      }
      return { why: ingestText.danglingLink(target) };
    }
    return { why: 'ENOENT' };
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    return { why: code === 'ELOOP' ? ingestText.linkLoop : (code ?? (err as Error).message) };
  }
}

/**
 * Expands the command-line paths: files as given; folders walked recursively (sorted, hidden
 * entries skipped), a folder holding a config file and a metrics file is one run directory,
 * a folder holding a store is skipped; `-` is stdin.
 */
export function walkInputs(paths: readonly string[], opts: { skip?: readonly string[] } = {}): WalkResult {
  const skip = new Set((opts.skip ?? []).map((p) => resolve(p)));
  const sources: InputSource[] = [];
  const missing: WalkResult['missing'] = [];
  const skipped: WalkResult['skipped'] = [];
  const seen = new Set<string>();
  const add = (s: InputSource) => {
    if (seen.has(s.key)) return;
    seen.add(s.key);
    sources.push(s);
  };
  // Real paths of the folders walked: a symbolic link back up the tree must not loop (or read
  // the same logs again under another name).
  const visited = new Set<string>();
  const walkDir = (dir: string) => {
    if (skip.has(resolve(dir))) return;
    let real: string;
    try {
      real = realpathSync(dir);
    } catch (err) {
      missing.push({ path: dir, reason: (err as NodeJS.ErrnoException).code ?? (err as Error).message });
      return;
    }
    if (visited.has(real)) {
      skipped.push({ path: dir, reason: ingestText.folderAgain(real) });
      return;
    }
    visited.add(real);
    let entries: Dirent[];
    try {
      entries = readdirSync(dir, { withFileTypes: true });
    } catch (err) {
      missing.push({ path: dir, reason: (err as NodeJS.ErrnoException).code ?? (err as Error).message });
      return;
    }
    entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
    // A store, not logs (commit.json alone: a first write cut short before its renames).
    const has = (n: string) => entries.some((e) => e.name === n);
    if ((has('manifest.json') && has('rows.arrow')) || has('commit.json')) {
      skipped.push({ path: dir, reason: ingestText.storeFolder });
      return;
    }
    // Paths are built by concatenation below one normalised prefix: join and resolve per file
    // were most of the cost of walking thousands of logs (re-ingest of unchanged files is this walk).
    const base = join(dir);
    const prefix = base === '.' ? '' : base.endsWith(sep) ? base : base + sep;
    const absPrefix = resolve(dir) + (resolve(dir).endsWith(sep) ? '' : sep);
    const files: string[] = [];
    const dirs: string[] = [];
    const stats = new Map<string, { size: number; mtimeMs: number }>();
    for (const e of entries) {
      const name = e.name;
      if (name.startsWith('.')) continue;
      if (e.isDirectory()) {
        dirs.push(name);
        continue;
      }
      // Files of a known format (or a run folder's config) need their size and mtime; symbolic
      // links are followed by the stat. Anything else passed over is said so (skipped).
      if (!e.isFile() && !e.isSymbolicLink()) {
        const st = lstatSync(prefix + name, { throwIfNoEntry: false });
        skipped.push({ path: prefix + name, reason: ingestText.specialFile(st ? specialKind(st) || 'special file' : 'special file') });
        continue;
      }
      const got = statOrWhy(prefix + name);
      if ('why' in got) {
        skipped.push({ path: prefix + name, reason: got.why });
        continue;
      }
      const st = got.st;
      if (st.isDirectory()) dirs.push(name);
      else if (st.isFile()) {
        files.push(name);
        stats.set(name, st);
      } else skipped.push({ path: prefix + name, reason: ingestText.specialFile(specialKind(st) || 'special file') });
    }
    const rd = runDirectoryFiles(files);
    if (rd) {
      const st = stats.get(rd.metrics)!;
      add({ key: absPrefix + rd.metrics, given: prefix + rd.metrics, kind: 'rundir', config: prefix + rd.config, size: st.size, mtime: st.mtimeMs });
      return;
    }
    for (const name of files) {
      if (formatOfName(name) === null) {
        const ext = extname(name).toLowerCase();
        if (PACKED.has(ext)) skipped.push({ path: prefix + name, reason: ingestText.compressedName(ext) });
        else skipped.push({ path: prefix + name, reason: ingestText.notLogName, other: true });
        continue;
      }
      const st = stats.get(name)!;
      add({ key: absPrefix + name, given: prefix + name, kind: 'file', size: st.size, mtime: st.mtimeMs });
    }
    for (const name of dirs) walkDir(join(dir, name));
  };
  for (const p of paths) {
    if (p === '-') {
      sources.push({ key: '-', given: '-', kind: 'stdin' });
      continue;
    }
    const got = statOrWhy(p);
    if ('why' in got) {
      missing.push({ path: p, reason: got.why });
      continue;
    }
    if (got.st.isDirectory()) walkDir(p);
    else if (got.st.isFile()) add({ key: resolve(p), given: p, kind: 'file' });
    // Named on purpose, yet reading a pipe nobody writes to waits forever: never a silent wait.
    else if (got.st.isFIFO()) skipped.push({ path: p, reason: ingestText.namedPipe(p) });
    else skipped.push({ path: p, reason: ingestText.specialFile(specialKind(got.st) || 'special file') });
  }
  return { sources, missing, skipped };
}
