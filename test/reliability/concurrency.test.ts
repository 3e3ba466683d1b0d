import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { spawn } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { readStore } from '../../src/store/readStore.js';
import { checkStore, leftovers, spawnCli, writeLog } from './storeCheck.js';

// Several writers and readers on one store at once (DESIGN.md §4: a second concurrent ingest
// waits, never corrupts). Readers (`datlas map`, `ridge`, readStore) never take the lock: they
// must still see one whole store, before or after each write.
const DEMO = fileURLToPath(new URL('../../sample-sweeps/demo/sweep.csv', import.meta.url));
const WRITERS = 4;

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-concurrent-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** One slice of the committed demo sweep (n = 256, 10% label noise): a quick map. */
function demoSlice(path: string): number {
  const lines = readFileSync(DEMO, 'utf8').trimEnd().split('\n');
  const keep = [lines[0], ...lines.slice(1).filter((l) => {
    const f = l.split(',');
    return f[3] === '256' && f[4] === '0.1';
  })];
  writeFileSync(path, `${keep.join('\n')}\n`);
  return keep.length - 1;
}

describe('concurrent ingests and readers', () => {
  it(`${WRITERS} ingests at once, with map and ridge reading meanwhile`, async () => {
    const logs = join(dir, 'logs');
    mkdirSync(logs);
    const store = join(dir, 'store');
    let total = demoSlice(join(logs, 'demo.csv'));
    await ingestSources({ paths: [join(logs, 'demo.csv')], store });
    const at = ['--at', 'label_noise=0.1', '--at', 'train_size=256'];
    const mapArgs = ['map', '--kind', 'model', ...at, '--method', 'linear', '--store', store, '--json', '--quiet'];
    const ridgeArgs = ['ridge', '--kind', 'model', ...at, '--boot', '200', '--store', store, '--json', '--quiet'];
    const before = await Promise.all([spawnCli(mapArgs, { cwd: dir }), spawnCli(ridgeArgs, { cwd: dir })]);
    for (const b of before) expect(b.code, b.stderr).toBe(0);

    // The writers add runs at other train sizes: the n = 256 slice the readers draw must not change.
    const files = Array.from({ length: WRITERS }, (_, k) => {
      const p = join(dir, `w${k}.csv`);
      total += writeLog(p, `w${k}`, 6, 40);
      return p;
    });
    const writers = files.map((p) => spawnCli(['ingest', p, '--store', store, '--wait', '60', '--json']));
    // Meanwhile a steady stream of commits for the readers to cross.
    let streaming = true;
    const stream = (async () => {
      let k = 0;
      while (streaming) {
        const p = join(logs, `s${k}.csv`);
        total += writeLog(p, `s${k++}`, 2, 20);
        await ingestSources({ paths: [p], store, wait: 60 });
        await new Promise((r) => setTimeout(r, 20)); // let the child processes' events through
      }
    })();
    // And an in-process reader hammering readStore.
    let reads = 0;
    const hammer = (async () => {
      while (streaming) {
        const { table, manifest } = await readStore(store);
        expect(table.length).toBe(manifest.rows);
        reads++;
        await new Promise((r) => setTimeout(r, 5));
      }
    })();
    const readers = await Promise.all([spawnCli(mapArgs, { cwd: dir }), spawnCli(ridgeArgs, { cwd: dir })]);
    const wrote = await Promise.all(writers);
    streaming = false;
    await Promise.all([stream, hammer]);

    for (const w of wrote) {
      expect(w.code, w.stderr).toBe(0);
      const j = JSON.parse(w.stdout);
      expect(j.read).toBe(j.accepted + j.duplicates + j.rejected + j.pending);
      expect(j.accepted).toBe(240);
    }
    readers.forEach((r, k) => {
      expect(r.code, r.stderr).toBe(0);
      expect(JSON.parse(r.stdout), k === 0 ? 'map' : 'ridge').toEqual(JSON.parse(before[k].stdout));
    });
    const state = await checkStore(store);
    expect(state.rows).toBe(total);
    expect(state.acceptedSum).toBe(total);
    expect(leftovers(store)).toEqual([]);
    console.log(`concurrency: ${WRITERS} CLI ingests at once + a stream of in-process ingests; map and ridge output unchanged; ${reads} in-process reads, all whole`);
  }, 90_000);
});
