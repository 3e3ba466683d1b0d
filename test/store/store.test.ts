import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { appendFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { spawn, spawnSync } from 'node:child_process';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { DataType, tableFromIPC } from 'apache-arrow';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { readStore } from '../../src/store/readStore.js';
import { tableToRows } from '../../src/store/tableFromRows.js';

const BIN = fileURLToPath(new URL('../../bin/datlas', import.meta.url));
let dir = '';
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-store-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

const csv = (name: string, width: number, epochs: number[], seed = 1) => {
  const p = join(dir, name);
  const lines = ['width,epoch,n,label_noise,seed,optimizer,test_error,train_loss,sigma2'];
  epochs.forEach((e, i) => lines.push(`${width},${e},4000,0.2,${seed},adam,${(0.5 / (i + 1)).toFixed(6)},${i === 2 ? 'inf' : (1 / (e + 1)).toFixed(6)},0.25`));
  writeFileSync(p, `${lines.join('\n')}\n`);
  return p;
};

describe('store round trip (DESIGN.md §4: Arrow IPC file readable by other tools)', () => {
  it('rows.arrow read back with apache-arrow (independent reader) equals what was ingested', async () => {
    const store = join(dir, 'store');
    const p = csv('a.csv', 64, [1, 2, 4, 8]);
    await ingestSources({ paths: [p], store });
    const t = tableFromIPC(readFileSync(join(store, 'rows.arrow')));
    expect(t.numRows).toBe(4);
    const type = (name: string) => t.schema.fields.find((f) => f.name === name)!.type;
    for (const c of ['seed', 'width', 'epochs', 'train_size', 'label_noise', 'test_error', 'train_loss', 'sigma2']) expect(DataType.isFloat(type(c))).toBe(true);
    expect(DataType.isInt(type('source_line'))).toBe(true);
    for (const c of ['run', 'condition', 'status', 'source']) expect(DataType.isDictionary(type(c))).toBe(true);
    const col = (name: string) => Array.from(t.getChild(name)!.toArray() as ArrayLike<unknown>);
    expect(col('width')).toEqual([64, 64, 64, 64]);
    expect(col('epochs')).toEqual([1, 2, 4, 8]);
    expect(col('test_error')).toEqual([0.5, 0.25, 0.166667, 0.125]);
    expect(col('train_loss')[2]).toBeNaN();
    expect(col('status')).toEqual(['ok', 'ok', 'diverged', 'ok']);
    expect(col('condition')).toEqual(Array(4).fill('optimizer=adam'));
    expect(col('source')).toEqual(Array(4).fill(p));
    expect(col('source_line')).toEqual([2, 3, 4, 5]);
    expect(col('sigma2')).toEqual([0.25, 0.25, 0.25, 0.25]);
    // readStore gives the same rows.
    const { table, manifest } = await readStore(store);
    expect(tableToRows(table).map((r) => r.source_line)).toEqual([2, 3, 4, 5]);
    expect(manifest.rows).toBe(4);
    expect(manifest.sources[p].sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('readStore refuses a store whose manifest and rows disagree (an interrupted write)', async () => {
    const store = join(dir, 'store');
    await ingestSources({ paths: [csv('a.csv', 64, [1, 2])], store });
    const m = JSON.parse(readFileSync(join(store, 'manifest.json'), 'utf8'));
    writeFileSync(join(store, 'manifest.json'), JSON.stringify({ ...m, rows: 3 }));
    await expect(readStore(store)).rejects.toThrow('manifest says 3 rows but rows.arrow holds 2');
  });

  it('readStore fails with a clear message when there is no store', async () => {
    await expect(readStore(join(dir, 'none'))).rejects.toThrow(`no store at ${join(dir, 'none')} (run datlas ingest first)`);
  });
});

describe('re-ingest', () => {
  it('an unchanged file is a no-op; a grown file replaces its earlier rows', async () => {
    const store = join(dir, 'store');
    const p = csv('a.csv', 64, [1, 2]);
    appendFileSync(p, '64,4,4000,0.2,1,adam,0.1'); // still being written
    const first = await ingestSources({ paths: [p], store });
    expect(first).toMatchObject({ read: 3, accepted: 2, pending: 1 });
    const again = await ingestSources({ paths: [p], store });
    expect(again).toMatchObject({ read: 0, unchanged: 1, wrote: false });
    appendFileSync(p, ',0.2,0.25\n');
    const grown = await ingestSources({ paths: [p], store });
    expect(grown).toMatchObject({ read: 3, accepted: 3, duplicates: 0, pending: 0 });
    const rows = tableToRows((await readStore(store)).table);
    expect(rows.map((r) => r.epochs)).toEqual([1, 2, 4]);
  });
});

describe('walking folders', () => {
  it('`datlas ingest .` skips the store inside the folder, hidden entries and files it cannot read as logs', async () => {
    const store = join(dir, 'atlas-store');
    csv('a.csv', 64, [1, 2]);
    writeFileSync(join(dir, 'notes.md'), '# not a log');
    mkdirSync(join(dir, '.cache'));
    writeFileSync(join(dir, '.cache', 'old.csv'), 'width,epoch,n,test_error\n1,1,1,0.5\n');
    await ingestSources({ paths: [dir], store });
    const again = await ingestSources({ paths: [dir], store });
    // The second walk finds a.csv only: not rows.arrow, not the hidden folder, not notes.md.
    expect(again).toMatchObject({ sources: 1, unchanged: 1, read: 0 });
    expect((await readStore(store)).table.length).toBe(2);
  });
});

describe('store lock', () => {
  it('a stale lock of a dead process is cleared', async () => {
    const store = join(dir, 'store');
    mkdirSync(store);
    const dead = spawnSync(process.execPath, ['-e', '0']).pid!;
    writeFileSync(join(store, 'lock'), JSON.stringify({ pid: dead, host: hostname() }));
    const r = await ingestSources({ paths: [csv('a.csv', 8, [1])], store, wait: 0 });
    expect(r.accepted).toBe(1);
  });

  it('a live lock makes the ingest wait, then fail with a clear message', async () => {
    const store = join(dir, 'store');
    mkdirSync(store);
    writeFileSync(join(store, 'lock'), JSON.stringify({ pid: process.pid, host: hostname() }));
    await expect(ingestSources({ paths: [csv('a.csv', 8, [1])], store, wait: 0.2 })).rejects.toThrow(`is locked by another ingest (pid ${process.pid})`);
  });

  it('two concurrent ingests into one store leave a valid store with all rows', async () => {
    const store = join(dir, 'store');
    const a = csv('a.csv', 8, [1, 2, 4, 8, 16], 1);
    const b = csv('b.csv', 16, [1, 2, 4, 8, 16], 2);
    const run = (p: string) =>
      new Promise<{ code: number | null; stderr: string }>((resolve) => {
        const child = spawn(process.execPath, [BIN, 'ingest', p, '--store', store, '--wait', '60', '--json'], { stdio: ['ignore', 'pipe', 'pipe'] });
        let stderr = '';
        child.stderr.on('data', (d) => (stderr += d));
        child.on('close', (code) => resolve({ code, stderr }));
      });
    const [ra, rb] = await Promise.all([run(a), run(b)]);
    expect(ra.code).toBe(0);
    expect(rb.code).toBe(0);
    const { table, manifest } = await readStore(store);
    expect(table.length).toBe(10);
    expect(Object.keys(manifest.sources).sort()).toEqual([a, b].sort());
    expect(new Set(tableToRows(table).map((r) => r.width))).toEqual(new Set([8, 16]));
  });
});
