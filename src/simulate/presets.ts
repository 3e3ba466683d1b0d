import type { FeaturesSweepOptions } from './featuresSweep.js';
import type { LinearSweepOptions } from './linearSweep.js';

/**
 * Named sweeps. Each returns fresh options for featuresSweep (quick, demo, epochs) or
 * linearSweep (linear); callers may override any field.
 */
export const PRESET_NAMES = ['quick', 'demo', 'epochs', 'linear'] as const;
export type PresetName = (typeof PRESET_NAMES)[number];

/** Geometric grid a·2^(k/perDoubling) for k = 0..count−1, rounded to integers. */
function geometric(start: number, perDoubling: number, count: number): number[] {
  return Array.from({ length: count }, (_, k) => Math.round(start * 2 ** (k / perDoubling)));
}

export const presets = {
  /**
   * A few seconds: one train size (200), 14 widths dense around it, label noise 0.1 and 0.2,
   * 3 seeds, epochs 1..1e6 at 6 per decade. Model-wise double descent at width ≈ 200 late in
   * training, none at epoch 100.
   */
  quick: (): FeaturesSweepOptions => ({
    seeds: 3,
    trainSizes: [200],
    widths: [12, 25, 50, 100, 141, 168, 184, 200, 218, 238, 283, 400, 566, 800],
    labelNoise: [0.1, 0.2],
    maxEpochs: 1e6,
    epochsPerDecade: 6,
    testSize: 1000,
  }),
  /**
   * The three-axis sweep behind the demo: train sizes 64..512, 25 widths (4 per doubling from
   * 32 to 1024 where the thresholds are, 8–16 and 2048–4096 outside), label noise 0.1 and 0.2,
   * 3 seeds, epochs 1..1e6 at 4 per decade.
   */
  demo: (): FeaturesSweepOptions => ({
    seeds: 3,
    trainSizes: [64, 128, 256, 512],
    widths: [8, 16, ...geometric(32, 4, 21), 2048, 4096],
    labelNoise: [0.1, 0.2],
    maxEpochs: 1e6,
    epochsPerDecade: 4,
    testSize: 2000,
  }),
  /**
   * Epoch-wise double descent (REFERENCES §7): n = 512, a fast group of 0.4·n ReLU features on
   * 15 input coordinates and a slow group of 64 features at output scale 0.01 on the other 5,
   * which carry signal the fast group cannot see. Test error falls, rises and falls again; the
   * rise and second fall hold for every seed, the first fall only on average (8 seeds).
   */
  epochs: (): FeaturesSweepOptions => ({
    seeds: 8,
    trainSizes: [512],
    widths: [205],
    labelNoise: [0.1, 0.2],
    maxEpochs: 1e6,
    epochsPerDecade: 6,
    testSize: 2000,
    quadratic: 0.25,
    slowGroup: { inputs: 5, width: 64, scale: 0.01, signal: 1.5 },
    runPrefix: 'rf2',
  }),
  /**
   * Linear-Gaussian ground truth (REFERENCES §1): D = 100, ‖β‖² = 1 spread evenly, σ² = 0.25,
   * p = 10..100 features, n = 15..195 (never within 1 of p, where the risk is infinite), 10 seeds,
   * minimum-norm least squares.
   */
  linear: (): LinearSweepOptions => ({
    seeds: 10,
    widths: Array.from({ length: 10 }, (_, k) => 10 * (k + 1)),
    trainSizes: Array.from({ length: 19 }, (_, k) => 15 + 10 * k),
    dims: 100,
    sigma2: 0.25,
    signal: 1,
    testSize: 1000,
  }),
};

export function isPresetName(name: string): name is PresetName {
  return (PRESET_NAMES as readonly string[]).includes(name);
}
