import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { parseAt } from '../../src/cli/parseAt.js';
import { UserError } from '../../src/UserError.js';
import { runCli } from '../helpers/runCli.js';

describe('parseAt', () => {
  it('reads repeated and comma-separated axis=value pairs, numbers as numbers', () => {
    expect(parseAt(['width=64', 'label_noise=0.2,epochs=1e3'])).toEqual({ width: 64, label_noise: 0.2, epochs: 1000 });
    expect(parseAt(['condition=adam,wd=0'])).toEqual({ condition: 'adam', wd: 0 });
    expect(parseAt(['condition=opt=sgd'])).toEqual({ condition: 'opt=sgd' });
    expect(parseAt(undefined)).toEqual({});
  });

  it('rejects malformed pairs as usage errors (exit 2)', () => {
    for (const bad of [['width'], ['=3'], ['width='], ['width=1', 'width=2']]) {
      let err: unknown;
      try {
        parseAt(bad);
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(UserError);
      expect((err as UserError).exitCode).toBe(2);
    }
  });
});

describe('datlas map', () => {
  let dir = '';
  let store = '';
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'datlas-map-'));
    store = join(dir, 'store');
    // A small model-wise sweep (own toy numbers): 5 widths × 4 epochs × 2 seeds at noise 0.2, one
    // width at noise 0, and a width-16 run that stopped at epoch 100 (a missing cell at 1000).
    const lines = ['run,seed,width,epoch,n,label_noise,test_error,train_error'];
    let r = 0;
    for (const w of [4, 8, 16, 32, 64]) {
      for (const seed of [0, 1]) {
        r++;
        for (const e of [1, 10, 100, 1000]) {
          if (w === 16 && e === 1000) continue;
          const err = 0.4 - 0.02 * Math.log2(w) + 0.05 * Math.log10(e) * Math.exp(-((Math.log2(w) - 4) ** 2)) + 0.003 * seed;
          lines.push(`r${r},${seed},${w},${e},500,0.2,${err.toFixed(5)},0.01`);
        }
      }
    }
    lines.push('z1,0,8,1000,500,0,0.2,0.01');
    writeFileSync(join(dir, 'sweep.csv'), `${lines.join('\n')}\n`);
    const ing = runCli(['ingest', join(dir, 'sweep.csv'), '--store', store, '--json']);
    expect(ing.code).toBe(0);
  });

  it('writes map-model.json and prints a JSON summary with picked values and the leave-one-out error', () => {
    const out = join(dir, 'maps');
    const r = runCli(['map', '--kind', 'model', '--store', store, '--out', out, '--raster', '32x24', '--method', 'auto', '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const s = JSON.parse(r.stdout);
    expect(s).toMatchObject({ map: 'model', metric: 'test_error', fixed: { label_noise: 0.2, train_size: 500 }, picked: ['label_noise'] });
    // Every run has train size 500: fixed, but not a pick (nothing to choose from).
    expect(s.cells).toEqual({ measured: 19, missing: 1, diverged: 0 });
    expect(Object.keys(s.loo.tried).sort()).toEqual(['gp', 'linear', 'thin-plate']);
    const file = JSON.parse(readFileSync(join(out, 'map-model.json'), 'utf8'));
    expect(file.raster.nx).toBe(32);
    expect(file.raster.value).toHaveLength(32 * 24);
    expect(file.missing).toEqual([{ x: 16, y: 1000 }]);
    expect(file.x.values).toEqual([4, 8, 16, 32, 64]);
    expect(file.ridge.rows).toHaveLength(4);
    expect(file.cells[0].cell.stats.n).toBe(2);
  });

  it('prints a human summary naming the picked and given values, and honours --at and --x/--y', () => {
    const r = runCli(['map', '--store', store, '--out', join(dir, 'maps2'), '--x', 'width', '--y', 'label_noise', '--at', 'epochs=1000', '--method', 'linear', '--no-ridge']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/map custom: test_error over width \(log2/);
    // One train size in the store: it is fixed, not "picked (most data)".
    expect(r.stdout).toMatch(/fixed: train_size=500, epochs=1000\n/);
    expect(r.stdout).toMatch(/method: linear, leave-one-out RMSE/);
    expect(r.stdout).toMatch(/wrote .*map-width-label_noise\.json/);
  });

  it('fails cleanly: usage errors exit 2, a missing store exits 1, one line and no stack trace', () => {
    const fmt = runCli(['map', '--store', store, '--format', 'tiff']);
    expect(fmt.code).toBe(2);
    expect(fmt.stderr).toMatch(/--format 'tiff' is not available/);
    const none = runCli(['map', '--store', join(dir, 'nothing-here')]);
    expect(none.code).toBe(1);
    expect(none.stderr.trim().split('\n')).toHaveLength(1);
    expect(none.stderr).not.toMatch(/\bat .*\.ts:\d+/);
    const onAxis = runCli(['map', '--store', store, '--at', 'width=8']);
    expect(onAxis.code).toBe(2);
  });

  it('has --help with an example and the formats it writes', () => {
    const r = runCli(['map', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/datlas map --kind model/);
    expect(r.stdout).toMatch(/output formats: json, png, svg, pdf/);
  });
});
