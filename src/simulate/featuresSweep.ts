import { addEvalNoise } from './addEvalNoise.js';
import type { EvalNoiseOptions } from './addEvalNoise.js';
import { emptyTable } from '../store/RowTable.js';
import type { RowTable } from '../store/RowTable.js';
import { epochGrid } from './epochGrid.js';
import { kernelGdPredictions, primalGdPredictions } from './gdPredictions.js';
import type { GdPredictions } from './gdPredictions.js';
import { Rng } from './Rng.js';
import { makeTeacher } from './teacher.js';
import { concatTables } from './concatTables.js';
import { addGram } from './addGram.js';

/**
 * A second, slow feature group on its own input block (the epoch-wise setting, REFERENCES §7):
 * the last `inputs` coordinates form block B, which the main features never see; the teacher
 * puts `signal`·v·x_B on it, and `width` ReLU features of x_B at output scale `scale` are
 * always part of the model (on top of the main width).
 */
export interface SlowGroup {
  inputs: number;
  width: number;
  scale: number;
  signal: number;
}

export interface FeaturesSweepOptions {
  /** Number of seeds (0..K−1) or the seed list. */
  seeds: number | readonly number[];
  /** Main-group widths N (number of random features). */
  widths: readonly number[];
  trainSizes: readonly number[];
  /** Label-noise levels (fraction of training labels flipped; nested within a seed). */
  labelNoise: readonly number[];
  /** Last logged epoch (default 1e6). */
  maxEpochs?: number;
  /** Logged epochs per decade (default 6). */
  epochsPerDecade?: number;
  /** Explicit logged epochs (override maxEpochs / epochsPerDecade). */
  epochs?: readonly number[];
  /** Input dimension d (default 20). */
  inputDim?: number;
  /** Fresh test points per seed (default 2000). */
  testSize?: number;
  /** Weight of the teacher's quadratic part (default 0.5). */
  quadratic?: number;
  teacherSeed?: number;
  slowGroup?: SlowGroup | null;
  /** Value of the `condition` column (default ""). */
  condition?: string;
  /** Prefix of run ids (default "rf"). */
  runPrefix?: string;
  /** Log the measured compute time as wall_seconds (default true); false leaves it NaN so the table is bit-for-bit reproducible. */
  measureTime?: boolean;
  /** Called after each finished run (one width at one train size and seed, all noise levels). */
  onRun?: () => void;
  /** Per-epoch evaluation noise on test error, with occasional single-epoch spikes (addEvalNoise); default none. */
  evalNoise?: EvalNoiseOptions;
}

/** Options with every default filled, as plain data (sent to worker threads). */
export interface ResolvedFeaturesOptions {
  seeds: number[];
  widths: number[];
  trainSizes: number[];
  labelNoise: number[];
  epochs: number[];
  inputDim: number;
  testSize: number;
  quadratic: number;
  teacherSeed: number;
  slowGroup: SlowGroup | null;
  condition: string;
  runPrefix: string;
  measureTime: boolean;
}

export interface FeaturesTask {
  seed: number;
  trainSize: number;
}

export function resolveFeaturesOptions(o: FeaturesSweepOptions): ResolvedFeaturesOptions {
  const seeds = typeof o.seeds === 'number' ? Array.from({ length: o.seeds }, (_, i) => i) : [...o.seeds];
  const uniqSorted = (a: readonly number[]) => [...new Set(a)].sort((x, y) => x - y);
  const r: ResolvedFeaturesOptions = {
    seeds,
    widths: uniqSorted(o.widths.map((w) => Math.round(w))),
    trainSizes: uniqSorted(o.trainSizes.map((n) => Math.round(n))),
    labelNoise: [...new Set(o.labelNoise)],
    epochs: o.epochs ? uniqSorted(o.epochs) : epochGrid({ max: o.maxEpochs ?? 1e6, perDecade: o.epochsPerDecade ?? 6 }),
    inputDim: o.inputDim ?? 20,
    testSize: o.testSize ?? 2000,
    quadratic: o.quadratic ?? 0.5,
    teacherSeed: o.teacherSeed ?? 20260,
    slowGroup: o.slowGroup ?? null,
    condition: o.condition ?? '',
    runPrefix: o.runPrefix ?? 'rf',
    measureTime: o.measureTime ?? true,
  };
  const bad = (what: string) => {
    throw new RangeError(`featuresSweep: ${what}`);
  };
  if (!r.seeds.length || !r.seeds.every(Number.isInteger)) bad('seeds must be a count >= 1 or a list of integers');
  if (!r.widths.length || r.widths[0] < 1) bad('widths must be >= 1');
  if (!r.trainSizes.length || r.trainSizes[0] < 2) bad('train sizes must be >= 2');
  if (!r.labelNoise.length || r.labelNoise.some((q) => !(q >= 0 && q < 1))) bad('label noise must be in [0, 1)');
  if (!r.epochs.length || r.epochs[0] < 1 || !r.epochs.every(Number.isInteger)) bad('epochs must be integers >= 1');
  if (r.slowGroup && !(r.slowGroup.inputs >= 1 && r.slowGroup.inputs < r.inputDim)) bad('the slow group needs 1..d−1 inputs');
  if (!(r.testSize >= 1)) bad('test size must be >= 1');
  return r;
}

