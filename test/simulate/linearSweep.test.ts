import { describe, expect, it } from 'vitest';
import { linearSweep } from '../../src/simulate/linearSweep.js';

/** Belkin, Hsu & Xu 2019, Thm 1 (REFERENCES §1): exact risk of minimum-norm least squares. */
function thm1(n: number, p: number, signalIn: number, signalOut: number, sigma2: number): number {
  if (p <= n - 2) return ((signalOut + sigma2) * (n - 1)) / (n - p - 1);
  if (p >= n + 2) return signalIn * (1 - n / p) + (signalOut + sigma2) * (1 + n / (p - n - 1));
  return Infinity;
}

function meanSe(v: ArrayLike<number>): { mean: number; se: number } {
  const a = Array.from(v);
  const m = a.reduce((x, y) => x + y, 0) / a.length;
  const sd = Math.sqrt(a.reduce((x, y) => x + (y - m) ** 2, 0) / (a.length - 1));
  return { mean: m, se: sd / Math.sqrt(a.length) };
}

const SEEDS = 300;
const TEST = 100;

describe('linear-Gaussian sweep vs Belkin, Hsu & Xu 2019, Thm 1', () => {
  it('the formula reproduces the REFERENCES §1 check values', () => {
    expect(thm1(100, 50, 1, 0, 0.25)).toBeCloseTo(99 / 196, 12);
    expect(thm1(100, 90, 1, 0, 0.25)).toBeCloseTo(11 / 4, 12);
    expect(thm1(100, 200, 1, 0, 0.25)).toBeCloseTo(397 / 396, 12);
    // D = 100, β even, ‖β‖² = 1, σ² = 0.04, n = 40.
    expect(thm1(40, 20, 0.2, 0.8, 0.04)).toBeCloseTo(1.724211, 6);
    expect(thm1(40, 60, 0.6, 0.4, 0.04)).toBeCloseTo(1.566316, 6);
    expect(thm1(40, 80, 0.8, 0.2, 0.04)).toBeCloseTo(0.886154, 6);
    expect(thm1(40, 100, 1, 0, 0.04)).toBeCloseTo(0.667119, 6);
  });

  // Monte-Carlo mean of test_loss (fresh test set per seed) within 4 standard errors of the
  // exact risk; |p − n| >= 4 everywhere (the risk's variance is infinite closer to p = n).
  const cases: { label: string; n: number; p: number; D: number; sigma2: number; R: number }[] = [
    { label: 'well-specified, p < n', n: 100, p: 50, D: 50, sigma2: 0.25, R: 99 / 196 },
    { label: 'well-specified, near threshold', n: 100, p: 90, D: 90, sigma2: 0.25, R: 11 / 4 },
    { label: 'well-specified, p > n', n: 100, p: 200, D: 200, sigma2: 0.25, R: 397 / 396 },
    { label: 'D = 100, p < n', n: 40, p: 20, D: 100, sigma2: 0.04, R: 1.724211 },
    { label: 'D = 100, p > n', n: 40, p: 60, D: 100, sigma2: 0.04, R: 1.566316 },
    { label: 'D = 100, p > n', n: 40, p: 80, D: 100, sigma2: 0.04, R: 0.886154 },
    { label: 'D = 100, p = D (global minimum)', n: 40, p: 100, D: 100, sigma2: 0.04, R: 0.667119 },
    // Sample-wise table, p = D = 100, σ² = 0.25 (n = 98 left out: |p − n| < 4).
    { label: 'sample-wise', n: 50, p: 100, D: 100, sigma2: 0.25, R: 1.0051 },
    { label: 'sample-wise', n: 90, p: 100, D: 100, sigma2: 0.25, R: 2.85 },
    { label: 'sample-wise', n: 120, p: 100, D: 100, sigma2: 0.25, R: 1.5658 },
    { label: 'sample-wise', n: 200, p: 100, D: 100, sigma2: 0.25, R: 0.5025 },
  ];
  for (const c of cases) {
    it(`${c.label}: n = ${c.n}, p = ${c.p}, D = ${c.D} → R = ${c.R}`, () => {
      const t = linearSweep({ seeds: SEEDS, widths: [c.p], trainSizes: [c.n], dims: c.D, sigma2: c.sigma2, signal: 1, testSize: TEST });
      expect(t.length).toBe(SEEDS);
      const exact = thm1(c.n, c.p, t.extra.signal_in[0], t.extra.signal_out[0], t.extra.sigma2[0]);
      expect(exact).toBeCloseTo(c.R, 3); // the logged columns carry what the formula needs
      const { mean, se } = meanSe(t.test_loss);
      expect(Math.abs(mean - exact)).toBeLessThan(4 * se);
    });
  }

  it('sample-wise: more data hurts between n = 50 and n ≈ p (Monte-Carlo means)', () => {
    const t = linearSweep({ seeds: 200, widths: [100], trainSizes: [50, 90], sigma2: 0.25, testSize: TEST });
    const at = (n: number) => meanSe(Array.from(t.test_loss).filter((_, i) => t.train_size[i] === n));
    const a = at(50);
    const b = at(90);
    expect(b.mean - a.mean).toBeGreaterThan(4 * Math.hypot(a.se, b.se));
  });

  it('logs sigma2, signal_in, signal_out, and an exact per-fit risk that test_loss estimates', () => {
    const t = linearSweep({ seeds: 50, widths: [30, 70], trainSizes: [50], dims: 100, sigma2: 0.1, testSize: 400 });
    for (let i = 0; i < t.length; i++) {
      expect(t.extra.sigma2[i]).toBe(0.1);
      expect(t.extra.signal_in[i]).toBeCloseTo(t.width[i] / 100, 12);
      expect(t.extra.signal_out[i]).toBeCloseTo(1 - t.width[i] / 100, 12);
      expect(t.extra.risk[i]).toBeGreaterThanOrEqual(0.1 + t.extra.signal_out[i] - 1e-12);
      expect(Number.isNaN(t.test_error[i])).toBe(true); // a regression sweep: no error column
    }
    const d = meanSe(Array.from(t.test_loss, (v, i) => v - t.extra.risk[i]));
    expect(Math.abs(d.mean)).toBeLessThan(4 * d.se);
  });

  it('is deterministic, with nested pools (a run does not depend on the rest of the grid)', () => {
    const a = linearSweep({ seeds: [7], widths: [20], trainSizes: [30], dims: 50 });
    const b = linearSweep({ seeds: [7], widths: [10, 20], trainSizes: [30, 60], dims: 50 });
    const i = b.run.indexOf('lin-s7-n30-p20');
    expect(b.test_loss[i]).toBe(a.test_loss[0]);
    expect(b.train_loss[i]).toBe(a.train_loss[0]);
  });
});

