import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';

// A hand-made sample-wise sweep (our own numbers): at width 64 error falls to n = 1,000, rises to
// n = 4,000, falls back below the n = 1,000 level halfway (in log n) between 8,000 and 16,000.
// Width 32 only falls. Three seeds at ±0.01 around each mean.
const means64 = [0.5, 0.4, 0.3, 0.34, 0.37, 0.32, 0.28];
const means32 = [0.5, 0.45, 0.4, 0.35, 0.3, 0.25, 0.2];
const sizes = [250, 500, 1000, 2000, 4000, 8000, 16000];
let dir = '';
let store = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-hurts-'));
  const lines = ['run,seed,width,epochs,train_size,test_error'];
  for (const [w, means] of [[64, means64], [32, means32]] as const) {
    sizes.forEach((n, i) => [-0.01, 0, 0.01].forEach((d, s) => lines.push(`w${w}n${n}s${s},${s},${w},4000,${n},${(means[i] + d).toFixed(4)}`)));
  }
  writeFileSync(join(dir, 'runs.csv'), `${lines.join('\n')}\n`);
  store = join(dir, 'store');
  expect(runCli(['ingest', join(dir, 'runs.csv'), '--store', store, '--quiet']).code).toBe(0);
}, 60_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('datlas hurts', () => {
  it('prints the DESIGN.md §6 JSON: one segment, onset 1,000, peak 4,000, recovery interpolated', () => {
    const res = runCli(['hurts', '--store', store, '--json']);
    expect(res.code).toBe(0);
    const j = JSON.parse(res.stdout);
    expect(j.fixed).toEqual({});
    expect(j.segments).toHaveLength(1);
    const s = j.segments[0];
    expect(s).toMatchObject({ onset: 1000, peak: 4000, fixed: { width: 64, epochs: 4000 } });
    expect(s.rise).toBeCloseTo(0.07, 10);
    // 0.32 at 8,000 and 0.28 at 16,000 cross 0.30 halfway in log2 n: 8,000·√2
    expect(s.recovery).toBeCloseTo(8000 * Math.SQRT2, 4);
    expect(s.p).toBeGreaterThan(0);
    expect(s.p).toBeLessThan(0.05);
  });

  it('says it in one plain sentence, and honours --at', () => {
    const res = runCli(['hurts', '--store', store, '--at', 'width=64,epochs=4000']);
    expect(res.code).toBe(0);
    expect(res.stdout).toMatch(
      /from n = 1000 to n = 4000 extra data raises test error by 0\.07 \(p [=<] [\d.e-]+, search-wide p [=<] [\d.]+\); it falls back below the n = 1000 level at n ≈ 11k/,
    );
    const other = runCli(['hurts', '--store', store, '--at', 'width=32']);
    expect(other.code).toBe(0);
    expect(other.stdout).toMatch(/no significant rise of test error with more data in 1 slice scanned/);
  });

  it('rejects fixing train_size (exit 2) and a value not in the sweep (exit 1)', () => {
    const bad = runCli(['hurts', '--store', store, '--at', 'train_size=1000']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('train_size');
    const absent = runCli(['hurts', '--store', store, '--at', 'width=7']);
    expect(absent.code).toBe(1);
    expect(absent.stderr.trim().split('\n')).toHaveLength(1);
  });
});
