import { existsSync, readdirSync, realpathSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
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
    let names: string[];
    try {
      names = readdirSync(dir).sort();
    } catch (err) {
      missing.push({ path: dir, reason: (err as NodeJS.ErrnoException).code ?? (err as Error).message });
      return;
    }
    // A store, not logs (commit.json alone: a first write cut short before its renames).
    if ((names.includes('manifest.json') && names.includes('rows.arrow')) || names.includes('commit.json')) return;
    const files: string[] = [];
    const dirs: string[] = [];
    const stats = new Map<string, { size: number; mtimeMs: number }>();
    for (const name of names) {
      if (name.startsWith('.')) continue;
      const p = join(dir, name);
      let st;
      try {
        st = statSync(p);
      } catch {
        continue;
      }
      if (st.isDirectory()) dirs.push(name);
      else if (st.isFile()) {
        files.push(name);
        stats.set(name, st);
      }
    }
    const rd = runDirectoryFiles(files);
    if (rd) {
      const metrics = join(dir, rd.metrics);
      const st = stats.get(rd.metrics)!;
      add({ key: resolve(metrics), given: metrics, kind: 'rundir', config: join(dir, rd.config), size: st.size, mtime: st.mtimeMs });
      return;
    }
    for (const name of files) {
      if (formatOfName(name) === null) continue;
      const st = stats.get(name)!;
      add({ key: resolve(join(dir, name)), given: join(dir, name), kind: 'file', size: st.size, mtime: st.mtimeMs });
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
