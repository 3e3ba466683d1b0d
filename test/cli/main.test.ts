import { describe, expect, it } from 'vitest';
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
});
