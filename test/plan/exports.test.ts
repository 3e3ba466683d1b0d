import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, existsSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { csvCell, uninertCell } from '../../src/plan/csvCell.js';
import { parseTemplate } from '../../src/plan/commandTemplate.js';
import { fitCostModel } from '../../src/plan/costModel.js';
import type { PlannedRun, PlanResult } from '../../src/plan/Plan.js';
import { PLAN_CSV_COLUMNS, planCsv } from '../../src/plan/planCsv.js';
import { planJson } from '../../src/plan/planJson.js';
import { planShell } from '../../src/plan/planShell.js';
import { planSlurm } from '../../src/plan/planSlurm.js';
import { shellQuote } from '../../src/plan/shellQuote.js';
import { exportRuns, templateGap } from '../../src/plan/exportRuns.js';
import { UserError } from '../../src/UserError.js';

const dir = mkdtempSync(join(tmpdir(), 'datlas-plan-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const HOSTILE = [
  "'; rm -rf / #",
  '$(touch PWNED1)',
  '`touch PWNED2`',
  '"; touch PWNED3; "',
  'a b  c\ttab',
  '=HYPERLINK("http://x","y")',
  "'=already",
  '-lr=0.1',
  '@SUM(A1)',
  '+1',
  'comma, and "quotes"',
  '',
  'ünïcødé ✓',
  '\\back\\slash',
  '*',
  '~',
];

const model = fitCostModel({ runs: [], reference: { width: 8, train_size: 1000, epochs: 100 } });
const runs: PlannedRun[] = HOSTILE.map((condition, i) => ({
  condition,
  label_noise: 0.2,
  width: 8 * (i + 1),
  train_size: 1000,
  seed: i,
  epochs: 100,
  reason: i % 2 ? 'missing' : 'resume',
  cost: i + 1,
  resume_from: i % 2 ? null : 10,
  run: `r${i}`,
  status: i % 2 ? 'missing' : 'partial',
  score: 1,
  why: `because ${condition}`,
}));
const plan: PlanResult = { budget: null, cost: runs.reduce((s, r) => s + r.cost, 0), model, runs, dropped: { runs: 0, cost: 0 }, notes: [] };

/** bash with an empty PATH: only builtins run, so a quoting bug cannot reach rm or touch. */
function bashSafe(script: string, env: Record<string, string> = {}) {
  return spawnSync('/bin/bash', [script], { cwd: dir, encoding: 'utf8', env: { PATH: '/nonexistent', ...env } });
}

describe('CSV cells', () => {
  it('makes formula-like text inert and quotes per RFC 4180', () => {
    // OWASP CSV injection: = + - @ (and tab, CR) start a formula in spreadsheets.
    expect(csvCell('=1+2')).toBe("'=1+2");
    expect(csvCell('+1')).toBe("'+1");
    expect(csvCell('-x')).toBe("'-x");
    expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvCell('\tx')).toBe("'\tx");
    expect(csvCell("'=x")).toBe("''=x");
    expect(csvCell('plain')).toBe('plain');
    // RFC 4180 §2.6–2.7: fields with commas, quotes or line breaks are quoted, quotes doubled.
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell('two\nlines')).toBe('"two\nlines"');
    expect(csvCell('=a,b')).toBe(`"'=a,b"`);
    expect(csvCell(-0.5)).toBe('-0.5');
    expect(csvCell(NaN)).toBe('');
    expect(csvCell(null)).toBe('');
  });

  it('round-trips every value through a reference RFC 4180 parser (csv-parse)', () => {
    const text = planCsv(plan);
    expect(text.endsWith('\r\n')).toBe(true);
    const records = parse(text, { columns: true }) as Record<string, string>[];
    expect(Object.keys(records[0])).toEqual([...PLAN_CSV_COLUMNS]);
    expect(records.map((r) => uninertCell(r.condition))).toEqual(HOSTILE);
    for (const r of records) expect(r.condition).not.toMatch(/^[=+\-@\t\r]/);
    expect(records[0]).toMatchObject({ index: '0', width: '8', seed: '0', resume_from: '10', reason: 'resume' });
    expect(records[1].resume_from).toBe('');
  });
});

