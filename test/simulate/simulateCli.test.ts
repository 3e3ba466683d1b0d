import { afterAll, describe, expect, it, vi } from 'vitest';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers/runCli.js';

const root = mkdtempSync(join(tmpdir(), 'datlas-simulate-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const SMALL = ['--preset', 'quick', '--seeds', '2', '--widths', '20,40,80', '--train-sizes', '40', '--epochs', '1000', '--test-size', '300'];
const CANONICAL = ['run', 'seed', 'width', 'train_size', 'label_noise', 'epochs', 'test_error', 'train_error', 'test_loss', 'train_loss', 'wall_seconds'];

function parseCsv(text: string): Record<string, string>[] {
  const [head, ...lines] = text.trim().split('\n');
  const cols = head.split(',');
  return lines.map((l) => Object.fromEntries(l.split(',').map((v, i) => [cols[i], v])));
}

describe('datlas simulate', () => {
  it('writes one folder per run (config.json + metrics.csv) across worker threads, same numbers as one thread', () => {
    const a = join(root, 'dirs');
    const r = runCli(['simulate', ...SMALL, '--out', a, '--shape', 'dirs', '--workers', '2', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out).toMatchObject({ preset: 'quick', shape: 'dirs', runs: 12, workers: 2 });
    const runs = readdirSync(a).sort();
    expect(runs).toHaveLength(12);
    expect(runs[0]).toBe('rf-s0-n40-w20-q0.1');
    const config = JSON.parse(readFileSync(join(a, runs[0], 'config.json'), 'utf8'));
    expect(config).toEqual({ run: 'rf-s0-n40-w20-q0.1', seed: 0, width: 20, train_size: 40, label_noise: 0.1 });
    const metrics = readFileSync(join(a, runs[0], 'metrics.csv'), 'utf8');
    expect(metrics.split('\n')[0]).toBe('epochs,test_error,train_error,test_loss,train_loss,wall_seconds');
    // Log-spaced epochs 1..1000 at 6 per decade (round(10^(k/6)), duplicates dropped).
    expect(parseCsv(metrics).map((x) => Number(x.epochs))).toEqual([1, 2, 3, 5, 7, 10, 15, 22, 32, 46, 68, 100, 147, 215, 316, 464, 681, 1000]);
    expect(out.rows).toBe(12 * 18);

    // The same sweep on one thread, as one CSV: identical values apart from the measured time.
    const b = join(root, 'csv');
    const s = runCli(['simulate', ...SMALL, '--out', b, '--shape', 'csv', '--workers', '1', '--json']);
    expect(s.code, s.stderr).toBe(0);
    const text = readFileSync(join(b, 'sweep.csv'), 'utf8');
    expect(text.split('\n')[0]).toBe(CANONICAL.join(','));
    const rows = parseCsv(text).filter((row) => row.run === runs[0]);
    const curve = parseCsv(metrics);
    expect(rows.map((x) => [x.epochs, x.test_error, x.train_loss])).toEqual(curve.map((x) => [x.epochs, x.test_error, x.train_loss]));
  });

  it('--eval-noise adds per-epoch noise to test error only (train error as without it)', () => {
    const a = join(root, 'quiet');
    const b = join(root, 'noisy');
    expect(runCli(['simulate', ...SMALL, '--out', a, '--workers', '1', '--quiet']).code).toBe(0);
    expect(runCli(['simulate', ...SMALL, '--out', b, '--workers', '1', '--quiet', '--eval-noise', '0.02']).code).toBe(0);
    const read = (dir: string) => parseCsv(readFileSync(join(dir, readdirSync(dir).find((f) => f.endsWith('.csv'))!), 'utf8'));
    const qa = read(a);
    const qb = read(b);
    expect(qb.length).toBe(qa.length);
    const d = qa.map((r, i) => Number(qb[i].test_error) - Number(r.test_error));
    const sd = Math.sqrt(d.reduce((s, v) => s + v * v, 0) / d.length);
    expect(sd).toBeGreaterThan(0.01);
    expect(qa.map((r) => r.train_error)).toEqual(qb.map((r) => r.train_error));
  });

  it('writes one JSON Lines file per run for the linear preset, with sigma2, signal_in, signal_out', () => {
    const dir = join(root, 'lin');
    const r = runCli(['simulate', '--preset', 'linear', '--seeds', '2', '--widths', '10,30', '--train-sizes', '20', '--ridge', 'optimal', '--out', dir, '--shape', 'jsonl', '--quiet']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/wrote 4 runs/);
    const files = readdirSync(join(dir, 'runs')).sort();
    expect(files).toEqual(['lin-s0-n20-p10.jsonl', 'lin-s0-n20-p30.jsonl', 'lin-s1-n20-p10.jsonl', 'lin-s1-n20-p30.jsonl']);
    const rec = JSON.parse(readFileSync(join(dir, 'runs', files[0]), 'utf8').trim());
    expect(Object.keys(rec)).toEqual(expect.arrayContaining(['run', 'seed', 'width', 'train_size', 'epochs', 'test_loss', 'train_loss', 'sigma2', 'signal_in', 'signal_out']));
    expect(rec).not.toHaveProperty('test_error'); // a regression sweep logs no error column
    expect(rec.sigma2).toBe(0.25);
    expect(rec.signal_in + rec.signal_out).toBeCloseTo(1, 5);
  });

  it('rejects bad options with exit 2 and one line', async () => {
    // In process (the entry point's main) to keep the test fast; the spawned CLI is covered above.
    const { main } = await import('../../src/cli/main.js');
    const errors: string[] = [];
    const spy = vi.spyOn(process.stderr, 'write').mockImplementation((chunk: string | Uint8Array) => {
      errors.push(String(chunk));
      return true;
    });
    try {
      for (const args of [
        ['--preset', 'nope'],
        ['--shape', 'parquet'],
        ['--widths', '10,x'],
        ['--seeds', '0'],
        ['--label-noise', '1.5'],
        ['--ridge', 'optimal'],
        ['--preset', 'linear', '--ridge', '-1'],
        ['--preset', 'linear', '--label-noise', '0.1'],
        ['--eval-noise', '-0.1'],
        ['--eval-noise', 'x'],
        ['--preset', 'linear', '--eval-noise', '0.01'],
      ]) {
        errors.length = 0;
        const code = await main(['simulate', ...args, '--out', join(root, 'never')]);
        expect(code, args.join(' ')).toBe(2);
        expect(errors.join('').trim().split('\n'), args.join(' ')).toHaveLength(1);
      }
      writeFileSync(join(root, 'marker'), 'x');
      errors.length = 0;
      expect(await main(['simulate', '--out', root])).toBe(2);
      expect(errors.join('')).toMatch(/not empty/);
    } finally {
      spy.mockRestore();
    }
  });
});
