import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { SYN, syntheticCsv, syntheticRows } from '../report/syntheticSweep.js';

const EVIL = '<img src=x onerror=alert(1)>';
const { widths: WIDTHS, sizes: SIZES, noise: NOISE } = SYN;

let dir: string;
let store: string;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-report-cli-'));
  store = join(dir, 'store');
  // Two planned runs never ran: width 512, n 128, noise 0.1, seeds 1 and 2.
  writeFileSync(join(dir, 'sweep.csv'), syntheticCsv(syntheticRows({ runName: EVIL, skip: (w, n, q, s) => w === 512 && n === 128 && q === 0.1 && s > 0 })));
  writeFileSync(
    join(dir, 'spec.yaml'),
    `name: synthetic\naxes:\n  width: [${WIDTHS.join(', ')}]\n  train_size: [${SIZES.join(', ')}]\n  label_noise: [${NOISE.join(', ')}]\nseeds: 3\nepochs: 1000\n`,
  );
  const ingest = runCli(['ingest', join(dir, 'sweep.csv'), '--store', store, '--quiet']);
  expect(ingest.code, ingest.stderr).toBe(0);
}, 60_000);

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('datlas report', () => {
  let json: {
    files: { pdf: string; html: string; json: string; png: string[] };
    findings: string[];
    cautions: string[];
    maps: { map: string; fixed: Record<string, number>; rows: { y: number; peak: { x: number; low: number; high: number } | null }[] }[];
    hurts: { segments: { fixed: Record<string, number>; onset: number; peak: number }[] }[];
    coverage: { counts: { complete: number; missing: number } };
    plan: { runs: { config: Record<string, number | string>; seed: number; epochs: number; reason: string; cost: number; why: string }[] };
  };
  let out: string;

  beforeAll(() => {
    out = join(dir, 'report');
    const r = runCli(['report', '--store', store, '--spec', join(dir, 'spec.yaml'), '--out', out, '--title', `Synthetic ${EVIL}`, '--json']);
    expect(r.code, r.stderr).toBe(0);
    json = JSON.parse(r.stdout);
  }, 120_000);

  it('finds the model-wise peak at width = train size, only from epoch 100 on', () => {
    const model = json.maps.find((m) => m.map === 'model')!;
    const n = model.fixed.train_size;
    for (const row of model.rows) {
      if (row.y < 100) expect(row.peak).toBeNull();
      else {
        expect(row.peak).not.toBeNull();
        // The synthetic bump is centred at width = n exactly.
        expect(row.peak!.low).toBeLessThanOrEqual(n * 1.25);
        expect(row.peak!.high).toBeGreaterThanOrEqual(n / 1.25);
      }
    }
    const ratio = Number(/, ([\d.]+) × the train size/.exec(json.findings[0])?.[1]);
    expect(ratio).toBeGreaterThan(0.8);
    expect(ratio).toBeLessThan(1.25);
    expect(json.findings[1]).toMatch(/appears at epochs 100 \(no significant peak earlier\)/);
  });

  it('finds more data hurting up to n = width', () => {
    const segs = json.hurts[0].segments;
    expect(segs.length).toBeGreaterThan(0);
    const at64 = segs.find((s) => s.fixed.width === 64);
    expect(at64).toBeDefined();
    expect(at64!.peak).toBe(64);
    expect(at64!.onset).toBe(32);
    expect(json.findings.some((f) => /^More data hurts in \d+ of \d+ train-size slices, after Benjamini–Hochberg correction\. Worst at width/.test(f))).toBe(true);
  });

  it('counts the two runs the spec planned but the store lacks, and plans them first', () => {
    // 7 widths × 3 sizes × 2 noise levels × 3 seeds = 126 planned runs.
    expect(json.coverage.counts.missing).toBe(2);
    expect(json.coverage.counts.complete).toBe(124);
    expect(json.plan.runs.slice(0, 2).map((r) => r.reason)).toEqual(['missing', 'missing']);
    expect(json.findings.some((f) => f.includes('2 of 126 planned runs have no data'))).toBe(true);
  });

  it('proposes exactly the runs `datlas plan --json` proposes for the same store and spec', () => {
    const r = runCli(['plan', '--store', store, '--spec', join(dir, 'spec.yaml'), '--json', '--quiet']);
    expect(r.code, r.stderr).toBe(0);
    const plan = JSON.parse(r.stdout) as { runs: { condition: string; width: number; train_size: number; label_noise: number; seed: number; epochs: number; reason: string; cost: number; why: string }[] };
    expect(plan.runs.length).toBeGreaterThan(2);
    // The report keeps the plan's order and rows; only the JSON cost is rounded for printing.
    expect(json.plan.runs.map(({ cost: _, ...r }) => r)).toEqual(
      plan.runs.map((p) => ({ config: { ...(p.condition ? { condition: p.condition } : {}), label_noise: p.label_noise, width: p.width, train_size: p.train_size }, seed: p.seed, epochs: p.epochs, reason: p.reason, why: p.why })),
    );
    // plan --json prints costs to 4 significant digits (roundCost).
    json.plan.runs.forEach((run, i) => expect(Number(run.cost.toPrecision(4))).toBe(plan.runs[i].cost));
  });

  it('writes the PDF deck, the HTML page, PNGs and JSON', () => {
    expect(existsSync(json.files.pdf)).toBe(true);
    expect(readFileSync(json.files.pdf).subarray(0, 5).toString()).toBe('%PDF-');
    expect(json.files.png.length).toBeGreaterThanOrEqual(6);
    for (const p of json.files.png) expect(readFileSync(p).subarray(1, 4).toString()).toBe('PNG');
    expect(readdirSync(join(out, 'png')).some((f) => f.endsWith('.vl.json'))).toBe(true);
    expect(JSON.parse(readFileSync(json.files.json, 'utf8')).findings).toEqual(json.findings);
  });

  it('the HTML page loads nothing from the network and shows user labels as text', () => {
    const html = readFileSync(json.files.html, 'utf8');
    expect(html).not.toMatch(/<(script|img|link)[^>]+(src|href)="?(https?:)?\/\//i);
    // The run name and the title never appear as markup anywhere in the file.
    expect(html).not.toContain(EVIL);
    expect(html).toContain('<h1>Synthetic &lt;img src=x onerror=alert(1)&gt;</h1>');
    expect(html).toContain('\\u003cimg src=x onerror=alert(1)\\u003e');
  });

  it.skipIf(!existsSync('/usr/bin/pdftotext') && !process.env.CI)('the PDF text can be selected and carries the findings', () => {
    const text = spawnSync('pdftotext', [json.files.pdf, '-'], { encoding: 'utf8' }).stdout.replace(/\s+/g, ' ');
    expect(text).toContain(`Synthetic ${EVIL}`);
    expect(text).toContain('Headline findings');
    expect(text).toContain('Coverage against the spec');
    expect(text).toContain('Proposed next runs');
    // The hurts page says its rises survived the correction across the slices scanned, uncut.
    expect(text).toMatch(/\d+ of \d+ train-size slices show a rise, after correction \(Benjamini–Hochberg across the \d+ slices scanned, FDR 0\.05\) at epochs 1000; worst rise first/);
  });

  it('the HTML hurts section names the correction across slices', () => {
    const html = readFileSync(json.files.html, 'utf8');
    const section = html.slice(html.indexOf('<h2>Where more data hurts</h2>'));
    expect(section).toMatch(/^<h2>Where more data hurts<\/h2><p class="meta">\d+ of \d+ train-size slices show a rise, after correction \(Benjamini–Hochberg across the \d+ slices scanned/);
    expect(section).toContain('<th>adjusted p</th>');
  });
});

describe('datlas report errors and help', () => {
  it('fails with one line when there is no store', () => {
    const r = runCli(['report', '--store', join(dir, 'nowhere'), '--out', join(dir, 'x')]);
    expect(r.code).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/no store at/);
  });
  it('has help with an example', () => {
    const r = runCli(['report', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/--spec/);
    expect(r.stdout).toMatch(/Examples:/);
  });
});
