import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect } from 'vitest';
import { runCli } from '../helpers/runCli.js';

export const ROOT = fileURLToPath(new URL('../..', import.meta.url));
export const DEMO = join(ROOT, 'sample-sweeps/demo');
/** The demo's axes with one more train size (1024) planned but never run: 150 missing runs. */
export const DEMO_SPEC = join(ROOT, 'test/fixtures/api/demo-spec.json');

/** A fresh temporary folder with the demo sweep ingested by the CLI into `store`; returns the ingest --json text too. */
export function demoStore(prefix: string): { dir: string; store: string; ingestJson: string } {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  const store = join(dir, 'store');
  const r = runCli(['ingest', DEMO, '--store', store, '--json', '--quiet']);
  expect(r.code, r.stderr).toBe(0);
  return { dir, store, ingestJson: r.stdout };
}
