import type { Cell } from '../cells/Cell.js';
import type { SweepMap } from '../grid/SweepMap.js';
import { axisTransform } from '../grid/axisScale.js';
import { thresholdCrossing } from './findThreshold.js';
import { localPeaks } from './localPeaks.js';
import type { LocalPeak } from './localPeaks.js';
import { parabolaVertex } from './parabolaVertex.js';
import { quantileSorted } from './quantile.js';
import { searchWideP } from './searchWideP.js';
import type { Peak, RidgeResult, RidgeRow } from './Ridge.js';
import { deriveSeed, seededRng } from './seededRng.js';
import { seriesNoise } from './seriesNoise.js';
import type { SeriesView } from './seriesNoise.js';

export interface RidgeOptions {
  /** Smallest prominence, in pooled standard errors of the peak-minus-base difference, that counts as a peak (default 2). */
  minProminence?: number;
  /** Bootstrap rounds for the location interval (default 1000). */
  boot?: number;
  /** Seed of the bootstrap's random stream (default 1). */
  seed?: number;
  /** Train-error level of the interpolation threshold (default 0.01). */
  epsilon?: number;
  /** Coverage of the location interval (default 0.95). */
  level?: number;
  /**
   * Search-wide significance level (default 0.05): a peak must also beat the largest prominence
   * that pure noise produces anywhere along the row in `nullRounds` simulated rows. 1 turns it off.
   */
  alpha?: number;
  /** Simulated pure-noise rows for that check (default 1000). */
  nullRounds?: number;
}

type RidgeMap = Pick<SweepMap, 'kind' | 'x' | 'y' | 'cells' | 'fixed' | 'metric'>;

/** Prominence in standard errors of the peak-minus-base difference. */
function zIn(v: SeriesView, lp: LocalPeak): number {
  const se = v.pairSe(lp.index, lp.keyBase);
  return se > 0 ? lp.prominence / se : lp.prominence > 0 ? Infinity : 0;
}

/** The tallest bump of a series in SE units: the statistic of the look-elsewhere check. */
function tallestZ(v: SeriesView): number {
  let best = 0;
  for (const lp of localPeaks(v.means)) best = Math.max(best, zIn(v, lp));
  return best;
}

/** FNV-1a of a string: a 32-bit number for seeding a random stream from a noise shape. */
function hashKey(key: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < key.length; i++) h = Math.imul(h ^ key.charCodeAt(i), 0x01000193);
  return h >>> 0;
}

/** Peak location in transformed x: parabola through the cell and its two neighbours, clipped to that bracket. */
function refine(u: readonly number[], m: ArrayLike<number>, k: number): number {
  if (k <= 0 || k >= u.length - 1) return u[k];
  return parabolaVertex(u[k - 1], m[k - 1], u[k], m[k], u[k + 1], m[k + 1]);
}

/** Location of the maximum of `m` inside [lo, hi], refined like the estimate itself. */
function locateIn(u: readonly number[], m: ArrayLike<number>, lo: number, hi: number): number {
  let k = lo;
  for (let i = lo + 1; i <= hi; i++) if (m[i] > m[k]) k = i;
  return refine(u, m, k);
}

/**
 * The double-descent ridge of a map: per row y, the significant intermediate peaks of the
 * metric along x. A peak is a local maximum of the cell means with lower error somewhere on
 * both sides and a prominence (height over the higher of its two flanking minima) of at least
 * `minProminence` pooled standard errors, and taller than pure noise gets anywhere along the row
 * (search-wide level `alpha`) — never simply the row's maximum, which in under-fitted
 * small models often sits at the left edge. Its location is refined by a parabola in transformed
 * x, and its interval is a percentile bootstrap over seeds. Rows without a significant peak get
 * `peak: null`. The threshold is where mean train error first reaches `epsilon`.
 */
