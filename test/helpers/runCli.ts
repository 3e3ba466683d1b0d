import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const BIN = fileURLToPath(new URL('../../bin/datlas', import.meta.url));

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs `datlas ARGS` as a user would (a child process), with optional stdin. */
export function runCli(args: string[], opts: { cwd?: string; input?: string; env?: Record<string, string> } = {}): CliResult {
  const r = spawnSync(process.execPath, [BIN, ...args], {
    cwd: opts.cwd,
    input: opts.input,
    encoding: 'utf8',
    env: { ...process.env, NO_COLOR: '1', ...opts.env },
    maxBuffer: 256 * 1024 * 1024,
  });
  return { code: r.status ?? -1, stdout: r.stdout, stderr: r.stderr };
}
