import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildMap, coverage, describe as describeStore, findHurts, findRidge, ingest, openStore, planRuns, renderMap, simulate, UserError } from '../../src/api/index.js';
import type { Store } from '../../src/api/index.js';
import { runCli } from '../helpers/runCli.js';
import { DEMO_SPEC, demoStore } from './demoStore.js';

// Each library function returns what the matching command prints with --json: compared here on
// the demo sweep, from a store and from an arquero table after a filter.
let dir = '';
let storeDir = '';
let store: Store;
beforeAll(async () => {
  ({ dir, store: storeDir } = demoStore('datlas-library-'));
  store = await openStore(storeDir);
}, 120_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const cli = (args: string[]): unknown => {
  const r = runCli([...args, '--store', storeDir, '--json', '--quiet']);
  expect(r.code, r.stderr).toBe(0);
  return JSON.parse(r.stdout);
};
const viaJson = (v: unknown): unknown => JSON.parse(JSON.stringify(v));

describe('the library gives what the commands print', () => {
  it('openStore: the 15,000 rows as typed arrays, as arquero, and as Arrow', () => {
    expect(store.rows).toBe(15_000);
    expect(store.toArquero().numRows()).toBe(15_000);
    const arrow = store.toArrow();
    expect(arrow.numRows).toBe(15_000);
    expect(arrow.getChild('width')!.toArray()).toEqual(store.table.width);
  });

  it('buildMap: the map file of datlas map --format json, byte for byte', async () => {
    const out = join(dir, 'maps');
    cli(['map', '--kind', 'sample', '--out', out]);
    const map = await buildMap(store, { kind: 'sample' });
    expect(`${JSON.stringify(map)}\n`).toBe(readFileSync(join(out, 'map-sample.json'), 'utf8'));
  });

  it('findRidge of a filtered arquero table: as datlas ridge --at for the same slice', async () => {
    const rows = store.toArquero().filter((d: { label_noise: number; train_size: number }) => d.label_noise === 0.1 && d.train_size === 256);
    const ridge = findRidge(await buildMap(rows, { kind: 'model', ridge: false }));
    const want = cli(['ridge', '--kind', 'model', '--at', 'label_noise=0.1,train_size=256']) as { picked: string[] };
    // The filtered table holds one noise level and one size, so buildMap fixes them itself (an
    // axis with one value is not a pick) where the CLI was told them with --at: the same answer.
    expect(ridge.picked).toEqual([]);
    expect(want.picked).toEqual([]);
    expect(viaJson(ridge)).toEqual(want);
  });

  it('findHurts, from the store and from a filtered arquero table', () => {
    expect(viaJson(findHurts(store))).toEqual(cli(['hurts']));
    const rows = store.toArquero().filter((d: { label_noise: number }) => d.label_noise === 0.2);
    expect(viaJson(findHurts(rows, { at: { label_noise: 0.2 } }))).toEqual(cli(['hurts', '--at', 'label_noise=0.2']));
  });

  it('coverage and planRuns against a spec file, and coverage against a spec object', () => {
    expect(viaJson(coverage(store, DEMO_SPEC))).toEqual(cli(['coverage', '--spec', DEMO_SPEC]));
    expect(viaJson(planRuns(store, { spec: DEMO_SPEC, budget: 1000 }))).toEqual(cli(['plan', '--spec', DEMO_SPEC, '--budget', '1000']));
    const spec = JSON.parse(readFileSync(DEMO_SPEC, 'utf8')) as Record<string, unknown>;
    const fromObject = coverage(store.toArquero(), spec);
    expect(fromObject.counts).toEqual({ complete: 600, partial: 0, missing: 150, diverged: 0 });
  });

  it('describe: the same from a directory and from an opened store', async () => {
    expect(await describeStore(storeDir)).toEqual(await describeStore(store));
  });

  it('renderMap draws the images of a map (also one read back from its file)', async () => {
    const map = await buildMap(store, { kind: 'model', method: 'linear', raster: { nx: 32, ny: 32 } });
    const { files } = await renderMap(JSON.parse(JSON.stringify(map)), { out: join(dir, 'img'), formats: ['svg'] });
    expect(files.map((f) => f.slice(join(dir, 'img').length + 1)).sort()).toEqual(['map-model-slices.svg', 'map-model-slices.vl.json', 'map-model.svg', 'map-model.vl.json']);
    expect(readFileSync(files.find((f) => f.endsWith('map-model.svg'))!, 'utf8')).toMatch(/^<svg/);
  });

  it('simulate: what datlas simulate --json prints (but the seconds it took)', async () => {
    const mine = await simulate({ preset: 'quick', out: join(dir, 'sim-a'), workers: 1 });
    const r = runCli(['simulate', '--preset', 'quick', '--out', join(dir, 'sim-b'), '--workers', '1', '--json']);
    const theirs = JSON.parse(r.stdout) as Record<string, unknown>;
    expect({ ...mine, out: '', seconds: 0 }).toEqual({ ...theirs, out: '', seconds: 0 });
    expect(readFileSync(join(dir, 'sim-a/sweep.csv'), 'utf8').split('\n').length - 2).toBe(mine.rows);
  });

  it('simulate: evaluation noise as datlas simulate --eval-noise writes it, and refused where it cannot apply', async () => {
    const mine = await simulate({ preset: 'quick', out: join(dir, 'sim-noise-a'), workers: 1, evalNoise: 0.02 });
    const r = runCli(['simulate', '--preset', 'quick', '--out', join(dir, 'sim-noise-b'), '--workers', '1', '--eval-noise', '0.02', '--json']);
    expect(r.code).toBe(0);
    // Every column but wall_seconds (the time each run took) is the same, noise included.
    const columns = (f: string) => readFileSync(join(dir, f, 'sweep.csv'), 'utf8').split('\n').map((l) => l.split(',').slice(0, -1).join(','));
    expect(readFileSync(join(dir, 'sim-noise-a/sweep.csv'), 'utf8').split('\n')[0].endsWith(',wall_seconds')).toBe(true);
    expect(columns('sim-noise-a')).toEqual(columns('sim-noise-b'));
    // And the noise is there: test error differs from the same sweep without it.
    await simulate({ preset: 'quick', out: join(dir, 'sim-noise-0'), workers: 1 });
    expect(columns('sim-noise-a')).not.toEqual(columns('sim-noise-0'));
    expect(mine.rows).toBe((JSON.parse(r.stdout) as { rows: number }).rows);
    await expect(simulate({ preset: 'quick', out: join(dir, 'sim-noise-c'), evalNoise: 1.5 })).rejects.toThrow(/eval/i);
    await expect(simulate({ preset: 'linear', out: join(dir, 'sim-noise-d'), evalNoise: 0.01 })).rejects.toThrow();
  });

  it('ingest: --set values as numbers, the counts accounted, and UserErrors for what cannot be done', async () => {
    // Invented log (fixture): two epochs of one run with a bad line between them.
    const log = join(dir, 'one.csv');
    writeFileSync(log, 'run,seed,width,epoch,n,test_error\nr1,0,8,1,100,0.4\nr1,0,8,2,100,oops\nr1,0,8,3,100,0.3\n');
    const st = join(dir, 'set-store');
    const c = await ingest(log, { store: st, set: { label_noise: 0.3 }, quiet: true });
    expect([c.read, c.accepted, c.rejected]).toEqual([3, 2, 1]);
    expect(c.read).toBe(c.accepted + c.duplicates + c.rejected + c.pending + c.skipped);
    expect((await describeStore(st)).axes.label_noise).toEqual([0.3]);
    await expect(ingest(join(dir, 'no-such-dir'), { store: st, quiet: true })).rejects.toThrow(UserError);
    await expect(ingest(log, { store: st, seedFrom: '(' })).rejects.toThrow(/seed/);
    await expect(openStore(join(dir, 'not-a-store'))).rejects.toThrow(UserError);
  });
});
