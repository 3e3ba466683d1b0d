import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { checkStore, leftovers, prng, spawnCli, writeLog } from './storeCheck.js';

// kill -9 of `datlas ingest` at random moments (DESIGN.md §4: writes are atomic and guarded by a
// lock; a killed ingest leaves the old store or the new one, never a corrupt one). Each round adds
// a log and ingests the whole folder; the next round's ingest must clear the stale lock and pick
// up whatever the killed one did not commit. Run `node scripts/build.mjs` first for speed.
const ROUNDS = 45;
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-kill-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('kill -9 during ingest', () => {
  it(`${ROUNDS} ingests killed at random moments: the store is always the old or the new one`, async () => {
    const logs = join(dir, 'logs');
    const store = join(dir, 'store');
    mkdirSync(logs);
    // A store large enough that reading and writing it takes a good part of each ingest.
    let total = writeLog(join(logs, 'base.csv'), 'base', 60, 300);
    await ingestSources({ paths: [logs], store });
    let state = await checkStore(store);
    expect(state.rows).toBe(total);

    // How long an uninterrupted ingest of one more log takes: kills are spread over that span.
    total += writeLog(join(logs, 'warm.csv'), 'warm', 4, 100);
    const warm = await spawnCli(['ingest', logs, '--store', store, '--quiet']);
    expect(warm.code).toBe(0);
    state = await checkStore(store);
    expect(state.rows).toBe(total);
    const span = warm.ms * 1.1;

    const rand = prng(20261202);
    const outcome = { old: 0, new: 0, staleLocks: 0, halfCommitted: 0, exitedFirst: 0 };
    for (let round = 0; round < ROUNDS; round++) {
      total += writeLog(join(logs, `r${String(round).padStart(2, '0')}.csv`), `r${round}`, 4, 100);
      const before = state.rows;
      // A third of the rounds: a moment anywhere in the ingest. A third: inside the write, up to
      // 25 ms after the first new store file appears. A third: inside the commit, up to 3 ms after
      // the commit log appears (the few milliseconds a random moment rarely hits).
      const mode = (['anywhere', 'write', 'commit'] as const)[round % 3];
      const killAfterMs = Math.round(rand() * (mode === 'anywhere' ? span : mode === 'write' ? 25 : 3));
      const match = mode === 'write' ? /\.tmp-\d+-/ : /^commit\.json/;
      const kill = mode === 'anywhere' ? { killAfterMs } : { killOnFile: { dir: store, match, afterMs: killAfterMs }, killAfterMs: 5000 };
      const child = await spawnCli(['ingest', logs, '--store', store, '--quiet', '--wait', '60'], kill);
      if (child.signal !== 'SIGKILL') {
        expect(child.code, child.stderr).toBe(0);
        outcome.exitedFirst++;
      }
      const left = leftovers(store);
      if (left.includes('lock')) outcome.staleLocks++;
      if (left.includes('commit.json')) outcome.halfCommitted++;
      state = await checkStore(store);
      // Old store, or the new one holding every log in the folder: nothing in between.
      expect([before, total], `round ${round} killed ${killAfterMs} ms after ${mode === 'anywhere' ? 'the start' : `the ${mode} began`}`).toContain(state.rows);
      expect(state.acceptedSum).toBe(state.rows);
      if (state.rows === total) outcome.new++;
      else outcome.old++;
    }
    // One last ingest (not killed) clears any stale lock and brings in what is left.
    const last = await spawnCli(['ingest', logs, '--store', store, '--json', '--wait', '60']);
    expect(last.code, last.stderr).toBe(0);
    state = await checkStore(store);
    expect(state.rows).toBe(total);
    const keys = new Set(state.table.run.map((r, i) => `${r}@${state.table.epochs[i]}`));
    expect(keys.size).toBe(total); // every row once
    expect(leftovers(store)).toEqual([]);
    expect(existsSync(join(store, 'rejected.csv'))).toBe(true);
    // Figures for the record (vitest prints them with --reporter=verbose).
    console.log(`kill -9: ${ROUNDS} kill points over ${Math.round(span)} ms; store old ${outcome.old}, new ${outcome.new}, ` +
      `exited before the kill ${outcome.exitedFirst}, stale locks cleared ${outcome.staleLocks}, half-committed writes finished ${outcome.halfCommitted}`);
    expect(outcome.old + outcome.new).toBe(ROUNDS);
  }, 120_000);
});