/** The units of work: one (seed, train size) each; runs of a task share one data pool and kernel. */
export function featuresTasks(r: ResolvedFeaturesOptions): FeaturesTask[] {
  return r.seeds.flatMap((seed) => r.trainSizes.map((trainSize) => ({ seed, trainSize })));
}

/**
 * Random-features classification sweep (REFERENCES §7): x ~ N(0, I_d), y = sign f(x) for a fixed
 * teacher, a fraction of training labels flipped, features ReLU(Wx/√d), a linear read-out fitted
 * to ±1 labels with squared loss by full-batch gradient descent from zero, step 1/λ_max, whose
 * whole trajectory comes in closed form. One row per run and logged epoch, canonical columns.
 * Deterministic for given options (except `wall_seconds`, which is measured).
 */
export function featuresSweep(opts: FeaturesSweepOptions): RowTable {
  const r = resolveFeaturesOptions(opts);
  const table = concatTables(featuresTasks(r).map((t) => featuresTask(r, t, opts.onRun)));
  return opts.evalNoise ? addEvalNoise(table, opts.evalNoise) : table;
}

/** Number of runs (rows / epochs) a sweep will produce; for progress bars. */
export function featuresRunCount(r: ResolvedFeaturesOptions): number {
  return r.seeds.length * r.trainSizes.length * r.widths.length;
}

/** All runs of one (seed, train size): every width and label-noise level, every logged epoch. */
export function featuresTask(r: ResolvedFeaturesOptions, task: FeaturesTask, onRun?: () => void): RowTable {
  const { seed, trainSize: n } = task;
  const d = r.inputDim;
  const m = r.testSize;
  const slow = r.slowGroup;
  const dimB = slow ? slow.inputs : 0;
  const dimA = d - dimB;
  const S = slow ? slow.width : 0;
  const Nmax = r.widths[r.widths.length - 1];
  const P = S + Nmax;
  const L = r.labelNoise.length;
  const E = r.epochs.length;

  // Data: every stream is drawn sequentially, so the first n points / first N rows of W do not
  // depend on the rest of the sweep (train sizes and widths are nested within a seed).
  const X = new Rng(seed, 1).normals(new Float64Array(n * d));
  const Xt = new Rng(seed, 2).normals(new Float64Array(m * d));
  const W = new Rng(seed, 3).normals(new Float64Array(Nmax * dimA));
  const Ws = new Rng(seed, 4).normals(new Float64Array(S * dimB));
  const flipRng = new Rng(seed, 5);
  const keys = Float64Array.from({ length: n }, () => flipRng.uniform());

  const teacher = makeTeacher({ dim: d, dimA, quadratic: r.quadratic, blockSignal: slow?.signal ?? 0, seed: r.teacherSeed });
  const sign = (v: number) => (v >= 0 ? 1 : -1);
  const yTrue = Float64Array.from({ length: n }, (_, i) => sign(teacher.value(X, i)));
  const yTest = Float64Array.from({ length: m }, (_, i) => sign(teacher.value(Xt, i)));
  // Nested flips: the round(q·n) points with the smallest keys, so a lower level's flips are a subset.
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => keys[a] - keys[b]);
  const Y = new Float64Array(n * L);
  r.labelNoise.forEach((q, l) => {
    for (let i = 0; i < n; i++) Y[i * L + l] = yTrue[i];
    const flips = Math.round(q * n);
    for (let k = 0; k < flips; k++) Y[order[k] * L + l] = -yTrue[order[k]];
  });

  // Features, slow group first then the main group: Φ (n×P), Φ_test (m×P).
  const shape = { d, dimA, dimB, S, Nmax, slowScale: slow?.scale ?? 0 };
  const F = reluFeatures(X, n, W, Ws, shape);
  const Ft = reluFeatures(Xt, m, W, Ws, shape);

  // Kernel accumulators (raw sums over feature columns [0, done)), grown as width grows.
  let done = 0;
  let K: Float64Array | null = null;
  let Kt: Float64Array | null = null;
  const growKernels = (p: number) => {
    K ??= new Float64Array(n * n);
    Kt ??= new Float64Array(m * n);
    addGram(K, F, n, F, n, P, done, p, true);
    addGram(Kt, Ft, m, F, n, P, done, p, false);
    done = p;
  };
  // Primal Hessian ΦᵀΦ/n for the largest model below n; smaller ones are its leading blocks.
  const primalSizes = r.widths.map((N) => S + N).filter((p) => p < n);
  const pBig = primalSizes.length ? primalSizes[primalSizes.length - 1] : 0;
  let G: Float64Array | null = null;
  if (pBig > 0) {
    G = new Float64Array(pBig * pBig);
    for (let i = 0; i < n; i++) {
      const fi = i * P;
      for (let a = 0; a < pBig; a++) {
        const v = F[fi + a] / n;
        if (v === 0) continue;
        const ga = a * pBig;
        for (let b = 0; b <= a; b++) G[ga + b] += v * F[fi + b];
      }
    }
  }

  const rows = r.widths.length * L * E;
  const out = emptyTable(rows);
  let row = 0;
  for (const N of r.widths) {
    const t0 = performance.now();
    const p = S + N;
    let pred: GdPredictions;
    if (n <= p) {
      growKernels(p);
      pred = kernelGdPredictions({ kernel: K!, n, testKernel: Kt!, m, labels: Y, L, epochs: r.epochs });
    } else {
      const H = new Float64Array(p * p);
      for (let a = 0; a < p; a++) H.set(G!.subarray(a * pBig, a * pBig + a + 1), a * p);
      pred = primalGdPredictions({ hessian: H, p, features: F, n, testFeatures: Ft, m, stride: P, labels: Y, L, epochs: r.epochs, inPlace: true });
    }
    const setup = (performance.now() - t0) / 1000;
    const EL = E * L;
    // Per (epoch, noise) column: wrong signs and squared error, in one contiguous pass per set.
    const te = performance.now();
    const testWrong = new Float64Array(EL);
    const testSq = new Float64Array(EL);
    for (let t = 0; t < m; t++) {
      const y = yTest[t];
      const o = t * EL;
      for (let col = 0; col < EL; col++) {
        const v = pred.test[o + col];
        if (v * y <= 0) testWrong[col]++;
        testSq[col] += (v - y) * (v - y);
      }
    }
    const trainWrong = new Float64Array(EL);
    const trainSq = new Float64Array(EL);
    for (let i = 0; i < n; i++) {
      const o = i * EL;
      for (let col = 0; col < EL; col++) {
        const v = pred.train[o + col];
        const y = Y[i * L + (col % L)];
        if (v * y <= 0) trainWrong[col]++;
        trainSq[col] += (v - y) * (v - y);
      }
    }
    // Measured time of the run: kernel growth, eigendecomposition, predictions and evaluation,
    // shared evenly by the noise levels (they share the decomposition). The closed form yields
    // every logged epoch at once, so the run's time is the same at each of them.
    const perRun = (setup + (performance.now() - te) / 1000) / L;
    for (let l = 0; l < L; l++) {
      const q = r.labelNoise[l];
      const run = `${r.runPrefix}-s${seed}-n${n}-w${N}-q${q}`;
      for (let e = 0; e < E; e++) {
        const col = e * L + l;
        out.run[row] = run;
        out.condition[row] = r.condition;
        out.seed[row] = seed;
        out.width[row] = N;
        out.epochs[row] = r.epochs[e];
        out.train_size[row] = n;
        out.label_noise[row] = q;
        out.test_error[row] = testWrong[col] / m;
        out.train_error[row] = trainWrong[col] / n;
        out.test_loss[row] = testSq[col] / m;
        out.train_loss[row] = trainSq[col] / n;
        out.wall_seconds[row] = r.measureTime ? perRun : NaN;
        row++;
      }
    }
    onRun?.();
  }
  return out;
}

