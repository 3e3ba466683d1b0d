import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { readStore } from '../../src/store/readStore.js';
import { tableToRows } from '../../src/store/tableFromRows.js';

const FIXTURE = fileURLToPath(new URL('../fixtures/ingest/messy', import.meta.url));
let dir = '';
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-pool-'));
  cpSync(FIXTURE, join(dir, 'logs'), { recursive: true });
  utimesSync(join(dir, 'logs/a.csv'), new Date(1_700_000_000_000), new Date(1_700_000_000_000));
  utimesSync(join(dir, 'logs/b.jsonl'), new Date(1_700_000_100_000), new Date(1_700_000_100_000));
  for (let f = 0; f < 12; f++) {
    const lines = ['width,epoch,n,seed,optimizer,test_error,sigma2'];
    for (let e = 1; e <= 50; e++) lines.push(`${2 ** (f % 4 + 2)},${e},1000,${f},${f % 2 ? 'adam' : 'sgd'},${(1 / (e + f)).toFixed(6)},${f / 10}`);
    writeFileSync(join(dir, `logs/run${f}.csv`), `${lines.join('\n')}\n`);
  }
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

// The worker pool must give exactly what one thread gives (same rows, order, counts, rejects).
describe('parsing on worker threads', () => {
  it('matches the single-thread result', async () => {
    const one = await ingestSources({ paths: [join(dir, 'logs')], store: join(dir, 's1'), workers: 1 });
    const two = await ingestSources({ paths: [join(dir, 'logs')], store: join(dir, 's2'), workers: 2, minBytesForWorkers: 0 });
    const strip = (r: typeof one) => ({ ...r, notes: r.notes.length, rejects: r.rejects.map((x) => `${x.source}:${x.line}:${x.field}:${x.reason}`) });
    expect(strip(two)).toEqual(strip(one));
    expect(one.accepted).toBe(6 + 12 * 50);
    const a = tableToRows((await readStore(join(dir, 's1'))).table);
    const b = tableToRows((await readStore(join(dir, 's2'))).table);
    expect(b).toEqual(a);
  });
});
