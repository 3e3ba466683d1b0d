import type { Cell } from '../cells/Cell.js';
import { curveNoise } from './curveNoise.js';
import type { Rng } from './seededRng.js';
import { medianSorted } from './quantile.js';

/** Means of a series and the standard error of a difference between two of them. */
export interface SeriesView {
  means: Float64Array;
  /** Standard error of means[i] − means[j]. */
  pairSe(i: number, j: number): number;
}

/** The noise model of one 1-D series of cells (a map row or a train-size slice). */
export interface SeriesNoise extends SeriesView {
  /** seeds: from the spread across seeds; curve: from the curve's own roughness. */
  from: 'seeds' | 'curve';
  /** Pooled per-seed standard deviation (seeds) or the noise of one point of the curve (curve). */
  sd: number;
  /** Degrees of freedom behind `sd` when it comes from seeds (0 for curve). */
  df: number;
  /** Writes one bootstrap replicate of the series means into `out`. */
  replicate(rng: Rng, out: Float64Array): void;
  /**
   * A simulated series of pure noise with the same seeds per cell, analysed exactly like the
   * observed one (its own sds, floor and pair SEs, or its own curve-noise estimate), so a
   * statistic in SE units computed on it has the null distribution of the observed statistic.
   */
  nullSeries(rng: Rng): SeriesView;
  /**
   * What nullSeries depends on (seeds per cell, or the coordinates for a curve estimate): noise
   * models with equal keys have the same null distribution, so one simulation can serve them all.
   */
  nullKey: string;
}

/** Per-cell n, mean, sd → pooled sd, df and the pair standard error rule. */
function seedView(n: ArrayLike<number>, means: Float64Array, sds: ArrayLike<number>): SeriesView & { sd: number; df: number; floor: number } {
  let ss = 0;
  let df = 0;
  // Runs once per simulated null series (rows × rounds): a typed array sorted numerically
  // (same order as a comparator sort for finite values), no per-call array growth.
  const withSd = new Float64Array(n.length);
  let m = 0;
  for (let i = 0; i < n.length; i++) {
    if (n[i] >= 2 && Number.isFinite(sds[i])) {
      ss += (n[i] - 1) * sds[i] ** 2;
      df += n[i] - 1;
      withSd[m++] = sds[i];
    }
  }
  const sorted = withSd.subarray(0, m).sort();
  // The floor for any one cell's sd is the median cell sd, not the pooled one: near the
  // interpolation threshold errors are heavy-tailed, and one wild cell must not swamp the rest.
  const floor = m ? medianSorted(sorted) : NaN;
  const f2 = floor * floor;
  return {
    means,
    sd: Math.sqrt(ss / df),
    df,
    floor,
    pairSe(i, j) {
      const dfPair = (n[i] >= 2 ? n[i] - 1 : 0) + (n[j] >= 2 ? n[j] - 1 : 0);
      const pair = dfPair > 0 ? ((n[i] >= 2 ? (n[i] - 1) * sds[i] ** 2 : 0) + (n[j] >= 2 ? (n[j] - 1) * sds[j] ** 2 : 0)) / dfPair : 0;
      return Math.sqrt(Math.max(pair, f2) * (1 / n[i] + 1 / n[j]));
    },
  };
}

function curveView(u: ArrayLike<number>, means: Float64Array): SeriesView & { sd: number } {
  const sd = curveNoise(u, means);
  return { means, sd, pairSe: () => sd * Math.SQRT2 };
}

/**
 * Builds the noise model of a series of cells (ordered along the axis, finite means only; `u`
 * its transformed coordinates). With at least two degrees of freedom across seeds, two cells are
 * compared with their own pooled variance, but never less than the series' median cell variance
 * (two or three seeds alone can look deceptively tight). Otherwise (single-seed curves, typical
 * of epoch-wise logs) the noise comes from the curve itself (curveNoise). Bootstrap replicates
 * resample seeds within each cell; a single-seed cell (or every point, for a curve estimate)
 * gets Gaussian noise of the estimated size instead.
 */
export function seriesNoise(cells: readonly Cell[], u: ArrayLike<number>): SeriesNoise {
  const L = cells.length;
  const n = Float64Array.from(cells, (c) => c.stats.n);
  const means = Float64Array.from(cells, (c) => c.stats.mean);
  let df = 0;
  for (const k of n) if (k >= 2) df += k - 1;
  if (df >= 2) {
    const view = seedView(n, means, cells.map((c) => c.stats.sd));
    const finiteValues = cells.map((c) => c.values.filter((v) => Number.isFinite(v)));
    const inflate = finiteValues.map((v) => (v.length >= 2 ? Math.sqrt(v.length / (v.length - 1)) : 1));
    return {
      from: 'seeds',
      sd: view.sd,
      df: view.df,
      means,
      pairSe: view.pairSe,
      nullKey: `seeds:${n.join(',')}`,
      nullSeries(rng) {
        // Homoscedastic unit Gaussian seeds: the SE-scaled statistics are scale-free.
        const m = new Float64Array(L);
        const s = new Float64Array(L);
        for (let i = 0; i < L; i++) {
          let a = 0;
          let b = 0;
          for (let k = 0; k < n[i]; k++) {
            const z = rng.normal();
            a += z;
            b += z * z;
          }
          m[i] = a / n[i];
          s[i] = n[i] >= 2 ? Math.sqrt(Math.max(0, (b - n[i] * m[i] * m[i]) / (n[i] - 1))) : NaN;
        }
        return seedView(n, m, s);
      },
      replicate(rng, out) {
        for (let i = 0; i < L; i++) {
          const v = finiteValues[i];
          if (v.length < 2) {
            out[i] = means[i] + view.floor * rng.normal();
            continue;
          }
          let s = 0;
          for (let k = 0; k < v.length; k++) s += v[rng.int(v.length)];
          // Resampled means spread by sd·sqrt((n−1)/n)/sqrt(n); widen back to the unbiased spread
          // (the expanded bootstrap, Hesterberg 2015), which matters with 3–5 seeds.
          out[i] = means[i] + (s / v.length - means[i]) * inflate[i];
        }
      },
    };
  }
  const view = curveView(u, means);
  return {
    from: 'curve',
    sd: view.sd,
    df: 0,
    means,
    pairSe: view.pairSe,
    nullKey: `curve:${Array.from(u).join(',')}`,
    nullSeries(rng) {
      const m = new Float64Array(L);
      for (let i = 0; i < L; i++) m[i] = rng.normal();
      return curveView(u, m);
    },
    replicate(rng, out) {
      for (let i = 0; i < L; i++) out[i] = means[i] + view.sd * rng.normal();
    },
  };
}