interface FeatureShape {
  d: number;
  dimA: number;
  dimB: number;
  S: number;
  Nmax: number;
  slowScale: number;
}

/** Rows of [slowScale·ReLU(Ws·x_B/√dimB), ReLU(W·x_A/√dimA)] for the `rows` inputs in Z. */
function reluFeatures(Z: Float64Array, rows: number, W: Float64Array, Ws: Float64Array, sh: FeatureShape): Float64Array {
  const { d, dimA, dimB, S, Nmax, slowScale } = sh;
  const P = S + Nmax;
  const F = new Float64Array(rows * P);
  const sa = 1 / Math.sqrt(dimA);
  const sb = dimB > 0 ? slowScale / Math.sqrt(dimB) : 0;
  // Transposed weights so the inner loop runs along a contiguous row of F.
  const Wt = transpose(W, Nmax, dimA);
  const Wst = transpose(Ws, S, dimB);
  for (let i = 0; i < rows; i++) {
    const zi = i * d;
    const fi = i * P;
    for (let k = 0; k < dimB; k++) {
      const z = Z[zi + dimA + k] * sb;
      const wk = k * S;
      for (let j = 0; j < S; j++) F[fi + j] += z * Wst[wk + j];
    }
    for (let k = 0; k < dimA; k++) {
      const z = Z[zi + k] * sa;
      const wk = k * Nmax;
      const fo = fi + S;
      for (let j = 0; j < Nmax; j++) F[fo + j] += z * Wt[wk + j];
    }
    for (let j = 0; j < P; j++) if (F[fi + j] < 0) F[fi + j] = 0;
  }
  return F;
}

function transpose(A: Float64Array, r: number, c: number): Float64Array {
  const out = new Float64Array(r * c);
  for (let i = 0; i < r; i++) for (let j = 0; j < c; j++) out[j * r + i] = A[i * c + j];
  return out;
}
