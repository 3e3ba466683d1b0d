import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';

/**
 * The closed planning loop through the CLI, as a user runs it: a coarse start of 5 widths ×
 * 2 train sizes × 2 seeds, then two rounds of `plan --max-runs 7 --emit csv --out FILE` →
 * `simulate --plan FILE --shape jsonl --out DIR` → `ingest`; the model-wise ridge at both train
 * sizes must lie within 0.25 octave of what a dense 17-width, 3-seed grid finds (34 runs
 * against 102).
 *
 * Scenario (stated, not tuned to this test): the quick preset (random features, GD to 10⁶
 * epochs, 1,000 test points), label noise 0.1, train sizes 100 and 200, widths 32–512 (coarse
 * an octave apart, dense a quarter octave apart over the same span), seeds 0–1 (coarse) and 0–2
 * (dense). The random-features peak sits near width = n (Belkin, Hsu, Ma & Mandal 2019;
 * REFERENCES.md §4, §7), i.e. about 0.3 octave from the nearest coarse width at both sizes, so
 * the coarse grid alone does not place it. These are the quick preset's two sizes at which the
 * dense grid itself finds a clear peak (at n ≥ 300 the right flank inside 512 is too short and
 * the dense grid's own peak is inside seed noise: nothing to compare with). bench:plan runs this
 * loop over more scenarios and restarts (BENCHMARKS.md).
 */
const WIDTHS = [32, 64, 128, 256, 512];
const DENSE = Array.from({ length: 17 }, (_, k) => Math.round(32 * 2 ** (k / 4)));
const SIZES = [100, 200];
const EPOCHS = 1_000_000;

let dir = '';
const cli = (args: string[]) => {
  const r = runCli(args, { cwd: dir });
  expect(r.code, `${args.join(' ')}\n${r.stderr}`).toBe(0);
  return r;
};
const runFiles = (d: string) => readdirSync(join(dir, d, 'runs')).filter((f) => f.endsWith('.jsonl'));

interface RidgeJson {
  rows: { y: number; peak: { x: number; low: number; high: number; prominence: number } | null }[];
}
const ridgeAt = (store: string, n: number) => {
  const r = cli(['ridge', '--kind', 'model', '--store', store, '--at', `train_size=${n}`, '--at', 'label_noise=0.1', '--json']);
  return (JSON.parse(r.stdout) as RidgeJson).rows.find((row) => row.y === EPOCHS)?.peak ?? null;
};

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-plan-loop-'));
  const sim = ['simulate', '--preset', 'quick', '--train-sizes', SIZES.join(','), '--label-noise', '0.1', '--shape', 'jsonl', '--quiet'];
  cli([...sim, '--widths', WIDTHS.join(','), '--seeds', '2', '--out', 'coarse']);
  cli(['ingest', 'coarse', '--store', 'store', '--quiet']);
  cli([...sim, '--widths', DENSE.join(','), '--seeds', '3', '--out', 'dense']);
  cli(['ingest', 'dense', '--store', 'dense-store', '--quiet']);
  writeFileSync(join(dir, 'grid.yaml'), `axes:\n  width: [${WIDTHS}]\n  train_size: [${SIZES}]\n  label_noise: [0.1]\nseeds: 2\nepochs: ${EPOCHS}\n`);
}, 240_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('closed-loop planning through the CLI', () => {
  it('two rounds of 7 planned runs place the ridge at both train sizes within 0.25 octave of the dense grid (34 runs against 102)', () => {
    const planned: string[][] = [];
    for (const round of [1, 2]) {
      cli(['plan', '--store', 'store', '--spec', 'grid.yaml', '--max-runs', '7', '--emit', 'csv', '--out', `round${round}.csv`, '--quiet']);
      const lines = readFileSync(join(dir, `round${round}.csv`), 'utf8').trimEnd().split('\r\n');
      // RFC 4180 header + one line per run; the cap holds, and every run says what it sharpens.
      expect(lines[0].split(',')).toEqual(expect.arrayContaining(['width', 'train_size', 'label_noise', 'seed', 'epochs', 'resume_from', 'reason', 'why', 'sharpens']));
      expect(lines.length - 1).toBe(7);
      planned.push(lines.slice(1));
      cli(['simulate', '--plan', `round${round}.csv`, '--shape', 'jsonl', '--out', `round${round}`, '--quiet']);
      expect(runFiles(`round${round}`)).toHaveLength(7);
      cli(['ingest', `round${round}`, '--store', 'store', '--quiet']);
    }
    const runs = runFiles('coarse').length + runFiles('round1').length + runFiles('round2').length;
    expect(runs).toBe(34);
    expect(runFiles('dense')).toHaveLength(102);

    for (const n of SIZES) {
      const dense = ridgeAt('dense-store', n);
      const ours = ridgeAt('store', n);
      expect(dense, `dense grid, n ${n}`).not.toBeNull();
      expect(ours, `planned design, n ${n}`).not.toBeNull();
      // Peak near width = n (Belkin, Hsu, Ma & Mandal 2019): a sanity check on the reference itself.
      expect(Math.abs(Math.log2(dense!.x / n))).toBeLessThan(0.5);
      expect(Math.abs(Math.log2(ours!.x / dense!.x)), `n ${n}: planned ${ours!.x}, dense ${dense!.x}`).toBeLessThanOrEqual(0.25);
    }
  }, 600_000);
});
