import { mkdtempSync, rmSync, writeFileSync, existsSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { key, SPEC_TEXT, spec, storeFor, tableCsv } from '../plan/fixtures.js';

const run = (width: number, train_size: number, label_noise: number, seed: number, condition = 'adam') => ({ condition, width, train_size, label_noise, seed });
const removed = [run(64, 4000, 0.2, 2), run(128, 4000, 0.2, 2), run(256, 4000, 0.2, 2)];
const truncated = [{ run: run(16, 1000, 0.2, 1), at: 100 }];
const diverged = [run(8, 4000, 0, 0)];

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-cov-'));
  writeFileSync(join(dir, 'runs.csv'), tableCsv(storeFor(spec, { removed, truncated, diverged, extra: [run(512, 1000, 0, 0)] })));
  writeFileSync(join(dir, 'sweep.yaml'), SPEC_TEXT);
  const r = runCli(['ingest', 'runs.csv', '--quiet'], { cwd: dir });
  expect(r.code, r.stderr).toBe(0);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('datlas coverage', () => {
  it('--json has the DESIGN.md §6 shape and lists exactly the gaps', () => {
    const r = runCli(['coverage', '--spec', 'sweep.yaml', '--json'], { cwd: dir });
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.counts).toEqual({ complete: 72 - 5, partial: 1, missing: 3, diverged: 1 });
    const of = (s: string) => j.runs.filter((x: { status: string }) => x.status === s).map(key).sort();
    expect(of('missing')).toEqual(removed.map(key).sort());
    expect(of('partial')).toEqual([key(truncated[0].run)]);
    expect(of('diverged')).toEqual([key(diverged[0])]);
    for (const x of j.runs) expect(Object.keys(x)).toEqual(expect.arrayContaining(['width', 'train_size', 'label_noise', 'seed', 'status']));
    expect(j.extra).toHaveLength(1);
  });

  it('prints counts, then the gaps grouped compactly', () => {
    const r = runCli(['coverage', '--spec', 'sweep.yaml'], { cwd: dir });
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('complete 67 · partial 1 · missing 3 · diverged 1');
    expect(r.stdout).toContain('noise 0.2: width 64–256 × n 4000, seed 2 missing');
    expect(r.stdout).toContain('noise 0.2: width 16 × n 1000, seed 1 partial (stopped at epoch 100 of 1000)');
    expect(r.stdout).toContain('extra: 1 store run outside the spec (width 512: 1)');
  });

  it('writes the coverage image with its vega-lite spec beside it', () => {
    const r = runCli(['coverage', '--spec', 'sweep.yaml', '--out', 'out/coverage.png', '--quiet'], { cwd: dir });
    expect(r.code, r.stderr).toBe(0);
    const png = readFileSync(join(dir, 'out/coverage.png'));
    // PNG signature: ISO/IEC 15948 §5.2.
    expect([...png.subarray(0, 4)]).toEqual([0x89, 0x50, 0x4e, 0x47]);
    const vl = JSON.parse(readFileSync(join(dir, 'out/coverage.vl.json'), 'utf8'));
    const cell = vl.data.values.find((c: { width: number; train_size: number; label_noise: number }) => c.width === 128 && c.train_size === 4000 && c.label_noise === 0.2);
    expect(cell).toMatchObject({ planned: 3, complete: 2, missing: 1, label: '2/3' });
  });

  it('fails cleanly: bad spec names file, line and key (exit 1); missing --spec is a usage error (exit 2)', () => {
    writeFileSync(join(dir, 'bad.yaml'), 'axes:\n  width: [4, 8]\n  train_size: [10]\nseeds: 0\nepochs: 5\n');
    const bad = runCli(['coverage', '--spec', 'bad.yaml'], { cwd: dir });
    expect(bad.code).toBe(1);
    expect(bad.stderr.trim()).toBe('datlas: bad.yaml line 4: seeds: must be >= 1');
    const none = runCli(['coverage'], { cwd: dir });
    expect(none.code).toBe(2);
    const ext = runCli(['coverage', '--spec', 'sweep.yaml', '--out', 'x.gif'], { cwd: dir });
    expect(ext.code).toBe(2);
    const noStore = runCli(['coverage', '--spec', 'sweep.yaml', '--store', 'nowhere'], { cwd: dir });
    expect(noStore.code).toBe(1);
    expect(existsSync(join(dir, 'x.gif'))).toBe(false);
  });
});
