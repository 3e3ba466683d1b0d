import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { testRng } from '../analysis/makeCell.js';

// A synthetic model-wise sweep (our own test curve, not a published one): test error falls with
// width, with a bump centred at width = n/16 whose height grows with epochs (none at epoch 10);
// train error reaches 0 at width n/16 at the last epoch. 4 seeds, Gaussian seed noise sd 0.01.
let dir = '';
let store = '';
let single = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-ridge-'));
  const r = testRng(17);
  const lines = ['run,seed,width,epochs,train_size,label_noise,test_error,train_error'];
  const oneSeed = ['run,seed,width,epochs,train_size,label_noise,test_error,train_error'];
  for (const n of [500, 1000]) {
    for (let k = 0; k <= 14; k++) {
      const w = 2 ** (2 + k / 2);
      const u = Math.log2(w);
      for (let s = 0; s < 4; s++) {
        for (const e of [10, 100, 1000]) {
          const amp = { 10: 0, 100: 0.05, 1000: 0.12 }[e]!;
          const te = 0.45 - 0.02 * u + amp * Math.exp(-((u - Math.log2(n / 16)) ** 2)) + 0.01 * r.z();
          const tr = e === 1000 ? Math.max(0, 0.3 * (1 - (w * 16) / n)) : 0.2;
          lines.push(`w${w}n${n}s${s},${s},${w},${e},${n},0.1,${te.toFixed(5)},${tr.toFixed(5)}`);
          if (s === 0 && n === 1000) oneSeed.push(`w${w}n${n}s${s},${s},${w},${e},${n},0.1,${(te - 0.01 * r.z()).toFixed(5)},${tr.toFixed(5)}`);
        }
      }
    }
  }
  writeFileSync(join(dir, 'runs.csv'), `${lines.join('\n')}\n`);
  writeFileSync(join(dir, 'one.csv'), `${oneSeed.join('\n')}\n`);
  store = join(dir, 'store');
  single = join(dir, 'single');
  expect(runCli(['ingest', join(dir, 'runs.csv'), '--store', store, '--quiet']).code).toBe(0);
  expect(runCli(['ingest', join(dir, 'one.csv'), '--store', single, '--quiet']).code).toBe(0);
}, 60_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('datlas ridge', () => {
  it('prints the DESIGN.md §6 JSON with the peak near width n/16 and none at the earliest epoch', () => {
    const res = runCli(['ridge', '--kind', 'model', '--at', 'train_size=1000', '--store', store, '--json', '--boot', '300']);
    expect(res.code).toBe(0);
    const j = JSON.parse(res.stdout);
    expect(j).toMatchObject({ map: 'model', x: 'width', y: 'epochs', fixed: { train_size: 1000, label_noise: 0.1 } });
    expect(j.rows.map((r: { y: number }) => r.y)).toEqual([10, 100, 1000]);
    const [early, , last] = j.rows;
    expect(early.peak).toBeNull();
    expect(Object.keys(last.peak)).toEqual(expect.arrayContaining(['x', 'low', 'high', 'error', 'prominence']));
    expect(Math.abs(Math.log2(last.peak.x / (1000 / 16)))).toBeLessThan(0.5); // within one grid step (half an octave)
    expect(last.peak.low).toBeLessThanOrEqual(last.peak.x);
    expect(last.peak.high).toBeGreaterThanOrEqual(last.peak.x);
    // train error 0.3·(1 − 16w/n) reaches 0.01 at w = (1 − 0.01/0.3)·n/16, interpolated between grid widths
    expect(Math.abs(Math.log2(last.threshold / (1000 / 16)))).toBeLessThan(0.5);
    expect(last.ratio).toBeCloseTo(last.peak.x / last.threshold, 10);
    // label_noise has one value in this store: fixed (in the JSON), but no pick to report.
    expect(res.stderr).not.toContain('picked');
    expect(j.picked).toEqual([]);
  });

  it('says it plainly in text, and says when the noise came from a single-seed curve', () => {
    const res = runCli(['ridge', '--at', 'train_size=1000', '--store', store, '--boot', '200']);
    expect(res.code).toBe(0);
    expect(res.stdout).toMatch(/epochs 1000: peak at width ≈ [\d.k]+ \(95% interval [\d.k]+–[\d.k]+\)/);
    expect(res.stdout).toMatch(/epochs 10: no significant peak/);
    const one = runCli(['ridge', '--store', single, '--boot', '200']);
    expect(one.code).toBe(0);
    expect(one.stdout).toContain("curve's own noise");
  });

  it('fails cleanly: bad flags exit 2, a missing store exits 1, one line, no stack', () => {
    const bad = runCli(['ridge', '--kind', 'diagonal', '--store', store]);
    expect(bad.code).toBe(2);
    const neg = runCli(['ridge', '--min-prominence', '-1', '--store', store]);
    expect(neg.code).toBe(2);
    expect(neg.stderr).toContain('--min-prominence');
    const none = runCli(['ridge', '--store', join(dir, 'nothing')]);
    expect(none.code).toBe(1);
    expect(none.stderr.trim().split('\n')).toHaveLength(1);
    expect(none.stderr).toContain('no store');
    const help = runCli(['ridge', '--help']);
    expect(help.code).toBe(0);
    expect(help.stdout).toContain('datlas ridge --kind model');
  });
});

