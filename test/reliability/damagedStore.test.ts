import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { copyFileSync, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { readStore } from '../../src/store/readStore.js';
import { checkStore, leftovers, writeLog } from './storeCheck.js';

// A store damaged outside datlas (a copied-in file, a truncated disk write, a stray commit log):
// readers say what is wrong in one line, and ingest refuses to build on it rather than
// overwrite rows it cannot read.
let dir = '';
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-damaged-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

async function storeOf(name: string, prefix: string): Promise<string> {
  const p = join(dir, `${name}.csv`);
  writeLog(p, prefix, 2, 10);
  const store = join(dir, name);
  await ingestSources({ paths: [p], store });
  return store;
}

describe('a damaged store', () => {
  it('rows.arrow cut short: readers and ingest fail clearly, nothing is overwritten', async () => {
    const store = await storeOf('a', 'a');
    const rows = join(store, 'rows.arrow');
    const cut = readFileSync(rows).subarray(0, 200);
    writeFileSync(rows, cut);
    await expect(readStore(store)).rejects.toThrow(/rows.arrow is not readable/);
    const more = join(dir, 'more.csv');
    writeLog(more, 'm', 1, 5);
    await expect(ingestSources({ paths: [more], store })).rejects.toThrow(/rows.arrow is not readable/);
    expect(readFileSync(rows)).toEqual(cut);
    expect(leftovers(store)).toEqual([]); // the lock was released
  });

  it('rows.arrow from another store with the same row count: told apart by the commit id', async () => {
    const a = await storeOf('a', 'a');
    const b = await storeOf('b', 'b');
    copyFileSync(join(b, 'rows.arrow'), join(a, 'rows.arrow'));
    await expect(readStore(a)).rejects.toThrow(/rows.arrow and manifest.json come from different writes/);
  });

  it('manifest.json that is not JSON', async () => {
    const store = await storeOf('a', 'a');
    writeFileSync(join(store, 'manifest.json'), '{"format": "descent-atlas-st');
    await expect(readStore(store)).rejects.toThrow(/manifest.json is not readable/);
  });

  it('a damaged commit log never took effect: readers ignore it, the next ingest removes it', async () => {
    const store = await storeOf('a', 'a');
    writeFileSync(join(store, 'commit.json'), '{"commit": "x", "files": [');
    const dead = spawnSync(process.execPath, ['-e', '0']).pid!;
    writeFileSync(join(store, `rows.arrow.tmp-${dead}-0a1b`), 'partial'); // a killed writer's temporary
    expect((await checkStore(store)).rows).toBe(20);
    const more = join(dir, 'more.csv');
    writeLog(more, 'm', 1, 5);
    await ingestSources({ paths: [more], store });
    expect((await checkStore(store)).rows).toBe(25);
    expect(existsSync(join(store, 'commit.json'))).toBe(false);
    expect(leftovers(store)).toEqual([]);
  });
});
