import { describe, expect, it } from 'vitest';
import { benjaminiHochberg } from '../../src/analysis/benjaminiHochberg.js';
import { curveModel } from '../../src/analysis/curvePeaks.js';
import { findRidge } from '../../src/analysis/findRidge.js';
import { smoothCurve } from '../../src/analysis/smoothCurve.js';
import { control, meanCurve, noisyCurve, runA, runB } from './curveFixtures.js';
import type { NoisyCurveOptions } from './curveFixtures.js';
import { makeCell, makeMap } from './makeCell.js';

/** An epoch-wise map row from one logged curve (one value per epoch, one seed), epochs on a linear axis as detectScale gives for 1..N. */
function epochRow(curve: (e: number) => number, o: NoisyCurveOptions) {
  const { epochs, values } = noisyCurve(curve, o);
  const cells = values.map((v, i) => makeCell({ epochs: epochs[i], train_size: 1000 }, [v]));
  return makeMap({ kind: 'epoch', x: 'epochs', y: 'train_size', xs: epochs, rows: [{ y: 1000, cells }], xScale: 'linear' });
}

const spiky = { sd: 0.012, rho: 0.5, spikeRate: 0.01, spike: [0.03, 0.15] as [number, number] };

describe('smoothCurve', () => {
  it('reproduces a straight line exactly (local linear fits reproduce linear functions; Fan & Gijbels 1996, §3.2)', () => {
    const u = Array.from({ length: 200 }, (_, i) => Math.log2(1 + i));
    const s = smoothCurve(u, u.map((v) => 0.3 - 0.01 * v), { bandwidth: 0.3 });
    s.u.forEach((v, b) => expect(s.smooth(u.map((x) => 0.3 - 0.01 * x))[b]).toBeCloseTo(0.3 - 0.01 * v, 10));
  });

  it('chooses a wider bandwidth for a noisier curve (cross-validation trades bias for variance)', () => {
    const u = Array.from({ length: 400 }, (_, i) => Math.log2(1 + i));
    const f = (v: number) => 0.2 + 0.05 * Math.sin(v);
    const quiet = noisyCurve((e) => f(Math.log2(e)), { epochs: 400, sd: 0.0005, seed: 3 });
    const loud = noisyCurve((e) => f(Math.log2(e)), { epochs: 400, sd: 0.03, seed: 3 });
    expect(smoothCurve(u, loud.values).bandwidth).toBeGreaterThan(smoothCurve(u, quiet.values).bandwidth);
  });
});

describe('curveModel noise', () => {
  it('estimates the evaluation noise within 15% despite spikes (MAD of standardised residuals)', () => {
    const { epochs, values } = noisyCurve(runA, { epochs: 4800, sd: 0.012, spikeRate: 0.02, spike: [0.05, 0.2], seed: 11 });
    const m = curveModel(epochs.map(Math.log2), values, { minExtent: 0.5 });
    expect(m.sd / 0.012).toBeGreaterThan(0.85);
    expect(m.sd / 0.012).toBeLessThan(1.15);
  });
});

// Curves shaped like the per-epoch logs of epoch-wise double-descent runs (see curveFixtures.ts).
describe('epoch-wise peak of a single logged curve', () => {
  it('puts the peak of a 4,800-epoch run with spikes in epochs 50–600, not at the one-epoch spike at 15', () => {
    for (const seed of [1, 2, 3]) {
      const r = findRidge(epochRow(runA, { epochs: 4800, ...spiky, forced: [[15, 0.12]], seed }), { boot: 200, nullRounds: 200 });
      const row = r.rows[0];
      expect(row.model).toBe('smoothed-curve');
      expect(row.peak).not.toBeNull();
      expect(row.peak!.x).toBeGreaterThan(50);
      expect(row.peak!.x).toBeLessThan(600);
      expect(row.peak!.smoothed).toBe(true);
      expect(row.peak!.low).toBeLessThanOrEqual(row.peak!.x);
      expect(row.peak!.high).toBeGreaterThanOrEqual(row.peak!.x);
      for (const o of row.others) expect(o.x).toBeGreaterThan(40);
      expect(row.smooth!.x.length).toBe(row.smooth!.y.length);
    }
  });

  it('finds the second kind of run too (minimum 0.23 near 30, 0.30 over 150–300)', () => {
    const r = findRidge(epochRow(runB, { epochs: 4800, ...spiky, sd: 0.015, forced: [[13, 0.12]], seed: 5 }), { boot: 200, nullRounds: 200 });
    expect(r.rows[0].peak!.x).toBeGreaterThan(50);
    expect(r.rows[0].peak!.x).toBeLessThan(600);
  });

  it('calls a smooth mean curve with no seed spread significant: a 0.038 rise is far above its residual noise', () => {
    const r = findRidge(epochRow(meanCurve, { epochs: 1000, sd: 0.0004, seed: 6 }), { boot: 200, nullRounds: 200 });
    const pk = r.rows[0].peak;
    expect(pk).not.toBeNull();
    expect(pk!.x).toBeGreaterThan(50);
    expect(pk!.x).toBeLessThan(600);
    expect(pk!.p!).toBeLessThan(0.05);
  });

  it('reports no peak on monotone decreasing curves with noise and spikes (negative control)', () => {
    let found = 0;
    for (let seed = 1; seed <= 10; seed++) {
      const r = findRidge(epochRow(control, { epochs: 4800, ...spiky, seed }), { boot: 0, nullRounds: 200 });
      if (r.rows[0].peak) found++;
    }
    expect(found).toBe(0);
  });

  it('never reports a one-epoch spike: rise and fall must each span minExtent octaves', () => {
    // Flat curve with one tall spike: in SE it is huge, in extent it is one epoch.
    const r = findRidge(epochRow(() => 0.2, { epochs: 2000, sd: 0.005, forced: [[40, 0.2], [700, 0.2]], seed: 9 }), { boot: 0, nullRounds: 100 });
    expect(r.rows[0].peak).toBeNull();
    expect(r.minExtent).toBe(0.25);
  });
});

describe('benjaminiHochberg', () => {
  it('matches the step-up adjustment worked by hand from Benjamini & Hochberg 1995 (p_(i)·m/i, running minimum from the top)', () => {
    const p = [0.001, 0.008, 0.039, 0.041, 0.042, 0.06, 0.074, 0.205];
    const want = [0.008, 0.032, 0.0672, 0.0672, 0.0672, 0.08, 0.074 * 8 / 7, 0.205];
    benjaminiHochberg(p).forEach((v, i) => expect(v).toBeCloseTo(want[i], 12));
    // Equal evidence spread evenly: every adjusted p equals the largest (all 0.05).
    for (const v of benjaminiHochberg([0.01, 0.02, 0.03, 0.04, 0.05])) expect(v).toBeCloseTo(0.05, 12);
    // A family larger than the tests (untested members count as p = 1): m scales the smallest.
    expect(benjaminiHochberg([0.01], 10)[0]).toBeCloseTo(0.1, 12);
  });
});
