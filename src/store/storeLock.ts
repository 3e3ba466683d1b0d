import { closeSync, linkSync, mkdirSync, openSync, readFileSync, statSync, unlinkSync, writeFileSync, writeSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { UserError } from '../UserError.js';
import { storeText } from '../messages.js';
import { recoverStore } from './storeCommit.js';
import { processAlive } from './processAlive.js';

export interface StoreLock {
  release(): void;
}

/** A lock file that cannot be read as ours or anyone's (damaged) is stale after this long. */
const UNREADABLE_STALE_MS = 10_000;
/** Breaking a stale lock takes microseconds; a breaker mark older than this was left by a killed process. */
const BREAKER_STALE_MS = 5_000;

function ageMs(path: string): number {
  try {
    return Date.now() - statSync(path).mtimeMs;
  } catch {
    return 0;
  }
}

/**
 * Creates `path` holding `content`, or returns false when it exists. The content is written to a
 * temporary first and hard-linked into place, so a lock file is never seen empty or half written
 * (a process killed between create and write would otherwise leave a lock nobody can judge).
 */
function createWithContent(path: string, content: string): boolean {
  const tmp = `${path}.tmp-${process.pid}`;
  // A stray temporary of ours may still be a second name of a lock file: never write through it.
  try {
    unlinkSync(tmp);
  } catch {
    // none
  }
  writeFileSync(tmp, content, { flag: 'wx' });
  try {
    linkSync(tmp, path);
    return true;
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === 'EEXIST') return false;
    if (code !== 'EPERM' && code !== 'ENOTSUP' && code !== 'EOPNOTSUPP') throw err;
    // No hard links on this file system: exclusive create, then write.
    try {
      const fd = openSync(path, 'wx');
      try {
        writeSync(fd, content);
      } finally {
        closeSync(fd);
      }
      return true;
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code === 'EEXIST') return false;
      throw e;
    }
  } finally {
    try {
      unlinkSync(tmp);
    } catch {
      // already gone
    }
  }
}

/** The lock's text, or null when it is gone. */
function readLock(path: string): string | null {
  try {
    return readFileSync(path, 'utf8');
  } catch {
    return null;
  }
}

/**
 * Removes a stale lock whose text was `seen`. Two processes may judge the same lock stale at
 * once; if both simply unlinked it, the slower one could remove the lock the faster one has
 * just taken. So breaking is itself exclusive (`lock.break`), and the lock is removed only if
 * it still holds the text judged stale: while the breaker mark exists nobody else removes the
 * lock, so no new one can appear in between.
 */
function breakStale(path: string, seen: string): boolean {
  const breaker = `${path}.break`;
  if (!createWithContent(breaker, JSON.stringify({ pid: process.pid, host: hostname() }))) {
    if (ageMs(breaker) <= BREAKER_STALE_MS) return false;
    try {
      unlinkSync(breaker);
    } catch {
      // removed by someone else
    }
    return true;
  }
  try {
    if (readLock(path) === seen) unlinkSync(path);
    return true;
  } finally {
    try {
      unlinkSync(breaker);
    } catch {
      // already gone
    }
  }
}

/**
 * Takes `DIR/lock` (holding our pid and host). A lock left by a process that no longer exists
 * on this host is cleared; a live one is waited for up to `waitSeconds`, then the ingest fails
 * with a message naming the holder. Once taken, a write that a killed process left half
 * committed is finished and its temporaries removed (storeCommit.ts).
 */
export async function lockStore(dir: string, waitSeconds: number): Promise<StoreLock> {
  mkdirSync(dir, { recursive: true });
  const path = join(dir, 'lock');
  const me = JSON.stringify({ pid: process.pid, host: hostname(), started: new Date().toISOString() });
  const deadline = Date.now() + waitSeconds * 1000;
  let holder = 0;
  for (;;) {
    let created: boolean;
    try {
      created = createWithContent(path, me);
    } catch (err) {
      throw new UserError(storeText.cannotLock(dir, (err as Error).message));
    }
    if (created) {
      const lock = {
        release() {
          if (readLock(path) === me) {
            try {
              unlinkSync(path);
            } catch {
              // already gone
            }
          }
        },
      };
      try {
        recoverStore(dir);
      } catch (err) {
        lock.release();
        throw new UserError(storeText.cannotRecover(dir, (err as Error).message));
      }
      return lock;
    }
    const seen = readLock(path);
    if (seen === null) continue; // released just now: try again at once
    let info: { pid?: unknown; host?: unknown } | null = null;
    try {
      info = JSON.parse(seen);
    } catch {
      info = null;
    }
    const pid = info && typeof info.pid === 'number' ? info.pid : 0;
    if (pid) holder = pid;
    const stale = pid ? info!.host === hostname() && !processAlive(pid) : ageMs(path) > UNREADABLE_STALE_MS;
    if (stale && breakStale(path, seen)) continue;
    if (Date.now() >= deadline) throw new UserError(storeText.locked(dir, holder, waitSeconds));
    await new Promise((r) => setTimeout(r, 25));
  }
}
