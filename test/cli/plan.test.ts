import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { parseSpec } from '../../src/plan/parseSpec.js';
import { key, SPEC_TEXT, spec, storeFor, tableCsv } from '../plan/fixtures.js';

const run = (width: number, train_size: number, label_noise: number, seed: number, condition = 'adam') => ({ condition, width, train_size, label_noise, seed });
const removed = [run(32, 1000, 0, 1), run(256, 4000, 0.2, 0)];
const truncated = [{ run: run(8, 4000, 0.2, 2), at: 10 }];
const diverged = [run(128, 1000, 0.2, 1)];
// Wall time c · width^1.5 · n · epochs (seconds): the plan fits a = 1.5 and speaks in seconds.
const wallPerEpoch = (r: { width: number; train_size: number }) => 1e-7 * r.width ** 1.5 * r.train_size;

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-plan-cli-'));
  writeFileSync(join(dir, 'runs.csv'), tableCsv(storeFor(spec, { removed, truncated, diverged, wallPerEpoch })));
  writeFileSync(join(dir, 'sweep.yaml'), SPEC_TEXT);
  const r = runCli(['ingest', 'runs.csv', '--quiet'], { cwd: dir });
  expect(r.code, r.stderr).toBe(0);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('datlas plan', () => {
  it('--json: the gaps first, resume from the epoch reached, costs from the fitted model', () => {
    const r = runCli(['plan', '--spec', 'sweep.yaml', '--json', '--no-refine'], { cwd: dir });
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    // DESIGN.md §6: {"budget","cost","runs":[{...axes,"seed","epochs","reason","cost"}]}
    expect(j.budget).toBeNull();
    expect(j.runs.map(key).sort()).toEqual([...removed, truncated[0].run, ...diverged].map(key).sort());
    expect(j.runs.find((x: { reason: string }) => x.reason === 'resume')).toMatchObject({ width: 8, seed: 2, resume_from: 10, epochs: 1000 });
    expect(j.model.a).toBeCloseTo(1.5, 6);
    expect(j.units).toBe('seconds');
    const x = j.runs.find((y: { width: number }) => y.width === 256);
    expect(x.cost).toBeCloseTo(1e-7 * 256 ** 1.5 * 4000 * 1000, -1);
    expect(j.cost).toBeCloseTo(j.runs.reduce((s: number, y: { cost: number }) => s + y.cost, 0), 0);
  });

  it('a Slurm array whose task k runs the k-th planned run, and a budget in hours', () => {
    const tpl = 'printf "<%s>\\n" {index} {run} {width} {train_size} {seed} {resume_from} {label_noise}';
    const r = runCli(['plan', '--spec', 'sweep.yaml', '--no-refine', '--budget', '0.5h', '--emit', 'slurm', '--command', tpl, '--out', 'next.sbatch', '--max-parallel', '2', '--quiet'], { cwd: dir });
    expect(r.code, r.stderr).toBe(0);
    const script = join(dir, 'next.sbatch');
    const text = readFileSync(script, 'utf8');
    const lines = readFileSync(join(dir, 'next.csv'), 'utf8').trimEnd().split('\r\n');
    const n = lines.length - 1;
    expect(n).toBeGreaterThan(0);
    expect(n).toBeLessThan(4);
    expect(text).toContain(`#SBATCH --array=0-${n - 1}%2`);
    expect(spawnSync('/bin/bash', ['-n', script]).status).toBe(0);
    const header = lines[0].split(',');
    for (let k = 0; k < n; k++) {
      const out = spawnSync('/bin/bash', [script], { env: { PATH: '/nonexistent', SLURM_ARRAY_TASK_ID: String(k) }, encoding: 'utf8' });
      expect(out.status, out.stderr).toBe(0);
      const cells = lines[k + 1].split(',');
      const get = (c: string) => cells[header.indexOf(c)];
      expect(out.stdout.trimEnd().split('\n')).toEqual(
        [String(k), get('run'), get('width'), get('train_size'), get('seed'), get('resume_from') || '0', get('label_noise')].map((v) => `<${v}>`),
      );
    }
  });

  it('--emit shell prints one quoted command per run; shell and slurm need --command', () => {
    const r = runCli(['plan', '--spec', 'sweep.yaml', '--no-refine', '--emit', 'shell', '--command', 'train --w {width} --n {train_size} --ln {label_noise} --s {seed} --from {resume_from}'], { cwd: dir });
    expect(r.code, r.stderr).toBe(0);
    const cmds = r.stdout.split('\n').filter((l) => l.startsWith('train '));
    expect(cmds).toHaveLength(4);
    expect(new Set(cmds).size).toBe(4);
    expect(cmds).toContain('train --w 8 --n 4000 --ln 0.2 --s 2 --from 10');
    const none = runCli(['plan', '--spec', 'sweep.yaml', '--emit', 'slurm'], { cwd: dir });
    expect(none.code).toBe(2);
    expect(none.stderr).toContain('--command');
  });

  it('refuses (exit 2) a --command that leaves out a setting varying among the runs, unless --allow-collapse', () => {
    const out = join(dir, 'dup.sh');
    for (const emit of ['shell', 'slurm']) {
      const r = runCli(['plan', '--spec', 'sweep.yaml', '--no-refine', '--emit', emit, '--command', 'train --w {width} --s {seed}', '--out', out], { cwd: dir });
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('{train_size} (');
      expect(r.stderr).toContain('{label_noise} (');
      expect(r.stderr).not.toContain('internal error');
    }
    const ok = runCli(['plan', '--spec', 'sweep.yaml', '--no-refine', '--emit', 'shell', '--command', 'train --w {width} --s {seed}', '--allow-collapse'], { cwd: dir });
    expect(ok.code, ok.stderr).toBe(0);
    const cmds = ok.stdout.split('\n').filter((l) => l.startsWith('train '));
    expect(cmds.length).toBeGreaterThan(0);
    expect(new Set(cmds).size).toBe(cmds.length);
  });

  it('--init writes a commented example that parses, and will not overwrite it', () => {
    const a = runCli(['plan', '--init', 'new.yaml', '--quiet'], { cwd: dir });
    expect(a.code, a.stderr).toBe(0);
    const text = readFileSync(join(dir, 'new.yaml'), 'utf8');
    expect(text).toMatch(/^# /);
    expect(parseSpec(text, 'new.yaml').axes.width).toEqual([4, 8, 16, 32, 64, 128, 256]);
    const b = runCli(['plan', '--init', 'new.yaml'], { cwd: dir });
    expect(b.code).toBe(1);
  });

  it('plans every run of the spec when nothing has run yet (no store)', () => {
    const empty = mkdtempSync(join(tmpdir(), 'datlas-plan-empty-'));
    try {
      writeFileSync(join(empty, 'sweep.yaml'), SPEC_TEXT);
      const r = runCli(['plan', '--spec', 'sweep.yaml', '--json', '--budget', '12'], { cwd: empty });
      expect(r.code, r.stderr).toBe(0);
      const j = JSON.parse(r.stdout);
      expect(j.units).toBe('relative');
      expect(j.cost).toBeLessThanOrEqual(12);
      expect(j.runs.length + j.dropped.runs).toBe(72);
      // Cheapest first: the smallest width and size, 1 relative unit each (a = 2 assumed).
      expect(j.runs[0]).toMatchObject({ width: 8, train_size: 1000, cost: 1, reason: 'missing' });
      const t = runCli(['plan', '--spec', 'sweep.yaml', '--budget', '2h'], { cwd: empty });
      expect(t.code).toBe(2);
    } finally {
      rmSync(empty, { recursive: true, force: true });
    }
  });
});