describe('linear-Gaussian sweep vs the proportional limit (Hastie, Montanari, Rosset & Tibshirani 2019)', () => {
  // Excess risk R − σ² → σ²γ/(1−γ) (γ < 1), r²(1 − 1/γ) + σ²/(γ−1) (γ > 1), REFERENCES §2.
  // Tolerance: 4 Monte-Carlo standard errors plus the exact finite-n gap |R_n − R_∞| from
  // Thm 1 above (an O(1/n) term: 0.005 at γ = 0.5, n = 100). Values from REFERENCES §2.
  const n = 100;
  for (const [gamma, limit] of [
    [0.5, 0.25],
    [2, 0.75],
    [5, 0.8625],
  ] as const) {
    it(`γ = ${gamma}: excess risk ≈ ${limit}`, () => {
      const p = gamma * n;
      const t = linearSweep({ seeds: 150, widths: [p], trainSizes: [n], sigma2: 0.25, testSize: TEST });
      const { mean, se } = meanSe(Array.from(t.test_loss, (v) => v - 0.25));
      const finiteGap = Math.abs(thm1(n, p, 1, 0, 0.25) - 0.25 - limit);
      expect(finiteGap).toBeLessThan(0.02);
      expect(Math.abs(mean - limit)).toBeLessThan(4 * se + finiteGap);
    });
  }
});

describe('optimally tuned ridge vs the Marchenko–Pastur value (Dicker 2016; Dobriban & Wager 2018)', () => {
  // R* = σ²γ·m(−λ*), λ* = σ²γ/r², m the Marchenko–Pastur Stieltjes transform (REFERENCES §2).
  const mp = (gamma: number, lam: number) => (-(1 - gamma + lam) + Math.sqrt((1 - gamma + lam) ** 2 + 4 * gamma * lam)) / (2 * gamma * lam);
  const rStar = (gamma: number) => 0.25 * gamma * mp(gamma, 0.25 * gamma);
  it('the formula reproduces the REFERENCES §2 check values', () => {
    expect(rStar(0.5)).toBeCloseTo(0.17539, 5);
    expect(rStar(1)).toBeCloseTo(0.39039, 5);
    expect(rStar(2)).toBeCloseTo(0.64039, 5);
    expect(rStar(5)).toBeCloseTo(0.84564, 5);
  });
  // Tolerance: 4 standard errors plus 3% of R*. The finite-n bias of ridge risk is O(1/n)
  // (common practice: finite-sample corrections to Marchenko–Pastur functionals are O(1/n),
  // about 1% at n = 100); 3% leaves room without hiding a wrong λ (λ off by 2× moves R* by > 5%).
  const n = 100;
  const means: number[] = [];
  for (const gamma of [0.5, 1, 2]) {
    it(`γ = ${gamma}: ridge --ridge optimal reaches R* = ${rStar(gamma).toFixed(5)}`, () => {
      const t = linearSweep({ seeds: 200, widths: [gamma * n], trainSizes: [n], sigma2: 0.25, testSize: TEST, ridge: 'optimal' });
      expect(t.extra.ridge[0]).toBeCloseTo(0.25 * gamma, 12);
      const { mean, se } = meanSe(Array.from(t.test_loss, (v) => v - 0.25));
      means.push(mean);
      expect(Math.abs(mean - rStar(gamma))).toBeLessThan(4 * se + 0.03 * rStar(gamma));
    });
  }
  it('optimal ridge removes the peak: its risk rises monotonically with γ (Nakkiran et al. 2020)', () => {
    expect(means).toHaveLength(3);
    expect(means[0]).toBeLessThan(means[1]);
    expect(means[1]).toBeLessThan(means[2]);
    // ...and at γ = 1, where ridgeless risk is infinite, it stays below the γ = 2 ridgeless value 0.75.
    expect(means[1]).toBeLessThan(0.75);
  });
});
