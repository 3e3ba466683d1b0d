import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { spec, storeFor, tableCsv } from '../plan/fixtures.js';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-options-'));
  writeFileSync(join(dir, 'runs.csv'), tableCsv(storeFor(spec)));
  expect(runCli(['ingest', 'runs.csv', '--quiet'], { cwd: dir }).code).toBe(0);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('one name per option meaning', () => {
  it('pixel ratio is --png-scale (map, report); log/linear is --axis-scale (map); old spellings are hidden', () => {
    const map = runCli(['map', '--help']).stdout;
    expect(map).toContain('--png-scale');
    expect(map).toContain('--axis-scale');
    expect(map).not.toMatch(/--scale\b/);
    const report = runCli(['report', '--help']).stdout;
    expect(report).toContain('--png-scale');
    expect(report).not.toMatch(/--scale\b/);
  });

  it('--axis-scale sets an axis linear; the old --scale still works', () => {
    for (const flag of ['--axis-scale', '--scale']) {
      const r = runCli(['map', '--kind', 'model', '--json', flag, 'width=linear'], { cwd: dir });
      expect(r.code, r.stderr).toBe(0);
      expect(JSON.parse(r.stdout).x.scale).toBe('linear');
    }
    const bad = runCli(['map', '--axis-scale', 'width=cubic'], { cwd: dir });
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('--axis-scale expects axis=log2|linear');
  });

  it('--correction takes benjamini-hochberg or bh (ridge, hurts) and prints the one name', () => {
    for (const cmd of ['ridge', 'hurts']) {
      const help = runCli([cmd, '--help']).stdout.replace(/\s+/g, ' ');
      expect(help).toContain('benjamini-hochberg (bh for short;');
      expect(help).toContain('[default: "benjamini-hochberg"]');
      expect(help).not.toContain('"bh"');
      for (const spelling of ['bh', 'benjamini-hochberg']) {
        const r = runCli([cmd, '--kind', 'sample', '--json', '--boot', '20', '--correction', spelling].filter((a) => cmd === 'ridge' || (a !== '--kind' && a !== 'sample')), { cwd: dir });
        expect(r.code, r.stderr).toBe(0);
        expect(JSON.parse(r.stdout).correction).toBe('benjamini-hochberg');
      }
      const bad = runCli([cmd, '--correction', 'holm'], { cwd: dir });
      expect(bad.code).toBe(2);
      expect(bad.stderr).toContain("--correction expects benjamini-hochberg (bh for short) or none, got 'holm'");
    }
  });

  it('README and help spell the map axes the same way (-x/-y)', () => {
    const help = runCli(['map', '--help']).stdout;
    expect(help).toMatch(/^\s+-x\s/m);
    const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
    expect(readme).toContain('`-x/-y`');
    expect(readme).not.toContain('--x/--y');
  });
});
