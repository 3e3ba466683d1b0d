import type { Cell } from '../cells/Cell.js';
import { correctionName } from './correctionName.js';
import type { CorrectionSpelling } from './correctionName.js';
import { analysisText } from '../messages.js';
import { usageError } from '../UserError.js';
import { adjustedAs } from './benjaminiHochberg.js';
import type { HurtsResult, HurtsSegment } from './Hurts.js';
import { localPeaks } from './localPeaks.js';
import { searchWideP } from './searchWideP.js';
import { deriveSeed, seededRng } from './seededRng.js';
import type { Rng } from './seededRng.js';
import { seriesNoise } from './seriesNoise.js';
import type { SeriesNoise, SeriesView } from './seriesNoise.js';
import { welchTest } from './welchTest.js';

export interface HurtsOptions {
  /** Fix some of width, epochs, label_noise, condition; the others are scanned. */
  at?: Record<string, number | string>;
  /** Significance level of a rise (default 0.05). */
  alpha?: number;
  /** Bootstrap rounds when a compared cell has a single seed (default 1000). */
  boot?: number;
  /** Seed of the bootstrap's random stream (default 1). */
  seed?: number;
  /**
   * Simulated pure-noise slices for the search-wide check (default 1000; 0 turns it off): a rise
   * must also be taller, in SE, than the tallest rise noise alone produces anywhere along the slice.
   */
  nullRounds?: number;
  /**
   * Correction across the slices scanned (default Benjamini–Hochberg 1995: false discovery rate
   * at `alpha`); 'none' judges each slice alone.
   */
  correction?: CorrectionSpelling;
  /** Coverage of the onset interval (default 0.95). */
  level?: number;
}

/**
 * Onset interval by bootstrap: in each replicate of the series, the onset is the lowest point
 * between the peak and the nearest point to its left that the observed series has higher than
 * the peak; the interval runs between the (1 − level)/2 and (1 + level)/2 order statistics of
 * those cells (nearest rank, outward, so a discrete interval never claims less than `level`),
 * widened to hold the observed onset.
 */
function onsetInterval(noise: SeriesNoise, m: readonly number[], i1: number, boot: number, level: number, rng: Rng): { low: number; high: number } {
  let start = i1 - 1;
  while (start >= 0 && m[start] <= m[i1]) start--;
  start++;
  let i0 = start;
  for (let k = start; k < i1; k++) if (m[k] < m[i0]) i0 = k;
  if (boot <= 0 || start >= i1) return { low: i0, high: i0 };
  const rep = new Float64Array(m.length);
  const at = new Int32Array(boot);
  for (let b = 0; b < boot; b++) {
    noise.replicate(rng, rep);
    let k0 = start;
    for (let k = start; k < i1; k++) if (rep[k] < rep[k0]) k0 = k;
    at[b] = k0;
  }
  at.sort();
  const lo = at[Math.max(0, Math.floor(((1 - level) / 2) * boot))];
  const hi = at[Math.min(boot - 1, Math.ceil(((1 + level) / 2) * boot) - 1)];
  return { low: Math.min(lo, i0), high: Math.max(hi, i0) };
}

/** The axes a hurts slice is fixed on; train_size runs along it. */
export const HURTS_SLICE_KEYS = ['width', 'epochs', 'label_noise', 'condition'] as const;

function sameValue(a: number | string, b: number | string): boolean {
  if (typeof a === 'number' && typeof b === 'number') return a === b || Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));
  const na = Number(a);
  const nb = Number(b);
  if (typeof a !== typeof b && Number.isFinite(na) && Number.isFinite(nb)) return sameValue(na, nb);
  return String(a) === String(b);
}

/**
 * "More data hurts": along train_size, at fixed width, epochs, label noise and condition, every
 * significant rise of the metric. A rise runs from its onset (the lowest cell before it, back to
 * the nearest higher point) to its peak (a local maximum, or the last size if still rising). It
 * counts when the one-sided Welch t-test of peak against onset cell gives p < alpha; when either
 * cell has a single seed a bootstrap of the difference is used instead (seed resampling, and the
 * series' pooled or curve noise for single-seed cells). Because onset and peak are picked as the
 * lowest and highest points, the rise must also beat, in pair standard errors, the tallest rise
 * that pure noise produces anywhere along a slice of the same shape (search-wide p, `pSearch`).
 * Recovery is where the error first falls
 * back to the onset level after the peak, interpolated linearly in log2 size; null when not
 * reached inside the sweep. Rises nested inside a larger one are not listed separately.
 * Segments come worst (largest rise) first.
 */
