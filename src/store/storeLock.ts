import { closeSync, mkdirSync, openSync, readFileSync, unlinkSync, writeSync } from 'node:fs';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { UserError } from '../UserError.js';
import { storeText } from '../messages.js';

export interface StoreLock {
  release(): void;
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Takes `DIR/lock` (created exclusively, holding our pid and host). A lock left by a process
 * that no longer exists on this host is cleared; a live one is waited for up to `waitSeconds`,
 * then the ingest fails with a message naming the holder.
 */
export async function lockStore(dir: string, waitSeconds: number): Promise<StoreLock> {
  mkdirSync(dir, { recursive: true });
  const path = join(dir, 'lock');
  const me = JSON.stringify({ pid: process.pid, host: hostname(), started: new Date().toISOString() });
  const deadline = Date.now() + waitSeconds * 1000;
  let holder = 0;
  for (;;) {
    try {
      const fd = openSync(path, 'wx');
      writeSync(fd, me);
      closeSync(fd);
      return {
        release() {
          try {
            if (readFileSync(path, 'utf8') === me) unlinkSync(path);
          } catch {
            // already gone
          }
        },
      };
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw new UserError(storeText.cannotLock(dir, (err as Error).message));
    }
    let info: { pid?: number; host?: string } | null = null;
    try {
      info = JSON.parse(readFileSync(path, 'utf8'));
    } catch {
      info = null; // being written right now, or removed: try again shortly
    }
    if (info && typeof info.pid === 'number') {
      holder = info.pid;
      if (info.host === hostname() && !alive(info.pid)) {
        try {
          unlinkSync(path);
        } catch {
          // another process cleared it first
        }
        continue;
      }
    }
    if (Date.now() >= deadline) throw new UserError(storeText.locked(dir, holder, waitSeconds));
    await new Promise((r) => setTimeout(r, 25));
  }
}