describe('shell script', () => {
  it('quotes each value as one shell word', () => {
    expect(shellQuote('64')).toBe('64');
    expect(shellQuote('')).toBe("''");
    expect(shellQuote("it's")).toBe("'it'\\''s'");
  });

  it('runs hostile values as data, never as code', () => {
    const t = parseTemplate('printf "<%s>\\n" {condition} {run} {width} {label_noise} {seed} {epochs} {resume_from}');
    const script = join(dir, 'plan.sh');
    writeFileSync(script, planShell({ plan, template: t }));
    expect(execFileSync('/bin/bash', ['-n', script]).toString()).toBe('');
    const r = bashSafe(script);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const expected = runs.flatMap((x) => [x.condition, x.run, x.width, x.label_noise, x.seed, x.epochs, x.resume_from ?? 0].map((v) => `<${v}>`));
    expect(r.stdout.trimEnd().split('\n')).toEqual(expected);
    for (const f of ['PWNED1', 'PWNED2', 'PWNED3']) expect(existsSync(join(dir, f))).toBe(false);
  });

  it('rejects unknown placeholders and leaves ${VAR} alone', () => {
    expect(() => parseTemplate('train --depth {depth}')).toThrow(UserError);
    expect(parseTemplate('train --out ${HOME}/w{width}').parts).toEqual([{ text: 'train --out ${HOME}/w' }, { name: 'width' }]);
    expect(parseTemplate('train --from {resume_from}').resumes).toBe(true);
  });
});

describe('Slurm array script', () => {
  const csv = join(dir, 'plan.csv');
  writeFileSync(csv, planCsv(plan));
  const script = join(dir, 'plan.sbatch');
  const t = parseTemplate('printf "<%s>\\n" {index} {run} {condition} {width} {train_size} {label_noise} {seed} {epochs} {resume_from}');
  writeFileSync(script, planSlurm({ plan, template: t, csvPath: csv, maxParallel: 4 }));

  it('passes bash -n and declares the array with its concurrency cap', () => {
    expect(spawnSync('/bin/bash', ['-n', script]).status).toBe(0);
    const text = planSlurm({ plan, template: t, csvPath: csv, maxParallel: 4 });
    expect(text).toContain(`#SBATCH --array=0-${runs.length - 1}%4`);
  });

  it('task k prints the k-th run, hostile values intact', () => {
    for (const k of [0, 1, 5, 6, 7, runs.length - 1]) {
      const r = bashSafe(script, { SLURM_ARRAY_TASK_ID: String(k) });
      expect(r.status, r.stderr).toBe(0);
      const x = runs[k];
      const expected = [k, x.run, x.condition, x.width, x.train_size, x.label_noise, x.seed, x.epochs, x.resume_from ?? 0].map((v) => `<${v}>`);
      expect(r.stdout.trimEnd().split('\n')).toEqual(expected);
    }
    for (const f of ['PWNED1', 'PWNED2', 'PWNED3']) expect(existsSync(join(dir, f))).toBe(false);
  });

  it('the same task prints what the shell export runs for that run', () => {
    const tEcho = parseTemplate('echo {run} {condition} {width} {seed}');
    const sh = join(dir, 'echo.sh');
    writeFileSync(sh, planShell({ plan, template: tEcho }));
    const sb = join(dir, 'echo.sbatch');
    writeFileSync(sb, planSlurm({ plan, template: tEcho, csvPath: csv, maxParallel: 2 }));
    const all = bashSafe(sh).stdout.split('\n');
    for (const k of [0, 3, 10]) expect(bashSafe(sb, { SLURM_ARRAY_TASK_ID: String(k) }).stdout.trimEnd()).toBe(all[k]);
  });

  it('fails cleanly for a task past the end', () => {
    const r = bashSafe(script, { SLURM_ARRAY_TASK_ID: String(runs.length) });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`no run ${runs.length}`);
  });

  it('refuses values with line breaks and empty plans', () => {
    const bad = { ...plan, runs: [{ ...runs[0], condition: 'two\nlines' }] };
    expect(() => planSlurm({ plan: bad, template: t, csvPath: csv, maxParallel: 1 })).toThrow(UserError);
    expect(() => planSlurm({ plan: { ...plan, runs: [] }, template: t, csvPath: csv, maxParallel: 1 })).toThrow(UserError);
  });
});

