import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { checkStore, leftovers, spawnCli, writeLog } from './storeCheck.js';

// Stale locks (a killed ingest never releases its lock): judged by the holder's pid on this
// host, or, for a lock file that cannot be read, by its age. Breaking one is exclusive, so
// several ingests finding the same stale lock never end up writing at once.
let dir = '';
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-stale-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

const deadPid = () => spawnSync(process.execPath, ['-e', '0']).pid!;

describe('stale locks', () => {
  it('4 ingests racing to clear one dead lock: each writes alone, no row lost', async () => {
    const store = join(dir, 'store');
    mkdirSync(store);
    writeFileSync(join(store, 'lock'), JSON.stringify({ pid: deadPid(), host: hostname(), started: '2026-01-01T00:00:00Z' }));
    let total = 0;
    const files = [0, 1, 2, 3].map((k) => {
      const p = join(dir, `l${k}.csv`);
      total += writeLog(p, `l${k}`, 5, 30);
      return p;
    });
    const runs = await Promise.all(files.map((p) => spawnCli(['ingest', p, '--store', store, '--wait', '60', '--quiet'])));
    for (const r of runs) expect(r.code, r.stderr).toBe(0);
    const state = await checkStore(store);
    expect(state.rows).toBe(total);
    expect(state.sources.length).toBe(4);
    expect(leftovers(store)).toEqual([]);
  }, 60_000);

  it('an unreadable lock file (empty, damaged) is stale only once it is old', async () => {
    const store = join(dir, 'store');
    mkdirSync(store);
    const p = join(dir, 'a.csv');
    writeLog(p, 'a', 2, 5);
    const lock = join(store, 'lock');
    writeFileSync(lock, '');
    // Fresh: may be another process's lock being created; wait, then fail naming no pid.
    await expect(ingestSources({ paths: [p], store, wait: 0.2 })).rejects.toThrow(/is locked by another ingest; waited 0.2 s/);
    const old = new Date(Date.now() - 60_000);
    utimesSync(lock, old, old);
    const r = await ingestSources({ paths: [p], store, wait: 0.2 });
    expect(r.accepted).toBe(10);
    expect(leftovers(store)).toEqual([]);
  });

  it('a lock from another host is never broken (its pid cannot be checked from here)', async () => {
    const store = join(dir, 'store');
    mkdirSync(store);
    const p = join(dir, 'a.csv');
    writeLog(p, 'a', 1, 3);
    writeFileSync(join(store, 'lock'), JSON.stringify({ pid: deadPid(), host: `${hostname()}-elsewhere` }));
    await expect(ingestSources({ paths: [p], store, wait: 0.2 })).rejects.toThrow(/is locked by another ingest \(pid \d+\)/);
  });
});
