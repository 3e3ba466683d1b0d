import type { Cell } from '../cells/Cell.js';
import { curveNoise } from './curveNoise.js';
import type { Rng } from './seededRng.js';

/** The noise model of one 1-D series of cells (a map row or a train-size slice). */
export interface SeriesNoise {
  /** seeds: from the spread across seeds (pooled over the series); curve: from the curve's own roughness. */
  from: 'seeds' | 'curve';
  /** Pooled per-seed standard deviation (seeds) or the noise of one point of the curve (curve). */
  sd: number;
  /** Degrees of freedom behind `sd` when it comes from seeds (0 for curve). */
  df: number;
  /** Standard error of mean[i] − mean[j]. */
  pairSe(i: number, j: number): number;
  /** Writes one bootstrap replicate of the series means into `out`. */
  replicate(rng: Rng, out: Float64Array): void;
  /** Writes one replicate of pure noise (a flat curve at 0) with the same per-cell noise into `out`. */
  nullReplicate(rng: Rng, out: Float64Array): void;
}

/**
 * Builds the noise model of a series of cells (ordered along the axis, finite means only; `u`
 * its transformed coordinates). With at least two degrees of freedom across seeds, the pooled
 * within-cell variance of the series is used: two cells are compared with their own pooled
 * variance but never less than the series' (two or three seeds alone can look deceptively
 * tight). Otherwise (single-seed curves, typical of epoch-wise logs) the noise comes from the
 * curve itself (curveNoise). Bootstrap replicates resample seeds within each cell; a single-seed
 * cell (or every point, for a curve estimate) gets Gaussian noise of the estimated size instead.
 */
export function seriesNoise(cells: readonly Cell[], u: readonly number[]): SeriesNoise {
  let ss = 0;
  let df = 0;
  for (const c of cells) {
    if (c.stats.n >= 2 && Number.isFinite(c.stats.sd)) {
      ss += (c.stats.n - 1) * c.stats.sd ** 2;
      df += c.stats.n - 1;
    }
  }
  const means = cells.map((c) => c.stats.mean);
  if (df >= 2) {
    const s2 = ss / df;
    const sd = Math.sqrt(s2);
    const finiteValues = cells.map((c) => c.values.filter((v) => Number.isFinite(v)));
    const inflate = finiteValues.map((v) => (v.length >= 2 ? Math.sqrt(v.length / (v.length - 1)) : 1));
    return {
      from: 'seeds',
      sd,
      df,
      pairSe(i, j) {
        const a = cells[i].stats;
        const b = cells[j].stats;
        const dfPair = (a.n >= 2 ? a.n - 1 : 0) + (b.n >= 2 ? b.n - 1 : 0);
        const pair = dfPair > 0 ? ((a.n >= 2 ? (a.n - 1) * a.sd ** 2 : 0) + (b.n >= 2 ? (b.n - 1) * b.sd ** 2 : 0)) / dfPair : 0;
        return Math.sqrt(Math.max(pair, s2) * (1 / a.n + 1 / b.n));
      },
      nullReplicate(rng, out) {
        for (let i = 0; i < cells.length; i++) out[i] = (Math.max(sd, cells[i].stats.n >= 2 ? cells[i].stats.sd : 0) / Math.sqrt(cells[i].stats.n)) * rng.normal();
      },
      replicate(rng, out) {
        for (let i = 0; i < cells.length; i++) {
          const v = finiteValues[i];
          if (v.length < 2) {
            out[i] = means[i] + sd * rng.normal();
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
  const sd = curveNoise(u, means);
  return {
    from: 'curve',
    sd,
    df: 0,
    pairSe: () => sd * Math.SQRT2,
    nullReplicate(rng, out) {
      for (let i = 0; i < cells.length; i++) out[i] = sd * rng.normal();
    },
    replicate(rng, out) {
      for (let i = 0; i < cells.length; i++) out[i] = means[i] + sd * rng.normal();
    },
  };
}
