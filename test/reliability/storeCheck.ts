import { existsSync, readdirSync, readFileSync, watch, writeFileSync } from 'node:fs';
import type { FSWatcher } from 'node:fs';
import { spawn } from 'node:child_process';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { tableFromIPC } from 'apache-arrow';
import { readStore } from '../../src/store/readStore.js';
import type { RowTable } from '../../src/store/RowTable.js';
import type { Manifest } from '../../src/store/Manifest.js';
import { mulberry32 } from '../../src/random/mulberry32.js';

export const BIN = fileURLToPath(new URL('../../bin/datlas', import.meta.url));

/** Deterministic pseudo-random numbers, so a failing run can be replayed. */
export const prng = mulberry32;

/** A CSV log of `runs` runs × `epochs` epochs whose run ids start with `prefix`. */
export function writeLog(path: string, prefix: string, runs: number, epochs: number): number {
  const lines = ['run,width,epoch,n,seed,label_noise,test_error,train_error'];
  for (let r = 0; r < runs; r++) {
    for (let e = 1; e <= epochs; e++) {
      lines.push(`${prefix}-${r},${8 * ((r % 8) + 1)},${e},4000,${r % 5},0.2,${(0.3 + 0.2 * Math.sin(e / 7 + r)).toFixed(5)},${(0.5 / e).toFixed(6)}`);
    }
  }
  writeFileSync(path, `${lines.join('\n')}\n`);
  return runs * epochs;
}

export interface StoreState {
  rows: number;
  sources: string[];
  /** Accepted rows summed over the manifest's sources (equals rows when no conflict displaced any). */
  acceptedSum: number;
  table: RowTable;
  manifest: Manifest;
}

/**
 * Reads a store and checks that it is whole: readable by readStore and by apache-arrow (an
 * independent reader), the manifest's commit id, row count and per-source counts agree with
 * rows.arrow, and every count obeys read == accepted + duplicates + rejected + pending.
 */
export async function checkStore(dir: string): Promise<StoreState> {
  const { table, manifest } = await readStore(dir);
  if (manifest.rows !== table.length) throw new Error(`manifest rows ${manifest.rows} != ${table.length}`);
  const c = manifest.counts;
  if (c.read !== c.accepted + c.duplicates + c.rejected + c.pending) throw new Error(`identity broken: ${JSON.stringify(c)}`);
  let accepted = 0;
  for (const s of Object.values(manifest.sources)) {
    if (s.read !== s.accepted + s.duplicates + s.rejected + s.pending) throw new Error(`identity broken for ${s.path}`);
    accepted += s.accepted;
  }
  const inRows = new Set(table.source);
  const listed = new Set(Object.values(manifest.sources).map((s) => s.path));
  for (const s of inRows) if (!listed.has(s)) throw new Error(`rows from ${s} missing in the manifest`);
  // The store files on disk (what pandas or DuckDB would open) are each whole.
  if (existsSync(join(dir, 'rows.arrow'))) tableFromIPC(readFileSync(join(dir, 'rows.arrow')));
  JSON.parse(readFileSync(join(dir, 'manifest.json'), 'utf8'));
  return { rows: table.length, sources: [...listed].sort(), acceptedSum: accepted, table, manifest };
}

/** Files a finished writer must not leave behind. */
export function leftovers(dir: string): string[] {
  return readdirSync(dir).filter((n) => n === 'lock' || n === 'commit.json' || n.includes('.tmp-') || n.endsWith('.break'));
}

export interface Child {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
  ms: number;
}

export interface SpawnOptions {
  cwd?: string;
  /** SIGKILL this many ms after the start. */
  killAfterMs?: number;
  /** SIGKILL `afterMs` after a file whose name matches `match` appears in `dir` (the write phase). */
  killOnFile?: { dir: string; match: RegExp; afterMs: number };
}

/** Spawns `datlas ARGS`, optionally killing it (SIGKILL) at a moment of the test's choosing. */
export function spawnCli(args: string[], opts: SpawnOptions = {}): Promise<Child> {
  return new Promise((resolve) => {
    const started = Date.now();
    const child = spawn(process.execPath, [BIN, ...args], { cwd: opts.cwd, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, NO_COLOR: '1' } });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d) => (stdout += d));
    child.stderr.on('data', (d) => (stderr += d));
    const timers: NodeJS.Timeout[] = [];
    const kill = () => child.kill('SIGKILL');
    if (opts.killAfterMs !== undefined) timers.push(setTimeout(kill, opts.killAfterMs));
    let watcher: FSWatcher | null = null;
    if (opts.killOnFile) {
      const { dir, match, afterMs } = opts.killOnFile;
      watcher = watch(dir, (_event, name) => {
        if (!name || !match.test(String(name)) || !watcher) return;
        watcher.close();
        watcher = null;
        timers.push(setTimeout(kill, afterMs));
      });
    }
    child.on('close', (code, signal) => {
      for (const t of timers) clearTimeout(t);
      watcher?.close();
      resolve({ code, signal, stdout, stderr, ms: Date.now() - started });
    });
  });
}
