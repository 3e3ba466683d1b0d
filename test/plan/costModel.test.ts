import { describe, expect, it } from 'vitest';
import { fitCostModel, runCost } from '../../src/plan/costModel.js';
import { storeRuns } from '../../src/plan/storeRuns.js';
import { seededRng } from '../../src/analysis/seededRng.js';
import { spec, storeFor } from './fixtures.js';

describe('fitCostModel', () => {
  const reference = { width: 8, train_size: 1000, epochs: 1000 };

  it('recovers a known exponent exactly from noiseless wall times', () => {
    // wall = c · width^a · n · epochs with a = 1.7, c = 3e-9 (seconds).
    const table = storeFor(spec, { wallPerEpoch: (r) => 3e-9 * r.width ** 1.7 * r.train_size });
    const m = fitCostModel({ runs: storeRuns(table), reference });
    expect(m.units).toBe('seconds');
    expect(m.exponentFitted).toBe(true);
    expect(m.runs).toBe(6 * 2 * 2 * 3);
    expect(m.a).toBeCloseTo(1.7, 9);
    expect(m.c / 3e-9).toBeCloseTo(1, 9);
    expect(m.spread!).toBeLessThan(1e-9);
    expect(runCost(m, { width: 64, train_size: 4000, epochs: 1000 })).toBeCloseTo(3e-9 * 64 ** 1.7 * 4000 * 1000, 6);
  });

  it('recovers the exponent within its standard error from noisy wall times, and reports the spread', () => {
    const rng = seededRng(7);
    // Log-normal noise with sd 0.2 on each run's wall time (machines and queues differ).
    const gauss = () => rng.normal();
    const table = storeFor(spec, { wallPerEpoch: (r) => 5e-8 * r.width ** 2.3 * r.train_size * Math.exp(0.2 * gauss()) });
    const m = fitCostModel({ runs: storeRuns(table), reference });
    expect(Math.abs(m.a - 2.3)).toBeLessThan(3 * m.aSe!);
    expect(m.aSe!).toBeLessThan(0.05);
    expect(m.spread!).toBeGreaterThan(0.12);
    expect(m.spread!).toBeLessThan(0.3);
  });

  it('falls back to a = 2 and relative units without wall time', () => {
    const m = fitCostModel({ runs: storeRuns(storeFor(spec)), reference });
    expect(m).toMatchObject({ a: 2, units: 'relative', exponentFitted: false, runs: 0 });
    // 1 relative unit = one run of the reference configuration.
    expect(runCost(m, reference)).toBeCloseTo(1, 12);
    expect(runCost(m, { ...reference, width: 16 })).toBeCloseTo(4, 12);
  });

  it('fits c alone when every run has the same width', () => {
    const one = { ...spec, axes: { ...spec.axes, width: [32] } };
    const m = fitCostModel({ runs: storeRuns(storeFor(one, { wallPerEpoch: (r) => 1e-6 * r.width ** 2 * r.train_size })), reference });
    expect(m).toMatchObject({ a: 2, units: 'seconds', exponentFitted: false });
    expect(m.c / 1e-6).toBeCloseTo(1, 9);
  });
});
