import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { ROOT } from './demoStore.js';
import { typeCheck } from './typeCheck.js';
import { readmeBlock } from './readmeBlocks.js';

// README "Use from TypeScript": the script is taken from README.md as it stands, so it cannot go
// stale. It runs in a folder inside the project (the package imports itself by name through
// package.json "exports"), with sample-sweeps/ linked in so its relative paths hold.
let work = '';
let stdout = '';
beforeAll(() => {
  work = mkdtempSync(join(ROOT, '.api-work-'));
  symlinkSync(join(ROOT, 'sample-sweeps'), join(work, 'sample-sweeps'));
  const { lang, code } = readmeBlock('library-example');
  expect(lang).toBe('ts');
  writeFileSync(join(work, 'example.ts'), code);
  stdout = execFileSync(process.execPath, ['--import', 'tsx', 'example.ts'], { cwd: work, encoding: 'utf8' });
}, 180_000);
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('README: Use from TypeScript', () => {
  it('is about fifteen lines', () => {
    expect(readmeBlock('library-example').code.trimEnd().split('\n').length).toBeLessThanOrEqual(15);
  });

  it('type-checks against the package declarations', () => {
    writeFileSync(join(work, 'tsconfig.json'), JSON.stringify({ extends: '../tsconfig.json', compilerOptions: { noEmit: true, rootDir: '.' }, include: ['example.ts'], exclude: [] }));
    const r = typeCheck(join(work, 'tsconfig.json'));
    expect(r.output).toBe('');
    expect(r.code).toBe(0);
  });

  it('ingests the demo sweep, filters with arquero, and prints the ridge that datlas ridge finds', () => {
    // sample-sweeps/README.md: 600 runs × 25 logged epochs.
    expect(stdout).toContain('15000 of 15000 rows accepted');
    // 25 widths survive the filter (every width was run at every noise level).
    expect(stdout).toMatch(/^25 widths$/m);
    const printed = [...stdout.matchAll(/^epochs (\d+): peak at width (\d+) \[(\d+), (\d+)\]$/gm)].map((m) => m.slice(1).map(Number));
    expect(printed.length).toBeGreaterThan(0);
    // The same rows from the CLI on the same store and slice (noise 0.2, n = 512).
    const r = runCli(['ridge', '--kind', 'model', '--store', join(work, 'example-store'), '--at', 'label_noise=0.2,train_size=512', '--json', '--quiet']);
    expect(r.code, r.stderr).toBe(0);
    const cli = (JSON.parse(r.stdout) as { rows: { y: number; peak: { x: number; low: number; high: number } | null }[] }).rows
      .filter((row) => row.peak)
      .map((row) => [row.y, Math.round(row.peak!.x), Math.round(row.peak!.low), Math.round(row.peak!.high)]);
    // toFixed(0) and Math.round agree away from .5 ties (none here).
    expect(printed).toEqual(cli);
  });

  it('writes the map images it names', () => {
    const files = /^wrote (.+)$/m.exec(stdout)![1].split(', ');
    const png = files.find((f) => f.endsWith('.png'))!;
    expect(png).toBeDefined();
    const bytes = readFileSync(join(work, png));
    // PNG signature (ISO/IEC 15948, 5.2).
    expect([...bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    for (const f of files) expect(existsSync(join(work, f)), f).toBe(true);
  });
});