export function findHurts(cells: Cell[], opts: HurtsOptions = {}): HurtsResult {
  const at = opts.at ?? {};
  const alpha = opts.alpha ?? 0.05;
  const boot = Math.max(1, Math.floor(opts.boot ?? 1000));
  const seed = opts.seed ?? 1;
  const nullRounds = Math.max(0, Math.floor(opts.nullRounds ?? 1000));
  const correction = correctionName(opts.correction ?? 'benjamini-hochberg');
  const level = opts.level ?? 0.95;
  for (const k of Object.keys(at)) {
    if (!(HURTS_SLICE_KEYS as readonly string[]).includes(k)) throw usageError(analysisText.badHurtsAt(k));
  }
  const metric = cells[0]?.metric ?? 'test_error';

  const slices = new Map<string, Cell[]>();
  for (const c of cells) {
    if (!HURTS_SLICE_KEYS.every((k) => at[k] === undefined || sameValue(c[k], at[k]))) continue;
    if (!(c.stats.n > 0 && Number.isFinite(c.stats.mean) && c.train_size > 0)) continue;
    const key = JSON.stringify([c.condition, c.label_noise, c.width, c.epochs]);
    let s = slices.get(key);
    if (!s) slices.set(key, (s = []));
    s.push(c);
  }
  const keys = [...slices.keys()].sort();

  const candidates: (HurtsSegment & { q: number })[][] = [];
  let scanned = 0;
  keys.forEach((key, sliceIndex) => {
    const series = slices.get(key)!.sort((a, b) => a.train_size - b.train_size);
    if (series.length < 2) return;
    scanned++;
    const u = series.map((c) => Math.log2(c.train_size));
    const m = series.map((c) => c.stats.mean);
    const noise = seriesNoise(series, u);
    const rng = seededRng(deriveSeed(seed, sliceIndex));
    const first = series[0];
    const fixed: Record<string, number | string> = {
      width: first.width,
      epochs: first.epochs,
      label_noise: first.label_noise,
      condition: first.condition,
    };
    const found: (HurtsSegment & { i0: number; i1: number })[] = [];
    // Rise of a candidate in pair standard errors: the statistic the search-wide check compares.
    const zOf = (v: SeriesView, i0: number, i1: number): number => {
      const se = v.pairSe(i1, i0);
      const d = v.means[i1] - v.means[i0];
      return se > 0 ? d / se : d > 0 ? Infinity : 0;
    };
    let pSearchOf: ((z: number) => number) | null = null;
    for (const lp of localPeaks(m, { allowRightEnd: true })) {
      const i0 = lp.leftBase;
      const i1 = lp.index;
      const on = series[i0];
      const pk = series[i1];
      const rise = m[i1] - m[i0];
      let p: number;
      let test: HurtsSegment['test'];
      if (on.stats.n >= 2 && pk.stats.n >= 2) {
        const a = pk.values.filter(Number.isFinite);
        const b = on.values.filter(Number.isFinite);
        p = welchTest(a, b, { alternative: 'greater' }).p;
        test = 'welch';
      } else {
        if (!(noise.sd >= 0)) continue; // too few points to know the noise: no claim
        // Bootstrap test on the centred difference: how often does resampling noise alone move it by `rise`?
        const rep = new Float64Array(m.length);
        let hits = 0;
        for (let b = 0; b < boot; b++) {
          noise.replicate(rng, rep);
          if (rep[i1] - rep[i0] - rise >= rise) hits++;
        }
        p = (hits + 1) / (boot + 1);
        test = 'bootstrap';
      }
      if (!(p < alpha)) continue;
      let pSearch: number | undefined;
      if (nullRounds > 0 && Number.isFinite(noise.sd)) {
        pSearchOf ??= searchWideP({
          noise,
          rounds: nullRounds,
          rng,
          maxStat: (v) => {
            let best = 0;
            for (const q of localPeaks(v.means, { allowRightEnd: true })) best = Math.max(best, zOf(v, q.leftBase, q.index));
            return best;
          },
        });
        pSearch = pSearchOf(zOf(noise, i0, i1));
        if (!(pSearch < alpha)) continue;
      }
      const onsetCi = onsetInterval(noise, m, i1, boot, level, rng);
      let recovery: number | null = null;
      for (let k = i1 + 1; k < m.length; k++) {
        if (m[k] <= m[i0]) {
          const f = (m[k - 1] - m[i0]) / (m[k - 1] - m[k]);
          recovery = 2 ** (u[k - 1] + f * (u[k] - u[k - 1]));
          break;
        }
      }
      found.push({
        fixed,
        onset: on.train_size,
        peak: pk.train_size,
        recovery,
        rise,
        p,
        ...(pSearch === undefined ? {} : { pSearch }),
        test,
        onsetError: m[i0],
        peakError: m[i1],
        onsetSeeds: on.stats.n,
        peakSeeds: pk.stats.n,
        noiseFrom: noise.from,
        lastSize: series[series.length - 1].train_size,
        onsetLow: series[onsetCi.low].train_size,
        onsetHigh: series[onsetCi.high].train_size,
        i0,
        i1,
      });
    }
    // Keep the larger of nested rises: a wiggle on the way up is part of the same segment.
    found.sort((a, b) => b.rise - a.rise);
    const kept: typeof found = [];
    for (const s of found) if (!kept.some((k) => s.i0 >= k.i0 && s.i1 <= k.i1)) kept.push(s);
    // A rise counts only when both tests pass: its p for the correction is the larger of the two.
    candidates.push(kept.map(({ i0: _i0, i1: _i1, ...s }) => ({ ...s, q: Math.max(s.p, s.pSearch ?? s.p) })));
  });
  // Benjamini–Hochberg across the slices scanned, on each slice's smallest p; slices without a
  // candidate rise count as p = 1. Every rise is then judged by its BH-adjusted p.
  const sliceP = candidates.map((c) => Math.min(1, ...c.map((s) => s.q)));
  const segments: HurtsSegment[] = [];
  let withRise = 0;
  for (const [at, slice] of candidates.entries()) {
    let any = false;
    for (const { q, ...s } of slice) {
      const pAdjusted = correction === 'none' ? q : adjustedAs(q, sliceP, at);
      if (!(pAdjusted < alpha)) continue;
      segments.push({ ...s, pAdjusted });
      any = true;
    }
    if (any) withRise++;
  }
  segments.sort((a, b) => b.rise - a.rise || a.p - b.p);
  return { metric, fixed: { ...at }, segments, alpha, slices: scanned, singleSize: keys.length - scanned, correction, slicesWithRise: withRise };
}
