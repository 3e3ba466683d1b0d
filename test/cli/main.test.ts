import { describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers/runCli.js';

// Exit codes: DESIGN.md §6 (0 success, 1 failure of the work, 2 usage error).
describe('datlas entry point', () => {
  it('prints help and exits 0', () => {
    const r = runCli(['--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('datlas <command>');
  });

  it('rejects an unknown command with exit 2 and one line, no stack trace', () => {
    const r = runCli(['no-such-command']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).not.toMatch(/\bat .*\.ts:\d+/);
  });

  // yargs calls its fail handler and, when that returns, runs the command anyway: a usage error
  // must exit 2 before any work (here: no store is looked for, no sweep is written).
  it('an unknown option or bad choice exits 2 before the command does any work', () => {
    const dir = mkdtempSync(join(tmpdir(), 'datlas-usage-'));
    try {
      const map = runCli(['map', '--name', 'x', '--store', join(dir, 'none')]);
      expect(map.code).toBe(2);
      expect(map.stderr).toContain('unknown option: --name');
      expect(map.stderr).not.toContain('no store at');
      const kind = runCli(['ridge', '--kind', 'bogus', '--store', join(dir, 'none')]);
      expect(kind.code).toBe(2);
      expect(kind.stderr.trim().split('\n')).toHaveLength(1);
      expect(kind.stderr).toContain('Invalid values');
      const sim = runCli(['simulate', '--out', join(dir, 'sweep'), '--no-such-flag']);
      expect(sim.code).toBe(2);
      expect(existsSync(join(dir, 'sweep'))).toBe(false);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('datlas for a newcomer', () => {
  it('alone prints the command list (exit 0); --version prints the package version', () => {
    const r = runCli([]);
    expect(r.code).toBe(0);
    for (const c of ['coverage', 'demo', 'hurts', 'ingest', 'map', 'plan', 'report', 'ridge', 'simulate']) expect(r.stdout).toContain(c);
    const v = runCli(['--version']);
    expect(v.code).toBe(0);
    const pkg = JSON.parse(readFileSync(fileURLToPath(new URL('../../package.json', import.meta.url)), 'utf8')) as { version: string };
    expect(v.stdout.trim()).toBe(`datlas ${pkg.version}`);
    // Semantic Versioning 2.0.0, §2 (MAJOR.MINOR.PATCH).
    expect(pkg.version).toMatch(/^\d+\.\d+\.\d+/);
  });

  it('a misspelt option or command gets the nearest known one (exit 2, before any work)', () => {
    const map = runCli(['map', '--kidn', 'model', '--store', '/nonexistent']);
    expect(map.code).toBe(2);
    expect(map.stderr.trim()).toBe('datlas: unknown option: --kidn (did you mean --kind?)');
    const plan = runCli(['plan', '--budgte', '3']);
    expect(plan.code).toBe(2);
    expect(plan.stderr).toContain('--budgte (did you mean --budget?)');
    const far = runCli(['map', '--zzzzzz', '1']);
    expect(far.code).toBe(2);
    expect(far.stderr.trim()).toBe('datlas: unknown option: --zzzzzz');
    expect(runCli(['map', '-q']).stderr.trim()).toBe('datlas: unknown option: -q');
    expect(runCli(['map', 'extra']).stderr.trim()).toBe("datlas: unexpected argument: 'extra' (this command takes options only)");
    const cmd = runCli(['plna']);
    expect(cmd.code).toBe(2);
    expect(cmd.stderr).toContain("unknown command 'plna' (did you mean plan?)");
  });
});
