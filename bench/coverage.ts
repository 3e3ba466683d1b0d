/**
 * Coverage of the 95% location intervals and the false-peak rate, on simulated sweeps with known
 * truth (a measurement, not a test; figures go to BENCHMARKS.md):
 *
 *   npx tsx bench/coverage.ts [--reps 300] [--boot 400] [--null 200] [--only NAME-PART]
 *
 * Sweeps (invented curves with known maxima, not the random-features simulator, whose mean over
 * infinitely many seeds is not known in closed form):
 * - ridge, 3 seeds: 13 widths 4..256 in half-octave steps, a falling baseline with a Gaussian bump
 *   in log2 width (maximum at log2 width 5.49), Gaussian seed noise sd 0.02;
 * - ridge, 1 seed (curve bootstrap): 200 epochs log-spaced over 1..1e5, error falling to a
 *   minimum then a broad bump (maximum near epoch 300), per-epoch evaluation noise sd 0.01 with 1% spikes;
 * - hurts, 3 seeds and 1 seed: 10 train sizes 100..51,200, a rise from the minimum at n = 800 to
 *   a peak at n = 3,200, seed noise sd 0.01 (onset interval against the true onset, n = 800);
 * - false peaks: the same designs with the bump removed (flat, and monotone decreasing).
 */
import { findHurts } from '../src/analysis/findHurts.js';
import { findRidge } from '../src/analysis/findRidge.js';
import { mulberry32 } from '../src/random/mulberry32.js';
import type { Cell } from '../src/cells/Cell.js';
import { makeCell, makeMap } from '../test/analysis/makeCell.js';

const arg = (name: string, d: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : d;
};
const reps = arg('reps', 300);
const boot = arg('boot', 400);
const nullRounds = arg('null', 200);
const onlyAt = process.argv.indexOf('--only');
const only = onlyAt > 0 ? process.argv[onlyAt + 1] : '';
const want = (name: string) => !only || name.includes(only);

const u01 = mulberry32(20261204);
const z = () => Math.sqrt(-2 * Math.log(1 - u01())) * Math.cos(2 * Math.PI * u01());

const XS = Array.from({ length: 13 }, (_, i) => 2 ** (2 + i / 2));
const u0 = Math.log2(45);
const widthCurve = (u: number) => 0.3 - 0.01 * (u - 2) + 0.08 * Math.exp(-((u - u0) ** 2) / 2);
const argmax = (f: (u: number) => number, a: number, b: number) => {
  let best = -Infinity;
  let at = a;
  for (let u = a; u <= b; u += 1e-4) if (f(u) > best) [best, at] = [f(u), u];
  return at;
};
const widthTruth = argmax(widthCurve, 2, 8);

const EPOCHS = Array.from({ length: 200 }, (_, i) => Math.round(10 ** ((5 * i) / 199) * 1000) / 1000);
const epochCurve = (u: number) => 0.2 + 0.5 * 2 ** (-u / 1.5) + 0.06 * Math.exp(-((u - Math.log2(300)) ** 2) / (2 * 1.2 ** 2));
// The bump's local maximum (the curve's global maximum is at epoch 1).
const epochTruth = argmax(epochCurve, 6, 12);

function ridgeRow(curve: (u: number) => number, xs: number[], seeds: number, sd: number, spikes = 0): ReturnType<typeof makeMap> {
  const cells = xs.map((x) => makeCell({ width: x, epochs: x }, Array.from({ length: seeds }, () => curve(Math.log2(x)) + sd * z() + (u01() < spikes ? sd * (3 + 7 * u01()) : 0))));
  return makeMap({ xs, rows: [{ y: 1, cells }] });
}

function coverage(name: string, curve: (u: number) => number, truth: number, xs: number[], seeds: number, sd: number, spikes = 0) {
  if (!want(name)) return null;
  let found = 0;
  let covered = 0;
  let width = 0;
  for (let t = 0; t < reps; t++) {
    const pk = findRidge(ridgeRow(curve, xs, seeds, sd, spikes), { boot, nullRounds, seed: t + 1 }).rows[0].peak;
    if (!pk) continue;
    found++;
    width += Math.log2(pk.high) - Math.log2(pk.low);
    if (Math.log2(pk.low) <= truth && truth <= Math.log2(pk.high)) covered++;
  }
  return { name, reps, found, covered: covered / found, meanWidthOctaves: width / found };
}

function falsePeaks(name: string, curve: (u: number) => number, xs: number[], seeds: number, sd: number, spikes = 0) {
  if (!want(name)) return null;
  let found = 0;
  for (let t = 0; t < reps; t++) if (findRidge(ridgeRow(curve, xs, seeds, sd, spikes), { boot: 0, nullRounds, seed: t + 1 }).rows[0].peak) found++;
  return { name, reps, rate: found / reps };
}

const SIZES = Array.from({ length: 10 }, (_, i) => 100 * 2 ** i);
const hurtsCurve = (n: number) => {
  const u = Math.log2(n / 800);
  return u <= 0 ? 0.3 - 0.03 * u : u <= 2 ? 0.3 + 0.04 * Math.sin((Math.PI / 4) * u) ** 2 : 0.34 - 0.03 * (u - 2);
};
function hurtsCoverage(name: string, seeds: number, sd: number) {
  if (!want(name)) return null;
  let found = 0;
  let covered = 0;
  for (let t = 0; t < reps; t++) {
    const cells: Cell[] = SIZES.map((n) => makeCell({ train_size: n }, Array.from({ length: seeds }, () => hurtsCurve(n) + sd * z())));
    const seg = findHurts(cells, { boot, nullRounds, seed: t + 1 }).segments[0];
    if (!seg || seg.onsetLow === undefined) continue;
    found++;
    if (seg.onsetLow <= 800 && 800 <= seg.onsetHigh!) covered++;
  }
  return { name, reps, found, covered: covered / found };
}

const started = performance.now();
const rows = [
  coverage('ridge, 3 seeds per cell (seed bootstrap)', widthCurve, widthTruth, XS, 3, 0.02),
  coverage('ridge, 1 seed, 200-epoch curve (curve bootstrap)', epochCurve, epochTruth, EPOCHS, 1, 0.01, 0.01),
  hurtsCoverage('hurts onset, 3 seeds per cell', 3, 0.01),
  hurtsCoverage('hurts onset, 1 seed per cell', 1, 0.01),
];
const fp = [
  falsePeaks('flat, 3 seeds', () => 0.3, XS, 3, 0.02),
  falsePeaks('decreasing, 3 seeds', (u) => 0.1 + 0.4 * 2 ** (-(u - 2) / 2), XS, 3, 0.02),
  falsePeaks('flat, 1 seed, 200-epoch curve with spikes', () => 0.3, EPOCHS, 1, 0.01, 0.01),
  falsePeaks('decreasing, 1 seed, 200-epoch curve with spikes', (u) => 0.2 + 0.5 * 2 ** (-u / 1.5), EPOCHS, 1, 0.01, 0.01),
];
console.log(JSON.stringify({ reps, boot, nullRounds, seconds: (performance.now() - started) / 1000, coverage: rows.filter(Boolean), falsePeaks: fp.filter(Boolean) }, null, 1));
