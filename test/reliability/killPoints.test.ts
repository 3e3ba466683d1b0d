import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import * as realFs from 'node:fs';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawnSync } from 'node:child_process';

// Every file operation of an ingest is a possible kill point. The file system is wrapped so the
// process "dies" before operation k: that operation and every later one fail, as after kill -9
// (nothing more reaches the disk, the lock is never released). For every k the store must read
// as the old or the new version, and the next ingest must clear the dead lock and finish.
const fault = { at: Infinity, count: 0, dead: false };
vi.mock('node:fs', async (importOriginal) => {
  const fs = await importOriginal<typeof import('node:fs')>();
  const guard =
    <A extends unknown[], R>(f: (...a: A) => R) =>
    (...a: A): R => {
      if (fault.dead || ++fault.count >= fault.at) {
        fault.dead = true;
        throw Object.assign(new Error('killed'), { code: 'EKILLED' });
      }
      return f(...a);
    };
  const wrapped = {
    ...fs,
    openSync: guard(fs.openSync),
    writeSync: guard(fs.writeSync),
    writeFileSync: guard(fs.writeFileSync),
    fsyncSync: guard(fs.fsyncSync),
    renameSync: guard(fs.renameSync),
    unlinkSync: guard(fs.unlinkSync),
    linkSync: guard(fs.linkSync),
    mkdirSync: guard(fs.mkdirSync),
  };
  return { ...wrapped, default: wrapped };
});

const { ingestSources } = await import('../../src/ingest/ingestSources.js');
const { checkStore, leftovers, writeLog } = await import('./storeCheck.js');

let dir = '';
beforeEach(() => {
  dir = realFs.mkdtempSync(join(tmpdir(), 'datlas-killpoints-'));
});
afterEach(() => realFs.rmSync(dir, { recursive: true, force: true }));

const deadPid = () => spawnSync(process.execPath, ['-e', '0']).pid!;

describe('a kill before every file operation of an ingest', () => {
  it('leaves the old or the new store, and the next ingest recovers', async () => {
    const logs = join(dir, 'logs');
    realFs.mkdirSync(logs);
    const baseRows = writeLog(join(logs, 'a.csv'), 'a', 6, 20);
    const store = join(dir, 'store');
    const pristine = join(dir, 'pristine');
    await ingestSources({ paths: [logs], store: pristine });
    const newRows = baseRows + writeLog(join(logs, 'b.csv'), 'b', 3, 20);
    const dead = deadPid();
    let points = 0;
    const seen = { old: 0, new: 0 };
    for (let k = 1; ; k++) {
      realFs.rmSync(store, { recursive: true, force: true });
      realFs.cpSync(pristine, store, { recursive: true });
      fault.at = k;
      fault.count = 0;
      fault.dead = false;
      let died = false;
      try {
        await ingestSources({ paths: [logs], store });
      } catch (err) {
        if (!fault.dead) throw err;
        died = true;
      }
      fault.at = Infinity;
      fault.dead = false;
      if (!died) break; // k is past the last operation: every point was tried
      points++;
      const state = await checkStore(store);
      expect([baseRows, newRows], `kill before operation ${k}`).toContain(state.rows);
      if (state.rows === newRows) seen.new++;
      else seen.old++;
      // The dead process's lock names a pid that no longer runs.
      const lock = join(store, 'lock');
      if (realFs.existsSync(lock)) realFs.writeFileSync(lock, JSON.stringify({ pid: dead, host: hostname() }));
      const again = await ingestSources({ paths: [logs], store, wait: 0 }).catch((e) => { throw new Error(`k=${k} pid=${process.pid} dead=${dead} files=${realFs.readdirSync(store)} lock=${realFs.existsSync(lock) ? realFs.readFileSync(lock, "utf8") : "-"}: ${e.message}`); });
      expect(again.read).toBe(again.accepted + again.duplicates + again.rejected + again.pending);
      const after = await checkStore(store);
      expect(after.rows, `recovery after a kill before operation ${k}`).toBe(newRows);
      expect(after.acceptedSum).toBe(newRows);
      expect(leftovers(store)).toEqual([]);
    }
    console.log(`kill points (file operations of one ingest): ${points}; store old after ${seen.old}, new after ${seen.new}`);
    expect(points).toBeGreaterThan(15);
    expect(seen.old).toBeGreaterThan(0);
    expect(seen.new).toBeGreaterThan(0);
  });
});
