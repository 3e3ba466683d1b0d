import { testRng } from './makeCell.js';

// Invented curves shaped like per-epoch logs of epoch-wise double-descent runs (shape described
// in words only: fall to a minimum, a broad rise, a slow fall), generated here with noise and
// single-epoch spikes. Not data from any published experiment.

/** Smooth curve through knots (log2 epoch, value): cosine interpolation, monotone between knots. */
export function knotCurve(knots: [number, number][]): (epoch: number) => number {
  const k = knots.map(([e, v]) => [Math.log2(e), v] as const);
  return (epoch) => {
    const u = Math.log2(epoch);
    if (u <= k[0][0]) return k[0][1];
    for (let i = 1; i < k.length; i++) {
      if (u <= k[i][0]) {
        const f = (u - k[i - 1][0]) / (k[i][0] - k[i - 1][0]);
        const s = (1 - Math.cos(Math.PI * f)) / 2;
        return k[i - 1][1] + s * (k[i][1] - k[i - 1][1]);
      }
    }
    return k[k.length - 1][1];
  };
}

export interface NoisyCurveOptions {
  epochs: number;
  sd: number;
  /** Lag-one correlation of the evaluation noise between neighbouring epochs. */
  rho?: number;
  /** Chance per epoch of a single-epoch spike, and its size range. */
  spikeRate?: number;
  spike?: [number, number];
  /** Epochs with a forced spike of the given size. */
  forced?: [number, number][];
  seed: number;
}

/** One logged value per epoch 1..epochs: curve + AR(1) noise + occasional one-epoch spikes. */
export function noisyCurve(curve: (e: number) => number, o: NoisyCurveOptions): { epochs: number[]; values: number[] } {
  const r = testRng(o.seed);
  const rho = o.rho ?? 0;
  const epochs: number[] = [];
  const values: number[] = [];
  let a = 0;
  for (let e = 1; e <= o.epochs; e++) {
    a = rho * a + Math.sqrt(1 - rho * rho) * r.z();
    let v = curve(e) + o.sd * a;
    if (o.spikeRate && r.u() < o.spikeRate) {
      const [lo, hi] = o.spike ?? [3 * o.sd, 10 * o.sd];
      v += lo + (hi - lo) * r.u();
    }
    for (const [fe, size] of o.forced ?? []) if (fe === e) v += size;
    epochs.push(e);
    values.push(v);
  }
  return { epochs, values };
}

/** ~4,800 epochs: 0.8 → 0.20 at epoch 30, ~0.29 over 120–300, slow fall after; spikes, one at epoch 15. */
export const runA = knotCurve([[1, 0.8], [30, 0.2], [120, 0.28], [200, 0.29], [300, 0.287], [4800, 0.235]]);
/** Minimum ~0.23 near epoch 30, ~0.30 over 150–300. */
export const runB = knotCurve([[1, 0.85], [30, 0.23], [150, 0.295], [220, 0.3], [300, 0.297], [4800, 0.255]]);
/** Mean over seeds, 1,000 epochs: 0.13 at epoch 26, ~0.168 over 80–150, 0.15 at the end. */
export const meanCurve = knotCurve([[1, 0.6], [26, 0.13], [80, 0.166], [115, 0.168], [150, 0.166], [1000, 0.15]]);
/** Negative control: monotone decreasing. */
export const control = knotCurve([[1, 0.8], [30, 0.3], [300, 0.22], [4800, 0.2]]);
