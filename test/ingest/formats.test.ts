import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { tableFromArrays, tableToIPC } from 'apache-arrow';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { readStore } from '../../src/store/readStore.js';
import { tableToRows } from '../../src/store/tableFromRows.js';

let dir = '';
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-formats-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

const write = (name: string, text: string | Uint8Array) => {
  const p = join(dir, name);
  mkdirSync(join(p, '..'), { recursive: true });
  writeFileSync(p, text);
  return p;
};

async function ingest(paths: string[], extra: Partial<Parameters<typeof ingestSources>[0]> = {}) {
  const store = join(dir, 'store');
  const r = await ingestSources({ paths, store, wait: 5, ...extra });
  const { table } = await readStore(store);
  return { r, rows: tableToRows(table) };
}

// The same three logged points in every format; expected values follow DESIGN.md §4's
// canonical columns (accuracy → 1 − accuracy; percent → fraction).
const expectPoints = (rows: ReturnType<typeof tableToRows>, errors = [0.5, 0.25, 0.125]) => {
  expect(rows.map((r) => r.epochs)).toEqual([1, 2, 4]);
  expect(rows.map((r) => r.test_error)).toEqual(errors);
  for (const r of rows) {
    expect(r.width).toBe(64);
    expect(r.train_size).toBe(4000);
  }
};

