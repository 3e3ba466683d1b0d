import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers/runCli.js';

const FIX = join(import.meta.dirname, '../fixtures/ingest/shapes');
let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-describe-'));
  cpSync(join(FIX, 'run-folders'), join(dir, 'runs'), { recursive: true });
  cpSync(join(FIX, 'per-seed.json'), join(dir, 'per-seed.json'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('datlas describe', () => {
  it('ingest prints the layout; describe --json has the DESIGN.md shape and the column sources', () => {
    const store = join(dir, 'store');
    const ing = runCli(['ingest', join(dir, 'runs'), join(dir, 'per-seed.json'), '--store', store, '--keys', 'seed,label_noise', '--json']);
    expect(ing.code).toBe(0);
    const r = JSON.parse(ing.stdout);
    expect(r.read).toBe(r.accepted + r.duplicates + r.rejected + r.pending + r.skipped);
    expect([r.read, r.accepted, r.skipped]).toEqual([20, 16, 4]);
    expect(r.layouts).toHaveLength(2);
    expect(r.mapping.width).toBe('config width | k');

    const text = runCli(['ingest', join(dir, 'runs'), '--store', join(dir, 'store2')]);
    expect(text.stdout).toMatch(/width ← config width/);
    expect(text.stdout).toMatch(/conditions: 1 \(lr=0\.05,optimizer=sgd: 4 runs\)/);

    const d = runCli(['describe', '--store', store, '--json']);
    expect(d.code).toBe(0);
    const j = JSON.parse(d.stdout);
    expect(j).toMatchObject({
      rows: 16, runs: 12,
      axes: { width: [4, 8], train_size: [2000, 4000], label_noise: [0.1, 0.3], epochs: { min: 1, max: 100, distinct: 3 } },
      seeds: [0, 1, 7, 8],
      conditions: [{ condition: '', runs: 8 }, { condition: 'lr=0.05,optimizer=sgd', runs: 4 }],
      rejected: {},
    });
    expect(j.columns.width).toBe('config width | k');
    expect(j.columns.label_noise).toMatch(/keys under 'per_seed\.\*'/);
    const human = runCli(['describe', '--store', store]);
    expect(human.stdout).toMatch(/16 rows, 12 runs/);
    expect(human.stdout).toMatch(/width ← config width \| k/);
  });

  it('a bad --keys is a usage error (exit 2); describe of no store exits 1', () => {
    expect(runCli(['ingest', join(dir, 'per-seed.json'), '--store', join(dir, 's3'), '--keys', 'a=b']).code).toBe(2);
    expect(runCli(['describe', '--store', join(dir, 'none')]).code).toBe(1);
  });
});
