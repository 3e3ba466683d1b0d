import { readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { Ajv } from 'ajv';
import type { ValidateFunction } from 'ajv';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { describe as describeStore } from '../../src/api/describe.js';
import { DEMO_SPEC, demoStore, ROOT } from './demoStore.js';

// The JSON Schemas in docs/schemas/ (JSON Schema draft-07, validated with ajv, the reference
// validator already used for specs) against real outputs of the commands on sample-sweeps/demo.
const SCHEMAS = join(ROOT, 'docs/schemas');
const ajv = new Ajv({ allErrors: true, strict: true, allowUnionTypes: true });
for (const f of readdirSync(SCHEMAS).filter((n) => n.endsWith('.schema.json'))) ajv.addSchema(JSON.parse(readFileSync(join(SCHEMAS, f), 'utf8')));
const schema = (name: string): ValidateFunction => ajv.getSchema(`urn:descent-atlas:schema:${name}`)!;

function check(name: string, value: unknown): void {
  const v = schema(name);
  expect(v, `schema ${name}`).toBeDefined();
  const ok = v(value);
  expect(ok ? [] : v.errors!.slice(0, 5), `${name} output against docs/schemas/${name}.schema.json`).toEqual([]);
}

function cli(args: string[]): unknown {
  const r = runCli(args);
  expect(r.code, `datlas ${args.join(' ')}: ${r.stderr}`).toBe(0);
  return JSON.parse(r.stdout);
}

let dir = '';
let store = '';
let ingestOut: Record<string, number>;
beforeAll(() => {
  ({ dir, store } = demoStore('datlas-schemas-'));
  ingestOut = JSON.parse(demoStore('datlas-schemas-ingest-').ingestJson);
}, 120_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('docs/schemas validate every --json output on the demo sweep', () => {
  it('ingest: the counts, with read == accepted + duplicates + rejected + pending + skipped (DESIGN.md §4)', () => {
    check('ingest', ingestOut);
    const o = ingestOut;
    expect(o.read).toBe(15_000);
    expect(o.read).toBe(o.accepted + o.duplicates + o.rejected + o.pending + o.skipped);
  });

  it('describe: the store as the library describes it (and as the command prints it when present)', async () => {
    const d = await describeStore(store);
    check('describe', d);
    // sample-sweeps/README.md: 25 widths, train sizes 64..512, noise 0.1 and 0.2, seeds 0..2, 25 epochs per run.
    expect(d.rows).toBe(15_000);
    expect(d.runs).toBe(600);
    expect(d.axes.width).toHaveLength(25);
    expect(d.axes.train_size).toEqual([64, 128, 256, 512]);
    expect(d.axes.label_noise).toEqual([0.1, 0.2]);
    expect(d.axes.epochs).toEqual({ min: 1, max: 1_000_000, distinct: 25 });
    expect(d.seeds).toEqual([0, 1, 2]);
    const help = runCli(['--help']).stdout;
    if (/^\s*datlas describe/m.test(help)) check('describe', cli(['describe', '--store', store, '--json']));
  });

  it('map: the map file (origin codes named in it) and the command summary', () => {
    const out = join(dir, 'maps');
    const summary = cli(['map', '--kind', 'model', '--store', store, '--out', out, '--format', 'json', '--json']) as { files: string[] };
    check('map-summary', summary);
    const file = JSON.parse(readFileSync(summary.files[0], 'utf8'));
    check('map', file);
    expect(file.raster.originCodes).toEqual({ 0: 'no data', 1: 'interpolated', 2: 'measured' });
    expect(file.raster.value).toHaveLength(file.raster.nx * file.raster.ny);
    // A sample-wise map too: its y axis (width) has 25 values, its x (train_size) 4.
    const sample = cli(['map', '--kind', 'sample', '--store', store, '--out', out, '--json', '--no-ridge']) as { files: string[] };
    check('map', JSON.parse(readFileSync(sample.files[0], 'utf8')));
  });

  it('ridge, hurts', () => {
    check('ridge', cli(['ridge', '--kind', 'model', '--store', store, '--json', '--quiet']));
    check('ridge', cli(['ridge', '--kind', 'sample', '--store', store, '--json', '--quiet']));
    check('hurts', cli(['hurts', '--store', store, '--json']));
  });

  it('hurts with a segment (the demo has none after the correction across slices)', () => {
    // The hand-made sample-wise sweep of test/cli/hurts.test.ts (invented numbers): at width 64
    // error falls to n = 1,000, rises to 4,000, falls back by 16,000; three seeds at ±0.01.
    const means = [0.5, 0.4, 0.3, 0.34, 0.37, 0.32, 0.28];
    const sizes = [250, 500, 1000, 2000, 4000, 8000, 16000];
    const lines = ['run,seed,width,epochs,train_size,test_error'];
    sizes.forEach((n, i) => [-0.01, 0, 0.01].forEach((d, s) => lines.push(`n${n}s${s},${s},64,4000,${n},${(means[i] + d).toFixed(4)}`)));
    writeFileSync(join(dir, 'hurts.csv'), `${lines.join('\n')}\n`);
    const st = join(dir, 'hurts-store');
    expect(runCli(['ingest', join(dir, 'hurts.csv'), '--store', st, '--quiet']).code).toBe(0);
    const out = cli(['hurts', '--store', st, '--json']) as { segments: unknown[] };
    expect(out.segments.length).toBeGreaterThan(0);
    check('hurts', out);
  });

  it('coverage and plan against a spec with one train size not yet run', () => {
    const cov = cli(['coverage', '--store', store, '--spec', DEMO_SPEC, '--json']) as { counts: Record<string, number> };
    check('coverage', cov);
    // 25 widths × 2 noise levels × 3 seeds at train size 1024 are planned and absent.
    expect(cov.counts).toEqual({ complete: 600, partial: 0, missing: 150, diverged: 0 });
    check('plan', cli(['plan', '--store', store, '--spec', DEMO_SPEC, '--json', '--budget', '1000']));
  });

  it('simulate', () => {
    const r = runCli(['simulate', '--preset', 'quick', '--out', join(dir, 'sim'), '--workers', '1', '--json']);
    expect(r.code, r.stderr).toBe(0);
    check('simulate', JSON.parse(r.stdout));
  });

  it('the schemas reject outputs that break them (they can fail)', () => {
    const bad = structuredClone(ingestOut) as Record<string, unknown>;
    delete bad.read;
    expect(schema('ingest')(bad)).toBe(false);
    const ridge = cli(['ridge', '--store', store, '--json', '--quiet']) as { rows: { peak: unknown }[] };
    const withPeak = ridge.rows.findIndex((r) => r.peak !== null);
    expect(withPeak).toBeGreaterThanOrEqual(0);
    (ridge.rows[withPeak].peak as Record<string, unknown>).x = 'wide';
    expect(schema('ridge')(ridge)).toBe(false);
    const map = { format: 'datlas-map/1', raster: { originCodes: { 0: 'no data', 1: 'interpolated', 2: 'seen' } } };
    expect(schema('map')(map)).toBe(false);
  });
});