describe('a template that leaves out a varying setting', () => {
  // The demo's case: runs at noise 0.1 and 0.2 that differ in nothing else.
  const twins: PlannedRun[] = [0.1, 0.2].flatMap((label_noise) =>
    [0, 1].map((seed) => ({ ...runs[1], condition: '', label_noise, seed, width: 8, train_size: 1024, run: `w8-n1024-ln${label_noise}-s${seed}`, resume_from: null })),
  );
  const twinPlan: PlanResult = { ...plan, runs: twins, cost: twins.reduce((s, r) => s + r.cost, 0) };
  const dropsNoise = parseTemplate('echo --width {width} --n {train_size} --seed {seed}');
  const full = parseTemplate('echo --width {width} --n {train_size} --noise {label_noise} --seed {seed}');

  /** Every command line a shell export runs, and every line the Slurm tasks run. */
  const shellLines = (text: string) => text.split('\n').filter((l) => l.startsWith('echo '));
  const slurmLines = (p: PlanResult, t: ReturnType<typeof parseTemplate>, allowCollapse = false) => {
    const csv = join(dir, 'twins.csv');
    writeFileSync(csv, planCsv(exportRuns({ plan: p, template: t, allowCollapse }).plan));
    const sb = join(dir, 'twins.sbatch');
    const text = planSlurm({ plan: p, template: t, csvPath: csv, maxParallel: 2, allowCollapse });
    writeFileSync(sb, text);
    const n = Number(/--array=0-(\d+)/.exec(text)![1]) + 1;
    return Array.from({ length: n }, (_, k) => bashSafe(sb, { SLURM_ARRAY_TASK_ID: String(k) }).stdout.trimEnd());
  };

  it('is refused as a usage error naming the setting and its values', () => {
    expect(templateGap(twinPlan, dropsNoise)).toEqual({ missing: [{ name: 'label_noise', values: ['0.1', '0.2'] }], duplicates: 2 });
    for (const make of [() => planShell({ plan: twinPlan, template: dropsNoise }), () => slurmLines(twinPlan, dropsNoise)]) {
      let err: unknown;
      try {
        make();
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(UserError);
      expect((err as UserError).exitCode).toBe(2);
      expect((err as UserError).message).toContain('{label_noise} (0.1, 0.2)');
      expect((err as UserError).message).toContain('--allow-collapse');
    }
  });

  it('a complete template exports every run, no two commands equal (shell and Slurm)', () => {
    const sh = shellLines(planShell({ plan: twinPlan, template: full }));
    expect(sh).toHaveLength(4);
    expect(new Set(sh).size).toBe(4);
    const sl = slurmLines(twinPlan, full);
    expect(sl).toEqual(sh.map((l) => l.slice(5)));
    expect(new Set(sl).size).toBe(4);
  });

  it('--allow-collapse launches each distinct command once (shell and Slurm)', () => {
    const sh = shellLines(planShell({ plan: twinPlan, template: dropsNoise, allowCollapse: true }));
    expect(sh).toEqual(['echo --width 8 --n 1024 --seed 0', 'echo --width 8 --n 1024 --seed 1']);
    expect(slurmLines(twinPlan, dropsNoise, true)).toEqual(sh.map((l) => l.slice(5)));
    expect(exportRuns({ plan: twinPlan, template: dropsNoise, allowCollapse: true }).collapsed).toBe(2);
  });

  it('ids ({run}, {index}) and {resume_from} are not settings: leaving them out is fine', () => {
    expect(templateGap(plan, parseTemplate('echo {condition} {width} {seed}')).missing).toEqual([]);
  });
});

describe('plan JSON', () => {
  it('has the DESIGN.md §6 shape', () => {
    const j = planJson(plan) as { budget: unknown; cost: number; runs: Record<string, unknown>[] };
    expect(j.budget).toBeNull();
    expect(j.cost).toBe(plan.cost);
    expect(Object.keys(j.runs[0])).toEqual(expect.arrayContaining(['width', 'train_size', 'label_noise', 'seed', 'epochs', 'reason', 'cost']));
  });
});
