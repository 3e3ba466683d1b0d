import type { Cell } from '../cells/Cell.js';
import { correctionName } from './correctionName.js';
import type { CorrectionSpelling } from './correctionName.js';
import type { SweepMap } from '../grid/SweepMap.js';
import { axisTransform } from '../grid/axisScale.js';
import { thresholdCrossing } from './findThreshold.js';
import { localPeaks } from './localPeaks.js';
import type { LocalPeak } from './localPeaks.js';
import { parabolaVertex } from './parabolaVertex.js';
import { adjustedAs } from './benjaminiHochberg.js';
import { curveLocationDraws, curveModel, curveSearchP, percentileInterval } from './curvePeaks.js';
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
  /**
   * Single-value curves (one seed, or means with no spread): smallest rise and smallest fall of
   * a peak along the smoothed curve, in octaves of x, measured at half the prominence (default 0.25).
   */
  minExtent?: number;
  /** Fixed smoothing bandwidth (octaves) for single-value curves; cross-validated when absent. */
  bandwidth?: number;
  /**
   * Correction across the rows scanned (default Benjamini–Hochberg 1995, false discovery rate at
   * `alpha`); 'none' judges each row alone.
   */
  correction?: CorrectionSpelling;
}

/** Default smallest rise and fall of a curve peak, in octaves. */
export const DEFAULT_MIN_EXTENT = 0.25;
/** Fewest points for the smoothed-curve model (fewer: the cells' own peak rule with curve noise). */
const CURVE_MIN_POINTS = 8;

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
 *
 * A row with one value per point (one seed, or means with no seed spread) and at least 8 points
 * takes the smoothed-curve model instead (curveModel: peaks of the curve smoothed on the log
 * axis whose rise and fall each span `minExtent` octaves at half prominence, significance
 * against the same procedure on resampled noise, interval by residual block bootstrap).
 * Significance is corrected across the rows scanned (Benjamini–Hochberg, `correction`).
 */
