import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/runCli.js';
import { parseAt } from '../../src/cli/parseAt.js';
import { mapMessages } from '../../src/messages.js';
import { UserError } from '../../src/UserError.js';
import { spec, storeFor, tableCsv } from '../plan/fixtures.js';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-at-'));
  writeFileSync(join(dir, 'runs.csv'), tableCsv(storeFor(spec)));
  expect(runCli(['ingest', 'runs.csv', '--quiet'], { cwd: dir }).code).toBe(0);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('--at', () => {
  it('given twice for one axis: says which and both values', () => {
    expect(() => parseAt(['width=8', 'width=16'])).toThrow(new UserError('--at width given twice (8 and 16); give one value per axis', 2));
    expect(parseAt(['width=8', 'width=8'])).toEqual({ width: 8 });
    // Values as the tool prints them (SI, src/formatNumber.ts) read back.
    expect(parseAt(['epochs=1M,train_size=16.4k', 'width=2G'])).toEqual({ epochs: 1e6, train_size: 16400, width: 2e9 });
    expect(parseAt(['condition=adam'])).toEqual({ condition: 'adam' });
  });

  it('a value not in the sweep lists the values present, and says so when there are none', () => {
    const noise = runCli(['map', '--kind', 'model', '--at', 'label_noise=0.3'], { cwd: dir });
    expect(noise.code).toBe(1);
    expect(noise.stderr.trim()).toBe('datlas: no rows with label_noise=0.3; values present: 0, 0.2');
    const cond = runCli(['map', '--kind', 'model', '--at', 'condition=sgd'], { cwd: dir });
    expect(cond.code).toBe(1);
    expect(cond.stderr.trim()).toBe('datlas: no rows with condition=sgd; values present: "adam"');
    // Never an empty list without a word.
    expect(mapMessages.atValueAbsent('condition', 'x', [''])).toBe("no rows with condition=x: this sweep has no conditions (every run's condition is empty); drop --at condition");
    expect(mapMessages.atValueAbsent('width', 8, [])).toBe('no rows with width=8: no row has any width value');
  });
});

