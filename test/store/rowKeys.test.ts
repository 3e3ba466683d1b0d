import { describe, expect, it } from 'vitest';
import { cellKey, configKey, eachRunKey, rowText, runKey } from '../../src/store/rowKeys.js';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import { storeRuns } from '../../src/plan/storeRuns.js';

// Invented rows (fixtures only): run "a" logged twice under two widths (an id reused), "b"
// interleaved with "a", and two runs without ids told apart by seed.
const t = tableFromRows([
  { run: 'a', width: 4, train_size: 100, seed: 0, epochs: 1 },
  { run: 'a', width: 4, train_size: 100, seed: 0, epochs: 2 },
  { run: 'b', width: 4, train_size: 100, seed: 1, epochs: 1 },
  { run: 'a', width: 4, train_size: 100, seed: 0, epochs: 3 },
  { run: 'a', width: 8, train_size: 100, seed: 0, epochs: 1 },
  { run: '', width: 8, train_size: 100, seed: 0, epochs: 1 },
  { run: '', width: 8, train_size: 100, seed: 1, epochs: 1 },
]);

describe('row keys', () => {
  it('eachRunKey gives every row the key runKey builds, building it once per stretch of one run', () => {
    const text = rowText(t);
    const seen: string[] = [];
    eachRunKey(t, null, (key, i) => {
      expect(key).toBe(runKey(t, text, i));
      seen.push(key);
    });
    // a (epochs 1, 2, 3 in two stretches), b, a at width 8, and the two id-less runs: 5 runs.
    expect(new Set(seen).size).toBe(5);
    expect(seen[0]).toBe(seen[3]);
    expect(seen[0]).not.toBe(seen[4]);
  });

  it('a cell key is its configuration key and epoch; configurations differ by any field', () => {
    const c = { condition: '', label_noise: 0.1, width: 4, train_size: 100 };
    expect(cellKey({ ...c, epochs: 10 }).startsWith(configKey(c))).toBe(true);
    expect(configKey({ ...c, width: 8 })).not.toBe(configKey(c));
    expect(configKey({ ...c, condition: 'x' })).not.toBe(configKey(c));
  });

  it('storeRuns counts runs by that key: an id reused for another width is another run', () => {
    const runs = storeRuns(t);
    expect(runs.map((r) => [r.run, r.width, r.seed, r.rows, r.lastEpoch])).toEqual([
      ['a', 4, 0, 3, 3],
      ['b', 4, 1, 1, 1],
      ['a', 8, 0, 1, 1],
      ['', 8, 0, 1, 1],
      ['', 8, 1, 1, 1],
    ]);
  });
});