export function findRidge(map: RidgeMap, opts: RidgeOptions = {}): RidgeResult {
  const minProminence = opts.minProminence ?? 2;
  const boot = Math.max(0, Math.floor(opts.boot ?? 1000));
  const seed = opts.seed ?? 1;
  const epsilon = opts.epsilon ?? 0.01;
  const level = opts.level ?? 0.95;
  const alpha = opts.alpha ?? 0.05;
  const nullRounds = Math.max(0, Math.floor(opts.nullRounds ?? 1000));
  const minExtent = opts.minExtent ?? DEFAULT_MIN_EXTENT;
  const correction = correctionName(opts.correction ?? 'benjamini-hochberg');
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

  // Pass 1: per row, the candidate peaks with their prominence in SE and search-wide p.
  interface Candidate {
    z: number;
    p: number;
    prominence: number;
    /** The peak with the given location interval (transformed units of the row's model). */
    toPeak(low: number, high: number, p: number, pAdjusted?: number): Peak;
    /** Sorted bootstrap locations, and the estimate they are centred on. */
    draws(): { est: number; d: Float64Array };
  }
  interface RowWork {
    row: RidgeRow;
    candidates: Candidate[];
    /** Data units of the model's location axis. */
    from: (u: number) => number;
    /** The row had enough points to look for a peak (a member of the multiple-testing family). */
    scanned: boolean;
  }
  const work: RowWork[] = ys.map((y) => {
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
    const row: RidgeRow = { y, peak: null, others: [], threshold, thresholdAtEdge: crossing?.atEdge ?? false, ratio: null, noiseFrom: noise.from, noiseSd: noise.sd, insideNoise: null, model: 'cells' };
    // One bootstrap stream per row, seeded by the row's y value (not its position): the same seed
    // gives a row the same interval whatever other rows the map holds.
    const rng = seededRng(deriveSeed(seed, hashKey(`y=${y}`)));
    if (pts.length < 3) return { row, candidates: [], from: tx.from, scanned: false };

    const onLog = pts.filter((p) => p.x > 0);
    if (noise.from === 'curve' && onLog.length >= CURVE_MIN_POINTS) return curveRow(row, onLog, rng);

    const zOf = (lp: LocalPeak) => zIn(noise, lp);
    const scored = localPeaks(means).map((lp) => ({ lp, z: zOf(lp), p: NaN }));
    const tall = scored.filter((s) => s.z >= minProminence);
    if (tall.length > 0 && alpha < 1 && nullRounds > 0 && Number.isFinite(noise.sd)) {
      // Look-elsewhere check: the tallest of a row's several noise bumps clears 2 SE far more
      // often than one comparison would; compare with the tallest bump of simulated flat rows.
      const pOf = searchWide(noise);
      for (const s of tall) s.p = pOf(s.z);
    }
    const rep = new Float64Array(means.length);
    const candidates: Candidate[] = scored.map((s) => ({
      z: s.z,
      p: s.p,
      prominence: s.lp.prominence,
      toPeak: (low, high, p, pAdjusted) => ({
        x: tx.from(refine(u, means, s.lp.index)),
        low: tx.from(low),
        high: tx.from(high),
        error: means[s.lp.index],
        prominence: s.lp.prominence,
        prominenceSe: s.z,
        cellX: pts[s.lp.index].x,
        seeds: cells[s.lp.index].stats.n,
        ...(Number.isNaN(p) ? {} : { p }),
        ...(pAdjusted === undefined || Number.isNaN(pAdjusted) ? {} : { pAdjusted }),
      }),
      draws: () => {
        const d = new Float64Array(boot);
        const hi = s.lp.rightBase >= 0 ? s.lp.rightBase : means.length - 1;
        for (let b = 0; b < boot; b++) {
          noise.replicate(rng, rep);
          d[b] = locateIn(u, rep, s.lp.leftBase, hi);
        }
        return { est: refine(u, means, s.lp.index), d: d.sort() };
      },
    }));
    return { row, candidates, from: tx.from, scanned: true };
  });

  /** A single-value curve (one seed, or means with no spread): the smoothed-curve model on the log axis. */
  function curveRow(row: RidgeRow, pts: { x: number; cell: Cell }[], rng: ReturnType<typeof seededRng>): RowWork {
    const u = pts.map((p) => Math.log2(p.x));
    const y = pts.map((p) => p.cell.stats.mean);
    const model = curveModel(u, y, { minExtent, bandwidth: opts.bandwidth });
    row.model = 'smoothed-curve';
    row.noiseSd = model.sd;
    row.bandwidth = model.smoother.bandwidth;
    row.smooth = { x: Array.from(model.smoother.u, (v) => 2 ** v), y: Array.from(model.fit) };
    const ps = model.peaks.map(() => NaN);
    if (model.peaks.some((pk) => pk.z >= minProminence) && alpha < 1 && nullRounds > 0 && Number.isFinite(model.sd)) {
      const pOf = curveSearchP(model, { rounds: nullRounds, rng, minExtent });
      model.peaks.forEach((pk, i) => (ps[i] = pOf(pk.z)));
    }
    const nearest = (v: number) => pts.reduce((a, b) => (Math.abs(Math.log2(b.x) - v) < Math.abs(Math.log2(a.x) - v) ? b : a));
    const candidates: Candidate[] = model.peaks.map((pk, i) => ({
      z: pk.z,
      p: ps[i],
      prominence: pk.prominence,
      toPeak: (low, high, p, pAdjusted) => {
        const cell = nearest(pk.u);
        return {
          x: 2 ** pk.u,
          low: 2 ** low,
          high: 2 ** high,
          error: pk.fitted,
          prominence: pk.prominence,
          prominenceSe: pk.z,
          cellX: cell.x,
          seeds: cell.cell.stats.n,
          smoothed: true,
          rise: pk.rise,
          fall: pk.fall,
          ...(Number.isNaN(p) ? {} : { p }),
          ...(pAdjusted === undefined || Number.isNaN(pAdjusted) ? {} : { pAdjusted }),
        };
      },
      draws: () => ({ est: pk.u, d: curveLocationDraws(model, pk, { boot, rng }) }),
    }));
    return { row, candidates, from: (v) => 2 ** v, scanned: true };
  }

  // Multiple testing across the rows scanned: Benjamini–Hochberg on each row's smallest p (the
  // search-wide p of its tallest bump); rows that were scanned but had nothing to test count as p = 1.
  const scanned = work.filter((w) => w.scanned);
  const scannedRows = scanned.length;
  const family = scanned.map((w) => Math.min(1, ...w.candidates.filter((c) => c.z >= minProminence && Number.isFinite(c.p)).map((c) => c.p)));
  const adjust = (p: number, at: number) => (correction === 'none' || Number.isNaN(p) || at < 0 ? p : adjustedAs(p, family, at));

  const rows: RidgeRow[] = work.map((w) => {
    const { row, candidates } = w;
    const at = scanned.indexOf(w);
    const scored = candidates.map((c) => ({ c, pAdj: adjust(c.p, at) }));
    const passes = (s: { c: Candidate; pAdj: number }) => s.c.z >= minProminence && !(s.pAdj >= alpha);
    const significant = scored.filter(passes).sort((a, b) => b.c.prominence - a.c.prominence);
    if (significant.length === 0) {
      const best = [...scored].sort((a, b) => b.c.z - a.c.z)[0];
      if (best) {
        const pk = best.c.toPeak(0, 0, best.c.p, best.pAdj);
        row.insideNoise = { ...pk, low: pk.cellX, high: pk.cellX };
      }
      return row;
    }
    const peaks = significant.map((s) => {
      if (boot === 0) {
        const pk = s.c.toPeak(0, 0, s.c.p, s.pAdj);
        return { ...pk, low: pk.x, high: pk.x };
      }
      const { est, d } = s.c.draws();
      const { low, high } = percentileInterval(d, est, level);
      return s.c.toPeak(low, high, s.c.p, s.pAdj);
    });
    row.peak = peaks[0];
    row.others = peaks.slice(1);
    row.ratio = row.threshold === null ? null : row.peak.x / row.threshold;
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
    correction,
    rowsScanned: scannedRows,
    minExtent,
    rows,
  };
}
