import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { fsErrorText } from '../../src/cli/fsErrorText.js';
import { SPEC_TEXT, spec, storeFor, tableCsv } from '../plan/fixtures.js';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-paths-'));
  writeFileSync(join(dir, 'runs.csv'), tableCsv(storeFor(spec, { removed: [{ condition: 'adam', width: 8, train_size: 1000, label_noise: 0, seed: 0 }] })));
  writeFileSync(join(dir, 'grid.yaml'), SPEC_TEXT);
  writeFileSync(join(dir, 'a-file'), 'not a folder\n');
  expect(runCli(['ingest', 'runs.csv', '--quiet'], { cwd: dir }).code).toBe(0);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const oneLine = (s: string) => {
  expect(s.trim().split('\n')).toHaveLength(1);
  expect(s).not.toContain('internal error');
};

describe('a path of the wrong kind gets a clear message, never an internal error', () => {
  it('--store FILE (ENOTDIR)', () => {
    const r = runCli(['map', '--kind', 'model', '--store', 'a-file'], { cwd: dir });
    expect(r.code).toBe(1);
    oneLine(r.stderr);
    expect(r.stderr).toContain('a-file is a file, not a folder');
  });

  it('--out FILE where a folder is written (EEXIST), and a file below a file (ENOTDIR)', () => {
    const r = runCli(['map', '--kind', 'model', '--out', 'a-file'], { cwd: dir });
    expect(r.code).toBe(1);
    oneLine(r.stderr);
    expect(r.stderr).toContain('a-file exists and is a file, not a folder');
    const c = runCli(['coverage', '--spec', 'grid.yaml', '--out', 'a-file/cov.png'], { cwd: dir });
    expect(c.code).toBe(1);
    oneLine(c.stderr);
    expect(c.stderr).toContain('a-file is a file, not a folder');
  });
});

describe('a folder where a file goes', () => {
  it('--spec DIR is a usage error naming it; a read of a folder without a path still reads clearly', () => {
    const r = runCli(['plan', '--spec', '.'], { cwd: dir });
    expect(r.code).toBe(2);
    expect(r.stderr.trim()).toBe('datlas: . is a folder, not a file; give a file path');
    const e = Object.assign(new Error('EISDIR: illegal operation on a directory, read'), { code: 'EISDIR' });
    expect(fsErrorText(e)).toBe('a folder was given where a file is needed; give a file path');
    expect(fsErrorText(new Error('plain'))).toBeNull();
  });
});

describe('plan --budget 0', () => {
  it('does not claim every planned run is complete when runs are missing', () => {
    const r = runCli(['plan', '--spec', 'grid.yaml', '--budget', '0', '--no-refine'], { cwd: dir });
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).not.toContain('every planned run is complete');
    expect(r.stdout).toContain('no run fits --budget 0');
    expect(r.stdout).toMatch(/1 more run \(cost [^)]+\) left out by --budget 0/);
  });
});
