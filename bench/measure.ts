/**
 * Runs one command as a child process and measures it: wall time (from here), peak resident set
 * size and CPU seconds (from GNU time when installed, else from an in-process wrapper that
 * reports process.resourceUsage() of the CLI at exit).
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface Sample {
  /** Seconds, measured around the child by this process. */
  wall: number;
  /** Peak resident set size of the child, bytes. */
  rss: number;
  /** CPU seconds in user and kernel mode (user + sys > wall means more than one core worked). */
  user: number;
  sys: number;
  code: number;
  stderr: string;
  /** The start of stdout (a step may check what the command printed). */
  stdout: string;
}

const GNU_TIME = '/usr/bin/time';
export const haveGnuTime = existsSync(GNU_TIME);
const WRAPPER = new URL('./rusageWrapper.mjs', import.meta.url).pathname;

const ENTRY = new URL('./datlas-dist.mjs', import.meta.url).pathname;

/**
 * The variables bin/datlas's `#!/usr/bin/env -S NAME=value … node` line sets, so the bench runs
 * the CLI in the environment a user's `datlas` gets (`${NAME}` expanded as env -S does).
 */
export function launcherEnv(launcher: string, base: NodeJS.ProcessEnv): Record<string, string> {
  let first = '';
  try {
    first = readFileSync(launcher, 'utf8').split('\n', 1)[0];
  } catch {
    return {};
  }
  const m = /^#!\S*env\s+-S\s+(.*)$/.exec(first);
  if (!m) return {};
  const out: Record<string, string> = {};
  for (const word of m[1].split(/\s+/)) {
    const eq = /^([A-Za-z_][A-Za-z0-9_]*)=(.*)$/.exec(word);
    if (!eq) break;
    out[eq[1]] = eq[2].replace(/\$\{([A-Za-z_][A-Za-z0-9_]*)\}/g, (_all, name: string) => base[name] ?? '');
  }
  return out;
}

/**
 * Spawns `node [nodeArgs] bench/datlas-dist.mjs args` (the compiled CLI, as bin/datlas runs it
 * when dist/ is fresh; `entry` points at another checkout's copy for A/B runs) in cwd and waits for it. Under GNU time the child's
 * peak RSS covers its worker threads (one process); the wrapper reports the same figure.
 */
export async function measure(opts: { cwd: string; args: string[]; nodeArgs?: string[]; env?: NodeJS.ProcessEnv; entry?: string }): Promise<Sample> {
  const { cwd, args, nodeArgs = [], entry = ENTRY } = opts;
  const env = { ...(opts.env ?? process.env), ...launcherEnv(join(entry, '../../bin/datlas'), opts.env ?? process.env) };
  const tmp = mkdtempSync(join(tmpdir(), 'datlas-bench-'));
  const out = join(tmp, 'usage');
  const cmd = haveGnuTime
    ? [GNU_TIME, '-f', '%e %M %U %S', '-o', out, process.execPath, ...nodeArgs, entry, ...args]
    : [process.execPath, ...nodeArgs, WRAPPER, out, ...args];
  const t0 = performance.now();
  const { code, stderr, stdout } = await new Promise<{ code: number; stderr: string; stdout: string }>((resolve, reject) => {
    const child = spawn(cmd[0], cmd.slice(1), { cwd, env, stdio: ['ignore', 'pipe', 'pipe'] });
    let err = '';
    let got = '';
    child.stderr.on('data', (d: Buffer) => {
      if (err.length < 20000) err += d.toString();
    });
    child.stdout.on('data', (d: Buffer) => {
      if (got.length < 20000) got += d.toString();
    });
    child.on('error', reject);
    child.on('close', (c) => resolve({ code: c ?? 1, stderr: err, stdout: got }));
  });
  const wall = (performance.now() - t0) / 1000;
  let rss = NaN;
  let user = NaN;
  let sys = NaN;
  try {
    const text = readFileSync(out, 'utf8').trim().split('\n').pop() ?? '';
    const f = text.split(/\s+/).map(Number);
    // GNU time: %e %M(KB) %U %S; wrapper: wall rss(bytes) user sys.
    rss = haveGnuTime ? f[1] * 1024 : f[1];
    user = f[2];
    sys = f[3];
  } catch {
    // No usage file: the child died before reporting; the figures stay NaN.
  }
  rmSync(tmp, { recursive: true, force: true });
  return { wall, rss, user, sys, code, stderr, stdout };
}
