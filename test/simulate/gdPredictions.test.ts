import { describe, expect, it } from 'vitest';
import { kernelGdPredictions, primalGdPredictions } from '../../src/simulate/gdPredictions.js';
import { gdFilter } from '../../src/simulate/spectralFilter.js';
import { Rng } from '../../src/simulate/Rng.js';

/** Explicit full-batch gradient descent w ← w − η Φᵀ(Φw − y)/n from w = 0 (REFERENCES §3). */
function explicitGd(F: Float64Array, n: number, p: number, y: Float64Array, eta: number, steps: number): Float64Array {
  const w = new Float64Array(p);
  const r = new Float64Array(n);
  for (let t = 0; t < steps; t++) {
    for (let i = 0; i < n; i++) {
      let s = -y[i];
      for (let a = 0; a < p; a++) s += F[i * p + a] * w[a];
      r[i] = s;
    }
    for (let a = 0; a < p; a++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += F[i * p + a] * r[i];
      w[a] -= (eta * s) / n;
    }
  }
  return w;
}

function relu(v: number): number {
  return v > 0 ? v : 0;
}

function problem(n: number, p: number, m: number, seed: number) {
  const rng = new Rng(seed);
  const F = new Float64Array(n * p).map(() => relu(rng.normal()));
  const T = new Float64Array(m * p).map(() => relu(rng.normal()));
  const Y = new Float64Array(n * 2).map(() => (rng.uniform() < 0.5 ? -1 : 1));
  return { F, T, Y };
}

function gram(A: Float64Array, ra: number, B: Float64Array, rb: number, p: number, scale: number): Float64Array {
  const out = new Float64Array(ra * rb);
  for (let i = 0; i < ra; i++)
    for (let j = 0; j < rb; j++) {
      let s = 0;
      for (let a = 0; a < p; a++) s += A[i * p + a] * B[j * p + a];
      out[i * rb + j] = s * scale;
    }
  return out;
}

const EPOCHS = [1, 2, 5, 17, 60, 300];

describe('closed-form gradient-descent trajectory', () => {
  // REFERENCES §3 (D): the closed form agrees with explicit iteration (to 1e-14 in the prototype);
  // the issue asks for 1e-9.
  for (const [mode, n, p] of [
    ['kernel (n <= p)', 12, 30],
    ['primal (n > p)', 30, 12],
  ] as const) {
    it(`equals explicit gradient descent to 1e-9 at every logged epoch: ${mode}`, () => {
      const m = 7;
      const { F, T, Y } = problem(n, p, m, n * 100 + p);
      const pred =
        mode.startsWith('kernel')
          ? kernelGdPredictions({ kernel: gram(F, n, F, n, p, 1 / n), n, testKernel: gram(T, m, F, n, p, 1 / n), m, labels: Y, L: 2, epochs: EPOCHS })
          : primalGdPredictions({ hessian: gram(transpose(F, n, p), p, transpose(F, n, p), p, n, 1 / n), p, features: F, n, testFeatures: T, m, stride: p, labels: Y, L: 2, epochs: EPOCHS });
      const eta = 1 / pred.lambdaMax;
      const EL = EPOCHS.length * 2;
      for (let l = 0; l < 2; l++) {
        const y = new Float64Array(n).map((_, i) => Y[i * 2 + l]);
        EPOCHS.forEach((t, e) => {
          const w = explicitGd(F, n, p, y, eta, t);
          for (let i = 0; i < n; i++) {
            let s = 0;
            for (let a = 0; a < p; a++) s += F[i * p + a] * w[a];
            expect(Math.abs(pred.train[i * EL + e * 2 + l] - s)).toBeLessThan(1e-9 * Math.max(1, Math.abs(s)));
          }
          for (let r = 0; r < m; r++) {
            let s = 0;
            for (let a = 0; a < p; a++) s += T[r * p + a] * w[a];
            expect(Math.abs(pred.test[r * EL + e * 2 + l] - s)).toBeLessThan(1e-9 * Math.max(1, Math.abs(s)));
          }
        });
      }
    });
  }

  it('uses the stable filter: exact where the naive formula cancels', () => {
    // (1 − (1 − ηλ)^t)/λ at ηλ = 1e-17 evaluates to 0 in floating point; the true value is ≈ ηt.
    const lam = 1e-17;
    const naive = (1 - (1 - lam) ** 1e6) / lam;
    expect(naive).toBe(0);
    expect(gdFilter(lam, 1, 1e6)).toBeCloseTo(1e6, 3);
    // ηλ = 1: one step reaches the least-squares solution, g = 1/λ.
    expect(gdFilter(2, 0.5, 1)).toBe(0.5);
    expect(gdFilter(0, 0.25, 8)).toBe(2); // λ <= 0: g = ηt
    // Moderate values agree with the textbook formula (REFERENCES §3).
    expect(gdFilter(0.3, 0.5, 7)).toBeCloseTo((1 - (1 - 0.15) ** 7) / 0.3, 14);
  });
});

function transpose(A: Float64Array, r: number, c: number): Float64Array {
  const out = new Float64Array(r * c);
  for (let i = 0; i < r; i++) for (let j = 0; j < c; j++) out[j * r + i] = A[i * c + j];
  return out;
}
