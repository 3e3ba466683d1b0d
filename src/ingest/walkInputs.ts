import { existsSync, readdirSync, realpathSync, statSync } from 'node:fs';
import type { Dirent } from 'node:fs';
import { join, resolve, sep } from 'node:path';
import { formatOfName, runDirectoryFiles } from './readSource.js';

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
    if (visited.has(real)) return;
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
    if ((has('manifest.json') && has('rows.arrow')) || has('commit.json')) return;
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
      // Only files of a known format (or a run folder's config) need their size and mtime;
      // symbolic links are followed by the stat.
      if (!e.isFile() && !e.isSymbolicLink()) continue;
      const st = statSync(prefix + name, { throwIfNoEntry: false });
      if (!st) continue;
      if (st.isDirectory()) dirs.push(name);
      else if (st.isFile()) {
        files.push(name);
        stats.set(name, st);
      }
    }
    const rd = runDirectoryFiles(files);
    if (rd) {
      const st = stats.get(rd.metrics)!;
      add({ key: absPrefix + rd.metrics, given: prefix + rd.metrics, kind: 'rundir', config: prefix + rd.config, size: st.size, mtime: st.mtimeMs });
      return;
    }
    for (const name of files) {
      if (formatOfName(name) === null) continue;
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
    if (!existsSync(p)) {
      missing.push({ path: p, reason: 'ENOENT' });
      continue;
    }
    if (statSync(p).isDirectory()) walkDir(p);
    else add({ key: resolve(p), given: p, kind: 'file' });
  }
  return { sources, missing };
}