// End to end on single-seed epoch logs shaped like epoch-wise double-descent runs (invented by
// curveFixtures.ts: 4,800 epochs, a fall to epoch 30, a broad rise over 120–300, a slow fall, and
// one-epoch spikes, one at epoch 15), and a monotone control, through ingest and `ridge --kind epoch`.
describe('ridge --kind epoch on single-seed logs', () => {
  it('puts the peak in epochs 50–600 on the run, none on the control, and says it rests on a smoothed curve', async () => {
    const { control, noisyCurve, runA } = await import('../analysis/curveFixtures.js');
    const d = mkdtempSync(join(tmpdir(), 'datlas-epoch-'));
    try {
      const write = (name: string, curve: (e: number) => number, seed: number, forced: [number, number][]) => {
        const { epochs, values } = noisyCurve(curve, { epochs: 4800, sd: 0.012, rho: 0.5, spikeRate: 0.01, spike: [0.03, 0.15], forced, seed });
        writeFileSync(join(d, `${name}.csv`), `epoch,test_error\n${epochs.map((e, i) => `${e},${values[i].toFixed(5)}`).join('\n')}\n`);
        const st = join(d, `${name}-store`);
        expect(runCli(['ingest', join(d, `${name}.csv`), '--store', st, '--set', 'width=64', '--set', 'train_size=1000', '--set', 'seed=0', '--quiet']).code).toBe(0);
        return st;
      };
      const run = runCli(['ridge', '--kind', 'epoch', '--store', write('run', runA, 3, [[15, 0.12]]), '--boot', '200', '--json']);
      expect(run.code, run.stderr).toBe(0);
      const row = JSON.parse(run.stdout).rows[0];
      expect(row.model).toBe('smoothed-curve');
      expect(row.peak.x).toBeGreaterThan(50);
      expect(row.peak.x).toBeLessThan(600);
      expect(row.peak.pAdjusted).toBeLessThan(0.05);
      expect(row.smooth.x.length).toBeGreaterThan(100);
      const text = runCli(['ridge', '--kind', 'epoch', '--store', join(d, 'run-store'), '--boot', '100']);
      expect(text.stdout).toMatch(/peak of the curve smoothed on the log axis/);
      expect(text.stdout).toMatch(/after Benjamini–Hochberg correction|1 of 1 rows/);
      const ctl = runCli(['ridge', '--kind', 'epoch', '--store', write('ctl', control, 4, []), '--boot', '100', '--json']);
      expect(JSON.parse(ctl.stdout).rows[0].peak).toBeNull();
    } finally {
      rmSync(d, { recursive: true, force: true });
    }
  }, 120_000);
});
