import { closeSync, existsSync, fsyncSync, openSync, readdirSync, readFileSync, renameSync, unlinkSync } from 'node:fs';
import { basename, join } from 'node:path';
import { atomicWrite } from './atomicWrite.js';
import { storeFiles } from './storeFiles.js';
import { processAlive } from './processAlive.js';

/**
 * A store update replaces three files (rows.arrow, manifest.json, rejected.csv) and no file
 * system renames three files at once. So a write is a small redo log: every new file is written
 * and fsynced beside its target, then `commit.json` (itself written atomically) lists the
 * (temporary, target) pairs, then the renames run and commit.json is removed. A process killed
 * before commit.json exists leaves the old store (plus stray temporaries); killed after, the
 * store is the new one: the next lock holder finishes the renames, and a reader meanwhile reads
 * the listed temporaries in place of their targets.
 */
export interface CommitFile {
  tmp: string;
  target: string;
}

export interface CommitLog {
  commit: string;
  files: CommitFile[];
}

/** A temporary name beside `target`, carrying the writer's pid (stray ones of dead writers are removed). */
export function tmpName(target: string, id: string): string {
  return `${target}.tmp-${process.pid}-${id}`;
}

const TMP = /\.tmp-(\d+)(?:-[0-9a-z]+)?$/;

function fsyncDir(dir: string): void {
  try {
    const fd = openSync(dir, 'r');
    try {
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
  } catch {
    // Some file systems cannot fsync a directory; renames are still atomic.
  }
}

/** The pending commit of a store, or null (none, or a damaged one that never took effect). */
export function readCommit(dir: string): CommitLog | null {
  const path = storeFiles(dir).commit;
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch {
    return null;
  }
  try {
    const log = JSON.parse(text) as CommitLog;
    if (typeof log.commit !== 'string' || !Array.isArray(log.files)) return null;
    // Names only: a commit log never points outside its store.
    return { commit: log.commit, files: log.files.map((f) => ({ tmp: join(dir, basename(f.tmp)), target: join(dir, basename(f.target)) })) };
  } catch {
    return null;
  }
}

/** Renames a commit's temporaries over their targets (already moved ones are skipped) and drops the log. */
function applyCommit(dir: string, log: CommitLog): void {
  for (const f of log.files) {
    if (existsSync(f.tmp)) renameSync(f.tmp, f.target);
  }
  fsyncDir(dir);
  try {
    unlinkSync(storeFiles(dir).commit);
  } catch {
    // already gone
  }
  fsyncDir(dir);
}

/** Writes the commit log, then applies it (call under the store lock, temporaries fsynced). */
export function commitFiles(dir: string, commit: string, files: CommitFile[]): void {
  atomicWrite(storeFiles(dir).commit, `${JSON.stringify({ commit, files: files.map((f) => ({ tmp: basename(f.tmp), target: basename(f.target) })) })}\n`);
  applyCommit(dir, { commit, files });
}

/**
 * Brings a store to its last committed state (call right after taking the lock): finishes a
 * commit a killed writer left half done, discards a damaged commit log, and removes temporaries
 * of writers that no longer run. Returns what it did, for tests and notes.
 */
export function recoverStore(dir: string): { rolledForward: boolean; removed: number } {
  const f = storeFiles(dir);
  let rolledForward = false;
  if (existsSync(f.commit)) {
    const log = readCommit(dir);
    if (log) {
      applyCommit(dir, log);
      rolledForward = true;
    } else {
      try {
        unlinkSync(f.commit);
      } catch {
        // already gone
      }
    }
  }
  let removed = 0;
  let names: string[] = [];
  try {
    names = readdirSync(dir);
  } catch {
    return { rolledForward, removed };
  }
  for (const name of names) {
    const m = TMP.exec(name);
    // Our own are stray too: right after taking the lock this process has nothing in flight.
    if (!m || (Number(m[1]) !== process.pid && processAlive(Number(m[1])))) continue;
    try {
      unlinkSync(join(dir, name));
      removed++;
    } catch {
      // removed by someone else
    }
  }
  return { rolledForward, removed };
}