export function findRidge(map: RidgeMap, opts: RidgeOptions = {}): RidgeResult {
  const minProminence = opts.minProminence ?? 2;
  const boot = Math.max(0, Math.floor(opts.boot ?? 1000));
  const seed = opts.seed ?? 1;
  const epsilon = opts.epsilon ?? 0.01;
  const level = opts.level ?? 0.95;
  const alpha = opts.alpha ?? 0.05;
  const nullRounds = Math.max(0, Math.floor(opts.nullRounds ?? 1000));
  const tx = axisTransform(map.x.scale);
  const direction = map.x.name === 'train_size' ? 'last-below' : 'first-below';

  const byY = new Map<number, { x: number; cell: Cell }[]>();
  for (const mc of map.cells) {
    let row = byY.get(mc.y);
    if (!row) byY.set(mc.y, (row = []));
    row.push({ x: mc.x, cell: mc.cell });
  }
  const ys = [...new Set([...map.y.values, ...byY.keys()])].sort((a, b) => a - b);
  // Rows with the same noise shape (seeds per cell, or coordinates for curve noise) share one
  // simulated null distribution (the simulation dominated the run time, 71 rows × 1,000 rows of
  // noise). Its random stream is seeded by the shape, so a row's p-value does not depend on
  // which other rows exist or come first.
  const nullByShape = new Map<string, (observed: number) => number>();
  const searchWide = (noise: ReturnType<typeof seriesNoise>) => {
    let pOf = nullByShape.get(noise.nullKey);
    if (!pOf) {
      const rng = seededRng(deriveSeed(seed ^ 0x27d4eb2f, hashKey(noise.nullKey)));
      pOf = searchWideP({ noise, rounds: nullRounds, rng, maxStat: tallestZ });
      nullByShape.set(noise.nullKey, pOf);
    }
    return pOf;
  };

  const rows: RidgeRow[] = ys.map((y, rowIndex) => {
    const all = (byY.get(y) ?? []).filter((p) => Number.isFinite(tx.to(p.x))).sort((a, b) => a.x - b.x);
    const crossing = thresholdCrossing(
      all.map((p) => tx.to(p.x)),
      all.map((p) => p.cell.train?.mean ?? NaN),
      { epsilon, direction },
    );
    const threshold = crossing === null ? null : tx.from(crossing.u);
    const pts = all.filter((p) => p.cell.stats.n > 0 && Number.isFinite(p.cell.stats.mean));
    const u = pts.map((p) => tx.to(p.x));
    const cells = pts.map((p) => p.cell);
    const means = cells.map((c) => c.stats.mean);
    const noise = seriesNoise(cells, u);
    const row: RidgeRow = { y, peak: null, others: [], threshold, thresholdAtEdge: crossing?.atEdge ?? false, ratio: null, noiseFrom: noise.from, noiseSd: noise.sd, insideNoise: null };
    if (pts.length < 3) return row;

    const zOf = (lp: LocalPeak) => zIn(noise, lp);
    const scored = localPeaks(means).map((lp) => ({ lp, z: zOf(lp), p: NaN }));
    // One bootstrap stream per row: the same seed gives the same answer whatever other rows exist.
    const rng = seededRng(deriveSeed(seed, rowIndex));
    const rep = new Float64Array(means.length);
    const tall = scored.filter((s) => s.z >= minProminence);
    if (tall.length > 0 && alpha < 1 && nullRounds > 0 && Number.isFinite(noise.sd)) {
      // Look-elsewhere check: the tallest of a row's several noise bumps clears 2 SE far more
      // often than one comparison would; compare with the tallest bump of simulated flat rows.
      const pOf = searchWide(noise);
      for (const s of tall) s.p = pOf(s.z);
    }
    const passes = (s: { z: number; p: number }) => s.z >= minProminence && !(s.p >= alpha);
    const significant = scored.filter(passes).sort((a, b) => b.lp.prominence - a.lp.prominence);
    const toPeak = (lp: LocalPeak, z: number, p: number, low: number, high: number): Peak => ({
      x: tx.from(refine(u, means, lp.index)),
      low: tx.from(low),
      high: tx.from(high),
      error: means[lp.index],
      prominence: lp.prominence,
      prominenceSe: z,
      cellX: pts[lp.index].x,
      seeds: cells[lp.index].stats.n,
      ...(Number.isNaN(p) ? {} : { p }),
    });
    if (significant.length === 0) {
      const best = scored.sort((a, b) => b.z - a.z)[0];
      if (best) {
        const k = best.lp.index;
        row.insideNoise = toPeak(best.lp, best.z, best.p, u[k], u[k]);
      }
      return row;
    }

    const draws = significant.map(() => new Float64Array(boot));
    for (let b = 0; b < boot; b++) {
      noise.replicate(rng, rep);
      significant.forEach((s, j) => {
        const hi = s.lp.rightBase >= 0 ? s.lp.rightBase : means.length - 1;
        draws[j][b] = locateIn(u, rep, s.lp.leftBase, hi);
      });
    }
    const peaks = significant.map((s, j) => {
      const d = draws[j].sort();
      const est = refine(u, means, s.lp.index);
      // Percentile interval, widened if need be to hold the estimate itself (a skewed bootstrap
      // can leave it outside, which would read as a contradiction).
      const low = boot > 0 ? Math.min(est, quantileSorted(d, (1 - level) / 2)) : est;
      const high = boot > 0 ? Math.max(est, quantileSorted(d, 1 - (1 - level) / 2)) : est;
      return toPeak(s.lp, s.z, s.p, low, high);
    });
    row.peak = peaks[0];
    row.others = peaks.slice(1);
    row.ratio = threshold === null ? null : row.peak.x / threshold;
    return row;
  });

  return {
    map: map.kind,
    x: map.x.name,
    y: map.y.name,
    metric: map.metric,
    fixed: map.fixed,
    minProminence,
    epsilon,
    boot,
    seed,
    level,
    alpha,
    rows,
  };
}
