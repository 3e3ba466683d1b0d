import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { ROOT } from './demoStore.js';

// Done-when of the library: a script in the project root imports the package by its name,
// ingests sample-sweeps/demo, gets its 15,000 rows as an arquero table, and finds the same
// model-wise ridge as `datlas ridge`.
let dir = '';
let out: {
  store: string; ingested: number; arqueroRows: number; columns: string[]; fixed: Record<string, number | string>;
  peaks: { y: number; x: number; low: number; high: number }[]; sameAsCli: boolean;
};
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-accept-'));
  out = JSON.parse(execFileSync(process.execPath, [join(ROOT, 'library-check.mjs'), join(dir, 'store')], { cwd: ROOT, encoding: 'utf8' }));
}, 180_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('library-check.mjs (the package imported by its own name)', () => {
  it('ingests the demo sweep and hands its 15,000 rows over as an arquero table with the canonical columns', () => {
    // sample-sweeps/README.md: 600 runs × 25 logged epochs.
    expect(out.ingested).toBe(15_000);
    expect(out.arqueroRows).toBe(15_000);
    // DESIGN.md §4, canonical columns in store order.
    expect(out.columns).toEqual(['run', 'seed', 'width', 'epochs', 'train_size', 'label_noise', 'condition', 'test_error', 'train_error',
      'test_loss', 'train_loss', 'wall_seconds', 'status', 'source', 'source_line']);
  });

  it('finds the same model-wise ridge as datlas ridge, with peaks where the demo has them', () => {
    expect(out.sameAsCli).toBe(true);
    // Compared here too, not only by the script: the CLI's rows with a peak, location and interval.
    const r = runCli(['ridge', '--kind', 'model', '--store', out.store, '--json', '--quiet']);
    const cli = (JSON.parse(r.stdout) as { rows: { y: number; peak: { x: number; low: number; high: number } | null }[] }).rows
      .filter((row) => row.peak)
      .map((row) => ({ y: row.y, x: row.peak!.x, low: row.peak!.low, high: row.peak!.high }));
    expect(out.peaks).toEqual(cli);
    // The demo's model-wise peak at n = 512 sits inside its width range (8..4096), at late epochs.
    expect(out.peaks.length).toBeGreaterThan(0);
    for (const p of out.peaks) {
      expect(p.low).toBeLessThanOrEqual(p.x);
      expect(p.x).toBeLessThanOrEqual(p.high);
      expect(p.x).toBeGreaterThan(8);
      expect(p.x).toBeLessThan(4096);
    }
  });
});