describe('ingest formats (DESIGN.md §4, issue 2)', () => {
  it('CSV with CRLF, a BOM, quoted header names with spaces and synonyms', async () => {
    // RFC 4180 §2.1 (CRLF), §2.5 (quoted fields); header synonyms per DESIGN.md §4.
    const p = write('a.csv', '\uFEFF"Hidden Size",Epoch,"n train","Test Err",seed\r\n64,1,4000,0.5,1\r\n64,2,4000,0.25,1\r\n64,4,4000,0.125,1\r\n');
    const { r, rows } = await ingest([p]);
    expect(r.accepted).toBe(3);
    expectPoints(rows);
    expect(rows[0].seed).toBe(1);
    expect(rows[0].source).toBe(p);
    expect(rows.map((x) => x.source_line)).toEqual([2, 3, 4]);
  });

  it('TSV with accuracy in percent becomes error as a fraction', async () => {
    const p = write('a.tsv', 'width\tepoch\ttrain_size\ttest_acc\n64\t1\t4000\t50\n64\t2\t4000\t75\n64\t4\t4000\t87.5\n');
    const { rows } = await ingest([p]);
    expectPoints(rows);
  });

  it('whitespace-separated text with a header line and comments', async () => {
    const p = write('log.txt', '# run log\nwidth   epoch  n     test_error\n64      1      4000  0.5\n64\t2\t4000\t0.25\n\n64 4 4000 0.125\n');
    const { rows } = await ingest([p]);
    expectPoints(rows);
    expect(rows.map((x) => x.source_line)).toEqual([3, 4, 6]);
  });

  it('JSON Lines with Python-style NaN marks the run diverged (kept, not dropped)', async () => {
    const p = write('a.jsonl', '{"width":64,"epoch":1,"n":4000,"test_error":0.5}\n{"width":64,"epoch":2,"n":4000,"test_error":0.25}\n{"width":64,"epoch":4,"n":4000,"test_error":0.125}\n{"width":64,"epoch":8,"n":4000,"test_error":NaN}\n');
    const { rows } = await ingest([p]);
    expect(rows).toHaveLength(4);
    expect(rows[3].status).toBe('diverged');
    expect(rows[3].test_error).toBeNaN();
    expectPoints(rows.slice(0, 3));
  });

  it('a JSON array of nested records with a dotted --map', async () => {
    const recs = [1, 2, 4].map((e, i) => ({ config: { model: { size: 64 }, data: { count: 4000 }, optimizer: 'adam' }, step: e, eval: { err: [0.5, 0.25, 0.125][i] } }));
    const p = write('a.json', JSON.stringify(recs));
    const { r, rows } = await ingest([p], { map: { width: 'config.model.size', train_size: 'config.data.count', test_error: 'eval.err' } });
    expect(r.rejected).toBe(0);
    expectPoints(rows);
    // Other config keys become the condition.
    expect(rows[0].condition).toBe('optimizer=adam');
  });

  it('a JSON object per file: config keys apply to every history row', async () => {
    const p = write('run.json', JSON.stringify({ width: 64, train_size: 4000, label_noise: 0.2, seed: 3, optimizer: 'sgd', weight_decay: 0.0005, history: [1, 2, 4].map((e, i) => ({ epoch: e, test_error: [0.5, 0.25, 0.125][i] })) }));
    const { rows } = await ingest([p]);
    expectPoints(rows);
    expect(rows[0].label_noise).toBe(0.2);
    expect(rows[0].seed).toBe(3);
    expect(rows[0].condition).toBe('optimizer=sgd,weight_decay=0.0005');
  });

  it('a JSON object with a columnar history', async () => {
    const p = write('run.json', JSON.stringify({ width: 64, n: 4000, curves: { epoch: [1, 2, 4], test_error: [0.5, 0.25, 0.125] } }));
    const { rows } = await ingest([p]);
    expectPoints(rows);
  });

  it('run directories: YAML or JSON config + metrics file; the seed from the folder name', async () => {
    write('sweep/w64_seed7/config.yaml', 'model:\n  width: 64\ntrain_size: 4000\noptimizer: adam\nepochs: 4000\n');
    write('sweep/w64_seed7/metrics.csv', 'epoch,test_error,train_error\n1,0.5,0.4\n2,0.25,0.2\n4,0.125,0.1\n');
    write('sweep/w64_seed8/config.json', JSON.stringify({ model: { width: 64 }, train_size: 4000, optimizer: 'adam', seed: 8 }));
    write('sweep/w64_seed8/metrics.jsonl', '{"epoch":1,"test_error":0.5}\n{"epoch":2,"test_error":0.25}\n{"epoch":4,"test_error":0.125}\n');
    write('sweep/w64_seed8/checkpoint.txt', 'not a log');
    const { r, rows } = await ingest([join(dir, 'sweep')]);
    expect(r.sources).toBe(2);
    expect(rows).toHaveLength(6);
    expectPoints(rows.slice(0, 3));
    expectPoints(rows.slice(3));
    // Planned `epochs: 4000` in the config does not override the logged epoch column.
    expect(rows.map((x) => x.seed)).toEqual([7, 7, 7, 8, 8, 8]);
    expect(new Set(rows.map((x) => x.condition))).toEqual(new Set(['optimizer=adam']));
    expect(rows[0].train_error).toBe(0.4);
  });

  it('an Arrow IPC file written by apache-arrow (independent writer); extra numeric columns kept', async () => {
    const t = tableFromArrays({
      width: new Float64Array([64, 64, 64]),
      epoch: new Int32Array([1, 2, 4]),
      n: new Float64Array([4000, 4000, 4000]),
      test_error: new Float64Array([0.5, 0.25, 0.125]),
      sigma2: new Float64Array([0.25, 0.25, 0.25]),
    });
    const p = write('a.arrow', tableToIPC(t, 'file'));
    const { rows } = await ingest([p]);
    expectPoints(rows);
    expect(rows[0].extra.sigma2).toBe(0.25);
  });

  it('stdin with `-`, sniffed as CSV; the same content twice is a no-op', async () => {
    const body = new TextEncoder().encode('width,epoch,n,test_error\n64,1,4000,0.5\n64,2,4000,0.25\n64,4,4000,0.125\n');
    const { r, rows } = await ingest(['-'], { readStdin: () => body });
    expect(r.accepted).toBe(3);
    expect(rows[0].source).toBe('-');
    expectPoints(rows);
    const again = await ingest(['-'], { readStdin: () => body });
    expect(again.r.unchanged).toBe(1);
    expect(again.rows).toHaveLength(3);
  });

  it('--set fills an axis the log lacks; --seed-from reads the seed from the path', async () => {
    const p = write('rep-3.csv', 'width,epoch,test_error\n64,1,0.5\n64,2,0.25\n64,4,0.125\n');
    const { rows } = await ingest([p], { set: { train_size: '4000', label_noise: '0.1', augment: 'none' }, seedFrom: /rep-(\d+)/ });
    expectPoints(rows);
    expect(rows[0].seed).toBe(3);
    expect(rows[0].label_noise).toBe(0.1);
    expect(rows[0].condition).toBe('augment=none');
  });

  it('percent detection is per column and can be overridden with scale', async () => {
    // Percent → fraction (DESIGN.md §4); a forced 'fraction' makes 50 out of range (rejected, counted).
    const p = write('pct.csv', 'width,epoch,n,test_error,train_error\n64,1,4000,50,0.4\n64,2,4000,25,0.2\n64,4,4000,12.5,0.1\n');
    const auto = await ingest([p]);
    expectPoints(auto.rows);
    expect(auto.rows.map((r) => r.train_error)).toEqual([0.4, 0.2, 0.1]);
    expect(auto.r.notes.join('\n')).toContain("column 'test_error' read as percent");
    rmSync(join(dir, 'store'), { recursive: true });
    const forced = await ingest([p], { scale: { test_error: 'fraction' } });
    expect(forced.r).toMatchObject({ read: 3, accepted: 0, rejected: 3 });
    expect(forced.r.rejects[0].reason).toBe('test_error must be between 0 and 1 (or a percent), got 50');
  });
});
