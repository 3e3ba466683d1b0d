#!/usr/bin/env node
// The library's acceptance check, runnable by anyone from a checkout (`node library-check.mjs
// [STORE]`, after `npm run setup` has built dist/): imports the package by its own name (package.json
// "exports"), ingests sample-sweeps/demo, takes its rows as an arquero table, finds the model-wise
// ridge, and compares it with what `datlas ridge --kind model --json` prints for the same store.
// Exit 0 when they agree; prints one JSON line either way. test/api/acceptance.test.ts runs it.
import { execFileSync } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { isDeepStrictEqual } from 'node:util';
import { buildMap, findRidge, ingest, openStore } from 'descent-atlas';

const root = dirname(fileURLToPath(import.meta.url));
const store = process.argv[2] ?? join(mkdtempSync(join(tmpdir(), 'datlas-library-')), 'store');

const counts = await ingest([join(root, 'sample-sweeps/demo')], { store, quiet: true });
const rows = (await openStore(store)).toArquero();
const ridge = findRidge(await buildMap(rows, { kind: 'model', ridge: false }));
const cli = JSON.parse(execFileSync(process.execPath, [join(root, 'bin/datlas'), 'ridge', '--kind', 'model', '--store', store, '--json', '--quiet'], { encoding: 'utf8' }));

// Both sides through JSON: NaN and null compare alike.
const same = isDeepStrictEqual(JSON.parse(JSON.stringify(ridge)), cli);
const peaks = ridge.rows.filter((r) => r.peak).map((r) => ({ y: r.y, x: r.peak.x, low: r.peak.low, high: r.peak.high }));
process.stdout.write(`${JSON.stringify({ store, ingested: counts.accepted, arqueroRows: rows.numRows(), columns: rows.columnNames(), fixed: ridge.fixed, peaks, sameAsCli: same })}\n`);
process.exitCode = same && rows.numRows() === 15_000 ? 0 : 1;
