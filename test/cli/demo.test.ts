import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';

interface DemoJson {
  store: string;
  spec: string;
  planCsv: string;
  files: { pdf: string; html: string; json: string; png: string[] };
  findings: string[];
  maps: { map: string; fixed: Record<string, number>; rows: { y: number; peak: { x: number; low: number; high: number } | null }[] }[];
  hurts: { segments: { fixed: Record<string, number>; onset: number; peak: number; recovery: number | null }[]; slices?: number; correction?: string; slicesWithRise?: number }[];
  coverage: { counts: { complete: number; partial: number; missing: number; diverged: number } };
  plan: { runs: { reason: string; config: Record<string, number> }[] };
}

let dir: string;
let demo: DemoJson;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-demo-'));
  const r = runCli(['demo', '--out', join(dir, 'out'), '--json']);
  expect(r.code, r.stderr).toBe(0);
  demo = JSON.parse(r.stdout);
}, 180_000);

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('datlas demo on the committed sample sweep', () => {
  it('writes the store, the spec, the plan and the report', () => {
    for (const p of [demo.store, demo.spec, demo.planCsv, demo.files.pdf, demo.files.html, demo.files.json]) expect(existsSync(p), p).toBe(true);
    expect(demo.files.png.length).toBeGreaterThanOrEqual(12);
    expect(readFileSync(demo.planCsv, 'utf8').split('\n')[0]).toMatch(/^index,run,/);
  });

  it('writes its spec as grid.yaml ("grid spec"), never sweep.yaml', () => {
    expect(demo.spec).toBe(join(dir, 'out', 'grid.yaml'));
    expect(readFileSync(demo.spec, 'utf8')).toMatch(/^# Demo grid spec/);
    expect(existsSync(join(dir, 'out', 'sweep.yaml'))).toBe(false);
  });

  it('finds the model-wise peak at width ≈ train size late in training and none early', () => {
    // Random features: the ridgeless peak sits at N ≈ n (Belkin, Hsu, Ma & Mandal 2019, P; REFERENCES.md §4),
    // and in this simulator it emerges with training time, absent up to epoch 1e3 (REFERENCES.md §7, D).
    const model = demo.maps.find((m) => m.map === 'model')!;
    const n = model.fixed.train_size;
    const late = model.rows.filter((r) => r.peak !== null).sort((a, b) => b.y - a.y)[0];
    expect(late).toBeDefined();
    expect(late.y).toBeGreaterThanOrEqual(1e5);
    expect(late.peak!.x / n).toBeGreaterThan(0.8);
    expect(late.peak!.x / n).toBeLessThan(1.25);
    for (const r of model.rows) if (r.y <= 1e3) expect(r.peak).toBeNull();
    expect(demo.findings.some((f) => /model-wise peak sits at width ≈ n/.test(f))).toBe(true);
  });

  it('judges more data hurting after Benjamini–Hochberg correction across the slices scanned', () => {
    // The demo's rises (width 128 from n = 64 to 128: Welch p 0.011, search-wide 0.03, three
    // seeds) do not survive the correction over its 50 slices; the findings say so plainly.
    // Where a rise does survive, its peak sits near n = N (REFERENCES.md §7, D).
    const h = demo.hurts[0];
    expect(h.correction).toBe('benjamini-hochberg');
    expect(h.slices).toBe(50);
    expect(h.slicesWithRise).toBe(new Set(h.segments.map((s) => JSON.stringify(s.fixed))).size);
    for (const worst of h.segments.slice(0, 1)) {
      expect(worst.peak / worst.fixed.width).toBeGreaterThan(0.5);
      expect(worst.peak / worst.fixed.width).toBeLessThan(2);
      expect(worst.onset).toBeLessThan(worst.peak);
    }
    expect(demo.findings.some((f) => (h.segments.length ? /^More data hurts in \d+ of 50 train-size slices, after Benjamini–Hochberg correction/ : /^More data never significantly hurts/).test(f))).toBe(true);
  });

  it('has a spec with the planned train size 1024 not run yet, and plans those runs first', () => {
    // 25 widths × 2 noise levels × 3 seeds at n = 1024 (sample-sweeps/README.md).
    expect(demo.coverage.counts).toEqual({ complete: 600, partial: 0, missing: 150, diverged: 0 });
    expect(demo.plan.runs.slice(0, 150).every((r) => r.reason === 'missing' && r.config.train_size === 1024)).toBe(true);
  });
});
