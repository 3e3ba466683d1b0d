import { describe, expect, it } from 'vitest';
import { addEvalNoise } from '../../src/simulate/addEvalNoise.js';
import { emptyTable } from '../../src/store/RowTable.js';

function flatTable(rows: number, runs: number) {
  const t = emptyTable(rows * runs);
  for (let r = 0; r < runs; r++) {
    for (let i = 0; i < rows; i++) {
      const k = r * rows + i;
      t.run[k] = `run${r}`;
      t.epochs[k] = i + 1;
      t.test_error[k] = 0.3;
    }
  }
  return t;
}

describe('addEvalNoise', () => {
  it('adds Gaussian noise of the given sd with about 1% single-epoch upward spikes of 3–10 sd', () => {
    const t = addEvalNoise(flatTable(20000, 2), { sd: 0.01, seed: 3 });
    const d = Array.from(t.test_error, (v) => v - 0.3);
    const spikes = d.filter((v) => v > 0.05).length; // above 5 sd: a spike (Gaussian noise alone: 3e-7 per row)
    expect(spikes / d.length).toBeGreaterThan(0.005);
    expect(spikes / d.length).toBeLessThan(0.011);
    const core = d.filter((v) => Math.abs(v) < 0.03);
    const sd = Math.sqrt(core.reduce((s, v) => s + v * v, 0) / core.length);
    expect(sd).toBeGreaterThan(0.0095);
    expect(sd).toBeLessThan(0.0105);
  });

  it('is deterministic per run and seed, keeps values in [0, 1], and does nothing at sd 0', () => {
    const a = addEvalNoise(flatTable(500, 3), { sd: 0.2, seed: 1 });
    const b = addEvalNoise(flatTable(500, 3), { sd: 0.2, seed: 1 });
    expect(Array.from(a.test_error)).toEqual(Array.from(b.test_error));
    for (const v of a.test_error) expect(v >= 0 && v <= 1).toBe(true);
    expect(Array.from(a.test_error.subarray(0, 500))).not.toEqual(Array.from(a.test_error.subarray(500, 1000)));
    expect(Array.from(addEvalNoise(flatTable(10, 1), { sd: 0 }).test_error)).toEqual(new Array(10).fill(0.3));
  });
});
