import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';

/** The image side of `datlas map`, end to end through ingest (own toy numbers: a bump along width). */
describe('datlas map --format png,svg,pdf', () => {
  let dir = '';
  let store = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'datlas-map-img-'));
    store = join(dir, 'store');
    const lines = ['run,seed,width,epoch,n,label_noise,test_error,train_error'];
    let r = 0;
    for (const noise of [0, 0.2]) {
      for (const w of [4, 8, 16, 32, 64, 128]) {
        for (const seed of [0, 1, 2]) {
          r++;
          for (const e of [1, 10, 100, 1000]) {
            if (noise === 0.2 && w === 32 && e === 1000) continue; // a missing cell
            const bump = (0.05 + noise) * Math.log10(10 * e) * Math.exp(-((Math.log2(w) - 4) ** 2));
            const err = 0.4 - 0.02 * Math.log2(w) + bump + 0.004 * Math.sin(seed * 2 + w);
            const train = Math.max(0, 0.3 - 0.05 * Math.log2(w) * Math.log10(10 * e));
            lines.push(`r${r},${seed},${w},${e},500,${noise},${err.toFixed(5)},${train.toFixed(5)}`);
          }
        }
      }
    }
    writeFileSync(join(dir, 'sweep.csv'), `${lines.join('\n')}\n`);
    expect(runCli(['ingest', join(dir, 'sweep.csv'), '--store', store, '--quiet']).code).toBe(0);
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('writes each image with its vega-lite spec beside it, and lists them in --json', () => {
    const out = join(dir, 'maps');
    const r = runCli(['map', '--store', store, '--at', 'label_noise=0.2', '--out', out, '--format', 'json,png,svg,pdf', '--slices', 'epochs=10,1000', '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const files: string[] = JSON.parse(r.stdout).files.map((f: string) => f.slice(out.length + 1)).sort();
    expect(files).toEqual([
      'map-model-slices.pdf', 'map-model-slices.png', 'map-model-slices.svg', 'map-model-slices.vl.json',
      'map-model.json', 'map-model.pdf', 'map-model.png', 'map-model.svg', 'map-model.vl.json',
    ]);
    for (const f of files) expect(existsSync(join(out, f))).toBe(true);
    const svg = readFileSync(join(out, 'map-model.svg'), 'utf8');
    expect(svg).toContain('label noise 0.2 · train size 500');
    expect(svg).toContain('missing cell');
    const slices = readFileSync(join(out, 'map-model-slices.svg'), 'utf8');
    expect(slices).toContain('epochs 10');
    expect(slices).toContain('epochs 1000');
  });

  it('facets by label noise with --raster and another colour scheme; PNG scale is honoured', () => {
    const out = join(dir, 'facets');
    const r = runCli(['map', '--store', store, '--out', out, '--format', 'png,svg', '--raster', '48x32', '--facet', 'label_noise', '--colors', 'cividis', '--png-scale', '1', '--no-ridge', '--quiet']);
    expect(r.code).toBe(0);
    const svg = readFileSync(join(out, 'map-model.svg'), 'utf8');
    expect(svg).toContain('label noise 0');
    expect(svg).toContain('label noise 0.2');
    expect(svg.match(/<image/g)!.length).toBeGreaterThanOrEqual(2);
    expect(svg).toContain('warning: ridge not computed');
    const spec = JSON.parse(readFileSync(join(out, 'map-model.vl.json'), 'utf8'));
    expect(JSON.stringify(spec)).toContain('"scheme":"cividis"');
    const png = readFileSync(join(out, 'map-model.png'));
    const width = Number(/width="(\d+)"/.exec(svg)![1]);
    expect(png.readUInt32BE(16)).toBe(width); // IHDR width at 1× (ISO/IEC 15948 §11.2.2)
  });

  it('rejects rainbow colours as a usage error (exit 2)', () => {
    const c = runCli(['map', '--store', store, '--format', 'png', '--colors', 'rainbow', '--out', join(dir, 'x')]);
    expect(c.code).toBe(2);
    expect(c.stderr).toMatch(/colors/);
  });
});
