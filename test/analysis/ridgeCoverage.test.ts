import { describe, expect, it } from 'vitest';
import { findRidge } from '../../src/analysis/findRidge.js';
import { makeCell, makeMap, testRng } from './makeCell.js';

// Coverage of the bootstrap location interval. Synthetic sweep (our own, not a published curve):
// a falling baseline with a Gaussian bump in log2 width, true maximum found numerically below,
// 5 seeds per cell with Gaussian seed noise (sd 0.02), widths 4..256 in half-octave steps.
describe('ridge bootstrap interval', () => {
  it('contains the true peak location in at least 90% of repeated simulated sweeps', () => {
    const XS = Array.from({ length: 13 }, (_, i) => 2 ** (2 + i / 2));
    const u0 = Math.log2(45);
    const curve = (u: number) => 0.3 - 0.01 * (u - 2) + 0.08 * Math.exp(-((u - u0) ** 2) / 2);
    let truth = 0;
    for (let u = 2, best = -Infinity; u <= 8; u += 1e-4) if (curve(u) > best) [best, truth] = [curve(u), u];
    const r = testRng(99);
    const sweeps = 150;
    let found = 0;
    let covered = 0;
    for (let t = 0; t < sweeps; t++) {
      const cells = XS.map((x) => makeCell({ width: x }, Array.from({ length: 5 }, () => curve(Math.log2(x)) + 0.02 * r.z())));
      const pk = findRidge(makeMap({ xs: XS, rows: [{ y: 1, cells }] }), { boot: 400, nullRounds: 200, seed: t }).rows[0].peak;
      if (!pk) continue;
      found++;
      if (Math.log2(pk.low) <= truth && truth <= Math.log2(pk.high)) covered++;
    }
    expect(found / sweeps).toBeGreaterThan(0.9);
    expect(covered / found).toBeGreaterThanOrEqual(0.9);
  });
});

// Sanity check of the curve bootstrap with one seed (bench/coverage.ts measures 300 replications,
// BENCHMARKS.md): 200 log-spaced epochs, a falling curve with a broad bump whose local maximum is
// found numerically, evaluation noise sd 0.01. Few replications, so a loose bar.
describe('ridge curve-bootstrap interval (one seed)', () => {
  it('contains the bump\'s true maximum in at least 85% of 40 simulated curves', () => {
    const XS = Array.from({ length: 200 }, (_, i) => Math.round(10 ** ((5 * i) / 199) * 1000) / 1000);
    const curve = (u: number) => 0.2 + 0.5 * 2 ** (-u / 1.5) + 0.06 * Math.exp(-((u - Math.log2(300)) ** 2) / (2 * 1.2 ** 2));
    let truth = 0;
    for (let u = 6, best = -Infinity; u <= 12; u += 1e-4) if (curve(u) > best) [best, truth] = [curve(u), u];
    const r = testRng(5);
    let found = 0;
    let covered = 0;
    for (let t = 0; t < 40; t++) {
      const cells = XS.map((x) => makeCell({ width: x }, [curve(Math.log2(x)) + 0.01 * r.z()]));
      const pk = findRidge(makeMap({ xs: XS, rows: [{ y: 1, cells }] }), { boot: 200, nullRounds: 100, seed: t }).rows[0].peak;
      if (!pk) continue;
      found++;
      if (Math.log2(pk.low) <= truth && truth <= Math.log2(pk.high)) covered++;
    }
    expect(found).toBeGreaterThanOrEqual(30);
    expect(covered / found).toBeGreaterThanOrEqual(0.85);
  });
});
