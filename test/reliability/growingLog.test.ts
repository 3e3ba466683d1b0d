import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { spawn } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { checkStore } from './storeCheck.js';

// Logs still being written (DESIGN.md §4): another process appends rows, often half a line at
// a time, while ingests run back to back. A cut last line is pending (not rejected), is picked
// up by a later ingest, and every row ends up in the store exactly once.
const ROWS = 150;
const APPENDER = `
const { appendFileSync } = require('node:fs');
const [csv, jsonl, rows] = process.argv.slice(1);
const sleep = (ms) => Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);
for (let i = 1; i <= Number(rows); i++) {
  const c = 'g,8,' + i + ',1000,1,' + (0.5 / i).toFixed(6) + ',' + (0.4 / i).toFixed(6) + '\\n';
  const j = JSON.stringify({ run: 'h', width: 16, epoch: i, n: 1000, test_error: 0.5 / i }) + '\\n';
  // Each line in two writes with a pause between: ingests see half lines.
  const cut = 1 + (i * 7) % (c.length - 2);
  appendFileSync(csv, c.slice(0, cut));
  appendFileSync(jsonl, j.slice(0, cut));
  sleep(2);
  appendFileSync(csv, c.slice(cut));
  appendFileSync(jsonl, j.slice(cut));
  sleep(3);
}
`;

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-growing-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('ingest while another process appends', () => {
  it('a cut last line is pending, picked up later, and every row is stored once', async () => {
    const logs = join(dir, 'logs');
    mkdirSync(logs);
    const csv = join(logs, 'run.csv');
    const jsonl = join(logs, 'run.jsonl');
    writeFileSync(csv, 'run,width,epoch,n,seed,test_error,train_error\n');
    writeFileSync(jsonl, '');
    const store = join(dir, 'store');
    const child = spawn(process.execPath, ['-e', APPENDER, csv, jsonl, String(ROWS)], { stdio: 'ignore' });
    const done = new Promise<void>((resolve) => child.on('close', () => resolve()));
    let running = true;
    void done.then(() => (running = false));
    let ingests = 0;
    let sawPending = 0;
    let last = 0;
    while (running) {
      const r = await ingestSources({ paths: [logs], store });
      ingests++;
      expect(r.read).toBe(r.accepted + r.duplicates + r.rejected + r.pending);
      expect(r.rejected).toBe(0); // a half line is never a bad row
      expect(r.pending).toBeLessThanOrEqual(2);
      if (r.pending > 0) sawPending++;
      const state = await checkStore(store);
      // Never a row twice, never fewer rows than before.
      const keys = new Set(state.table.run.map((run, i) => `${run}@${state.table.epochs[i]}`));
      expect(keys.size).toBe(state.rows);
      expect(state.rows).toBeGreaterThanOrEqual(last);
      last = state.rows;
      await new Promise((r) => setTimeout(r, 5));
    }
    await done;
    const r = await ingestSources({ paths: [logs], store });
    expect(r.pending).toBe(0);
    const state = await checkStore(store);
    expect(state.rows).toBe(2 * ROWS);
    const epochs = (run: string) => state.table.epochs.filter((_, i) => state.table.run[i] === run);
    expect(Array.from(epochs('g'))).toEqual(Array.from({ length: ROWS }, (_, i) => i + 1));
    expect(epochs('h').length).toBe(ROWS);
    console.log(`growing logs: ${ingests} ingests while ${2 * ROWS} rows were appended half a line at a time; ${sawPending} saw a cut last line (pending)`);
    expect(ingests).toBeGreaterThan(5);
    expect(sawPending).toBeGreaterThan(0);
  }, 60_000);
});
