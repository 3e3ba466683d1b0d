import { readdir } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { simulateMessages as t } from '../messages.js';
import type { RowTable } from '../store/RowTable.js';
import { usageError } from '../UserError.js';

export const SIMULATE_PRESETS = ['quick', 'demo', 'epochs', 'linear'] as const;
export const SIMULATE_SHAPES = ['csv', 'jsonl', 'dirs'] as const;

export interface SimulateOptions {
  /** quick (seconds), demo (three axes), epochs (epoch-wise double descent), linear (exact-risk ground truth); default quick. */
  preset?: (typeof SIMULATE_PRESETS)[number];
  /** Directory for the run logs (default sweep-PRESET); must be empty unless `force`. */
  out?: string;
  /** csv: one file per sweep; jsonl: one file per run; dirs: a folder per run (config.json + metrics.csv). Default csv. */
  shape?: (typeof SIMULATE_SHAPES)[number];
  seeds?: number;
  widths?: number[];
  trainSizes?: number[];
  /** Fractions of flipped training labels (random-features presets only). */
  labelNoise?: number[];
  /** Last logged epoch (random-features presets only). */
  epochs?: number;
  testSize?: number;
  /** Linear preset: ridge λ >= 0 or 'optimal'. */
  ridge?: number | 'optimal';
  /** Per-epoch evaluation noise on test error (sd in [0, 1)), with single-epoch spikes (random-features presets only). */
  evalNoise?: number;
  /** Worker threads (default: the number of cores). */
  workers?: number;
  force?: boolean;
  /** Makes a progress reporter once the number of runs is known (the CLI's bar); `linear` says which kind of run it counts. */
  progress?: (total: number, linear: boolean) => Promise<{ tick(): void; done(): void }>;
}

/** What `datlas simulate --json` prints. */
export interface SimulateSummary {
  preset: string;
  out: string;
  shape: string;
  runs: number;
  rows: number;
  files: number;
  workers: number;
  seconds: number;
}

const noBar = async () => ({ tick() {}, done() {} });

/**
 * Simulates a double-descent sweep (random features trained by gradient descent in closed form,
 * or linear-Gaussian with exact risk) and writes its run logs, as `datlas simulate --json`. The
 * option handling mirrors the command's (src/cli/simulate.ts parses and checks its flags);
 * test/api/library.test.ts compares the two on the same preset.
 */
export async function simulate(opts: SimulateOptions = {}): Promise<SimulateSummary> {
  const { preset = 'quick', shape = 'csv', workers = availableParallelism(), force = false, progress = noBar } = opts;
  if (!(SIMULATE_PRESETS as readonly string[]).includes(preset)) throw usageError(t.badPreset(preset, SIMULATE_PRESETS));
  if (!(SIMULATE_SHAPES as readonly string[]).includes(shape)) throw usageError(t.badShape(shape, SIMULATE_SHAPES));
  const out = opts.out ?? `sweep-${preset}`;
  if (!force) {
    const entries = await readdir(out).catch(() => [] as string[]);
    if (entries.length > 0) throw usageError(t.outNotEmpty(out));
  }
  const { presets } = await import('../simulate/presets.js');
  const { writeSweepLogs } = await import('../simulate/writeSweepLogs.js');
  const { seeds, widths, trainSizes, labelNoise, epochs, testSize, ridge, evalNoise } = opts;
  if (evalNoise !== undefined && !(Number.isFinite(evalNoise) && evalNoise >= 0 && evalNoise < 1)) throw usageError(t.badEvalNoise(String(evalNoise)));
  if (preset === 'linear' && evalNoise !== undefined) throw usageError(t.evalNoiseNeedsFeatures);
  const started = performance.now();
  let table: RowTable;
  if (preset === 'linear') {
    const { linearSweep } = await import('../simulate/linearSweep.js');
    const o = presets.linear();
    const maxWidth = Math.max(...(widths ?? o.widths));
    const lin = {
      ...o,
      ...(seeds !== undefined && { seeds }),
      ...(widths && { widths }),
      ...(trainSizes && { trainSizes }),
      ...(testSize !== undefined && { testSize }),
      ...(ridge !== undefined && { ridge }),
      dims: Math.max(o.dims ?? 0, maxWidth),
    };
    const total = (typeof lin.seeds === 'number' ? lin.seeds : lin.seeds.length) * new Set(lin.widths).size * new Set(lin.trainSizes).size;
    const bar = await progress(total, true);
    table = linearSweep({ ...lin, onRun: () => bar.tick() });
    bar.done();
  } else {
    const { featuresSweepParallel } = await import('../simulate/parallelSweep.js');
    const { featuresRunCount, resolveFeaturesOptions } = await import('../simulate/featuresSweep.js');
    const o = presets[preset]();
    const feat = {
      ...o,
      ...(seeds !== undefined && { seeds }),
      ...(widths && { widths }),
      ...(trainSizes && { trainSizes }),
      ...(labelNoise && { labelNoise }),
      ...(epochs !== undefined && { maxEpochs: epochs }),
      ...(testSize !== undefined && { testSize }),
      ...(evalNoise !== undefined && { evalNoise: { sd: evalNoise } }),
    };
    let total: number;
    try {
      total = featuresRunCount(resolveFeaturesOptions(feat));
    } catch (err) {
      throw usageError((err as Error).message);
    }
    const bar = await progress(total, false);
    table = await featuresSweepParallel({ ...feat, workers, onRun: () => bar.tick() });
    bar.done();
  }
  const files = await writeSweepLogs({ table, dir: out, shape });
  return simulateSummary({ preset, out, shape, table, files: files.length, workers, seconds: (performance.now() - started) / 1000 });
}

/** The JSON summary of a simulated sweep (shared by `datlas simulate --json` and `simulate()`). */
export function simulateSummary(o: { preset: string; out: string; shape: string; table: RowTable; files: number; workers: number; seconds: number }): SimulateSummary {
  return { preset: o.preset, out: o.out, shape: o.shape, runs: new Set(o.table.run).size, rows: o.table.length, files: o.files, workers: o.workers, seconds: Number(o.seconds.toFixed(3)) };
}
