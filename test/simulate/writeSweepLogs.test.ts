import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import { writeSweepLogs } from '../../src/simulate/writeSweepLogs.js';

const root = mkdtempSync(join(tmpdir(), 'datlas-logs-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const table = tableFromRows([
  { run: 'r1', condition: 'adam, lr=1e-3', seed: 0, width: 8, train_size: 64, label_noise: 0.1, epochs: 1, test_error: 0.5, train_error: 0.25, test_loss: 1 / 3, train_loss: 0.2, wall_seconds: 0.01 },
  { run: 'r1', condition: 'adam, lr=1e-3', seed: 0, width: 8, train_size: 64, label_noise: 0.1, epochs: 10, test_error: NaN, train_error: 0.125, test_loss: 0.3, train_loss: 0.1, wall_seconds: 0.02 },
  { run: 'r2', condition: 'say "hi"', seed: 1, width: 16, train_size: 64, label_noise: 0.1, epochs: 1, test_error: 0.4, train_error: 0.2, test_loss: 0.9, train_loss: 0.3, wall_seconds: 0.03 },
]);

describe('writeSweepLogs', () => {
  it('csv: RFC 4180 quoting, empty field for a missing value, six significant digits', async () => {
    const [path] = await writeSweepLogs({ table, dir: join(root, 'csv'), shape: 'csv' });
    const lines = readFileSync(path, 'utf8').trim().split('\n');
    expect(lines[0]).toBe('run,condition,seed,width,train_size,label_noise,epochs,test_error,train_error,test_loss,train_loss,wall_seconds');
    expect(lines[1]).toBe('r1,"adam, lr=1e-3",0,8,64,0.1,1,0.5,0.25,0.333333,0.2,0.01'); // RFC 4180 §2.6
    expect(lines[2]).toBe('r1,"adam, lr=1e-3",0,8,64,0.1,10,,0.125,0.3,0.1,0.02');
    expect(lines[3]).toBe('r2,"say ""hi""",1,16,64,0.1,1,0.4,0.2,0.9,0.3,0.03'); // RFC 4180 §2.7
  });

  it('jsonl: one file per run, null for a missing value; dirs: config.json + metrics.csv', async () => {
    const files = await writeSweepLogs({ table, dir: join(root, 'jsonl'), shape: 'jsonl' });
    expect(files.map((f) => f.split('/').pop())).toEqual(['r1.jsonl', 'r2.jsonl']);
    const recs = readFileSync(files[0], 'utf8').trim().split('\n').map((l) => JSON.parse(l));
    expect(recs[1]).toMatchObject({ run: 'r1', epochs: 10, test_error: null, train_error: 0.125 });
    await writeSweepLogs({ table, dir: join(root, 'dirs'), shape: 'dirs' });
    expect(readdirSync(join(root, 'dirs')).sort()).toEqual(['r1', 'r2']);
    expect(JSON.parse(readFileSync(join(root, 'dirs', 'r2', 'config.json'), 'utf8'))).toEqual({ run: 'r2', condition: 'say "hi"', seed: 1, width: 16, train_size: 64, label_noise: 0.1 });
    expect(readFileSync(join(root, 'dirs', 'r1', 'metrics.csv'), 'utf8')).toBe('epochs,test_error,train_error,test_loss,train_loss,wall_seconds\n1,0.5,0.25,0.333333,0.2,0.01\n10,,0.125,0.3,0.1,0.02\n');
  });

  it('leaves out columns that are empty for the whole sweep', async () => {
    const regression = tableFromRows([{ run: 'a', seed: 0, width: 4, train_size: 10, epochs: 1, test_loss: 2, train_loss: 1, extra: { sigma2: 0.25 } }]);
    const [path] = await writeSweepLogs({ table: regression, dir: join(root, 'reg'), shape: 'csv' });
    expect(readFileSync(path, 'utf8')).toBe('run,seed,width,train_size,label_noise,epochs,test_loss,train_loss,sigma2\na,0,4,10,0,1,2,1,0.25\n');
  });
});
