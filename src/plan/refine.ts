import { formatNumber } from '../formatNumber.js';
import { buildCells } from '../cells/buildCells.js';
import type { Cell } from '../cells/Cell.js';
import { tQuantile } from '../cells/tQuantile.js';
import { findHurts } from '../analysis/findHurts.js';
import { findRidge } from '../analysis/findRidge.js';
import { localPeaks } from '../analysis/localPeaks.js';
import type { Peak } from '../analysis/Ridge.js';
import { seriesNoise } from '../analysis/seriesNoise.js';
import { cellEdges } from '../grid/axisScale.js';
import type { MapAxis, MapCell } from '../grid/SweepMap.js';
import type { Metric, RowTable } from '../store/RowTable.js';
import { sameValue } from './SweepSpec.js';
import type { SpecRun, SweepSpec } from './SweepSpec.js';
import { planText as msg } from '../messages.js';
import { configKey } from '../store/rowKeys.js';

/** What a proposed run is expected to sharpen (DESIGN.md §5 "Plan"). */
export const SHARPENS = [
  'model-peak', // location of a model-wise ridge point (width)
  'model-significance', // whether a model-wise peak is real
  'sample-peak', // location of a sample-wise peak (train size)
  'hurts-onset', // train size where more data starts to hurt
  'hurts-recovery', // train size where the error falls back
  'hurts-significance', // whether a hurts segment is real
  'epoch-peak', // an epoch-wise peak that has not appeared by the target epoch
] as const;
export type Sharpens = (typeof SHARPENS)[number];

/** One run refinement proposes; a resume carries its own target epochs, start and run id. */
export interface CandidateRun extends SpecRun {
  epochs?: number;
  resume_from?: number | null;
  run?: string;
}

/** A group of runs refinement proposes together (one new configuration, extra seeds for one decision, or the resumes of one cell). */
export interface Candidate {
  reason: 'refine' | 'seeds' | 'resume';
  runs: CandidateRun[];
  /**
   * Expected value of the group, in octaves of the quantity it sharpens (location candidates)
   * or on a 0..1 scale (significance candidates); ranked per unit cost or per run.
   */
  value: number;
  sharpens: Sharpens;
  /** Further quantities the same runs sharpen. */
  also?: Sharpens[];
  why: string;
}

export interface RefineOptions {
  table: RowTable;
  spec: SweepSpec;
  metric?: Metric;
  /**
   * Target resolution in octaves (log2 units of width or train size; default 0.25): a ridge point
   * is located when the measured values on both sides of its peak cell are at most this far away
   * and its bootstrap interval is at most this wide either side.
   */
  resolution?: number;
  /** Significance rule of the analyses: peak prominence in pooled SEs (default 2), hurts alpha (default 0.05). */
  minProminence?: number;
  alpha?: number;
  /** Bootstrap rounds of the analyses (default 400) and their random seed. */
  boot?: number;
  seed?: number;
  /**
   * Seeds launched at a new width or train size (default: the spec's seeds). Fewer saves runs
   * but weakens the search-wide test of the peak: a one-seed cell's mean is as noisy as a seed.
   */
  newSeeds?: number;
  /** Factor a resume extends the target epochs by, for an epoch-wise peak not yet appeared (default 4). */
  epochFactor?: number;
}

/** Where one slice's ridge stands against the resolution. */
export interface SliceStatus {
  kind: 'model' | 'sample';
  fixed: Record<string, number | string>;
  /** located: within the resolution and significant; refining: not yet; no-peak: none found and nothing left to try. */
  status: 'located' | 'refining' | 'no-peak';
  /** The ridge point (significant or near miss), null when none. */
  peak: Peak | null;
  /** Location uncertainty in octaves: the larger of the grid steps beside the peak cell and the interval's half-width. */
  octaves: number | null;
}

export interface RefineResult {
  candidates: Candidate[];
  /** Ridge points seen at the target epoch, per slice (for reporting). */
  peaks: { fixed: Record<string, number | string>; peak: Peak; significant: boolean }[];
  slices: SliceStatus[];
  /** The stop rule: every slice's ridge located within the resolution and nothing borderline (no candidates). */
  done: boolean;
  resolution: number;
  notes: string[];
}

/**
 * Grid steps within 10% of the resolution count as resolved: integer rounding makes a √2 grid's
 * steps 0.49–0.51 octaves, and those should not be split unevenly.
 */
const SLACK = 1.1;
/**
 * Weight of proposals on the secondary axes (sample-wise peak, hurts onset and recovery,
 * epoch-wise resumes) relative to the model-wise ridge, the map's main line: an octave of
 * train size is worth a fifth of an octave of width (our own heuristic scale).
 */
const SECONDARY = 0.2;

/** One-sided normal quantile through Student t with very many degrees of freedom. */
const zOf = (p: number) => tQuantile(1 - p, 1e7);

const fmt = (v: number) => formatNumber(v, 4);

/** Grid steps (indices i, i+1 of `values`) inside [lo, hi] coarser than `limit` octaves. */
function coarseSteps(values: readonly number[], lo: number, hi: number, limit: number): [number, number][] {
  const out: [number, number][] = [];
  for (let i = 0; i + 1 < values.length; i++) {
    const a = values[i], b = values[i + 1];
    if (a < lo || b > hi || !(Math.log2(b / a) > limit)) continue;
    out.push([a, b]);
  }
  return out;
}

/**
 * Location uncertainty of a peak in octaves: the coarser of the two grid steps beside its cell
 * (the parabola cannot place it better than the grid around it) and the half-width of its
 * bootstrap interval (seed noise).
 */
function peakOctaves(values: readonly number[], p: Peak): number {
  const k = values.findIndex((v) => sameValue(v, p.cellX));
  const left = k > 0 ? Math.log2(values[k] / values[k - 1]) : Infinity;
  const right = k >= 0 && k + 1 < values.length ? Math.log2(values[k + 1] / values[k]) : Infinity;
  const half = p.low > 0 && p.high > 0 ? Math.log2(p.high / p.low) / 2 : 0;
  return Math.max(left, right, half);
}

/**
 * Refinement proposals from the analyses at the spec's target epoch (DESIGN.md §5 "Plan"), along
 * every axis the analyses need. Each proposal names the quantity it sharpens and its value:
 * - model-peak: for each ridge point along width (per condition, noise and train size; a near
 *   miss at 2/3 of the prominence bar counts, it may be the real peak under-seeded), the
 *   bracket is the measured widths beside the peak cell widened to hold its bootstrap interval;
 *   every grid step in it coarser than `resolution` gets its geometric midpoint (bisection in
 *   log space), value half the step's octaves (the uncertainty it removes), `newSeeds` runs.
 *   Where the interval is wider than the resolution (seed noise, not the grid), the peak cell
 *   and its neighbours get one more seed each while they have fewer than the spec, value the
 *   expected shrink of the interval's half-width (1 − √(k/(k+1)) of it).
 *   A slice with no peak resolved but an interpolation threshold gets the midpoint of the grid
 *   step holding the threshold (Nakkiran et al. 2019: the peak sits near it), at half value.
 * - sample-peak: the same along train size, per (condition, noise, width), at SECONDARY weight.
 * - hurts-onset / hurts-recovery: the grid step after a segment's onset and the one holding its
 *   recovery, bisected while coarser than the resolution, at SECONDARY weight.
 * - epoch-peak: a cell whose error is still rising significantly over the last decade of epochs
 *   (after falling first) has an epoch-wise peak not yet appeared: its runs resume to
 *   `epochFactor` × the target, at SECONDARY weight.
 * - model-significance / hurts-significance: where a peak is borderline (prominence within a
 *   factor 1.5 of the minimum, either side) extra seeds at the peak cell and its key base (and
 *   both neighbours while it fails), valued less at a cell already above the spec's seeds;
 *   where a hurts segment is borderline (p within a factor 4 of alpha, either side) extra seeds at
 *   its onset and peak. The number of seeds is what would move the statistic to the safe side if
 *   the effect is real (standard errors shrink as 1/√n); value 1 at the threshold, falling to 0
 *   at the edge of the borderline band.
 * Stop rule: when no slice needs anything (`done`), nothing is proposed; a finer resolution asks for more.
 * The values are our own heuristic scale, comparable across the kinds.
 */
export function proposeRefinements(opts: RefineOptions): RefineResult {
  const { table, spec, metric, resolution = 0.25, minProminence = 2, alpha = 0.05, boot = 400, seed = 1, epochFactor = 4 } = opts;
  const newSeeds = opts.newSeeds ?? Math.max(1, spec.seeds.length);
  const limit = resolution * SLACK;
  const notes: string[] = [];
  const peaks: RefineResult['peaks'] = [];
  const slices: SliceStatus[] = [];
  const candidates: Candidate[] = [];
  const allCells = buildCells(table, { metric }).filter(
    (c) => spec.conditions.includes(c.condition) && spec.axes.label_noise.some((l) => sameValue(l, c.label_noise)),
  );
  const cells = allCells.filter((c) => sameValue(c.epochs, spec.epochs));
  const integerWidths = spec.axes.width.every(Number.isInteger);
  const seedIds = new Map<string, Set<number>>();
  const cfgKey = configKey;
  for (let i = 0; i < table.length; i++) {
    const k = cfgKey({ condition: table.condition[i], label_noise: table.label_noise[i], width: table.width[i], train_size: table.train_size[i] });
    let s = seedIds.get(k);
    if (!s) seedIds.set(k, (s = new Set()));
    s.add(table.seed[i]);
  }
  // Seed ids for a configuration: the spec's ids it lacks first, then ids above every one in use.
  const freshSeeds = (cfg: Omit<SpecRun, 'seed'>, k: number): number[] => {
    const have = seedIds.get(cfgKey(cfg)) ?? new Set<number>();
    const out = spec.seeds.filter((s) => !have.has(s)).slice(0, k);
    let next = Math.max(-1, ...have, ...spec.seeds) + 1;
    while (out.length < k) out.push(next++);
    return out;
  };
  const seedsCandidate = new Map<string, Candidate>();
  const addSeeds = (cfg: Omit<SpecRun, 'seed'>, k: number, value: number, sharpens: Sharpens, why: string) => {
    const key = cfgKey(cfg);
    const prev = seedsCandidate.get(key);
    if (prev && prev.runs.length >= k && prev.value >= value) return;
    const better = !prev || value > prev.value;
    seedsCandidate.set(key, {
      reason: 'seeds',
      runs: freshSeeds(cfg, Math.max(k, prev?.runs.length ?? 0)).map((s) => ({ ...cfg, seed: s })),
      value: Math.max(value, prev?.value ?? 0),
      sharpens: better ? sharpens : prev!.sharpens,
      why: better ? why : prev!.why,
    });
  };
  const proposed = new Map<string, Candidate>();
  const propose = (cfg: Omit<SpecRun, 'seed'>, value: number, sharpens: Sharpens, why: string) => {
    const k = cfgKey(cfg);
    if (seedIds.has(k)) return;
    const prev = proposed.get(k);
    // One new configuration can sharpen two things (a sample-wise peak and a hurts onset): one
    // proposal, the values added, both named.
    if (prev) {
      prev.value += value;
      if (prev.sharpens !== sharpens && !prev.also?.includes(sharpens)) (prev.also ??= []).push(sharpens);
      return;
    }
    const c: Candidate = { reason: 'refine', runs: freshSeeds(cfg, newSeeds).map((s) => ({ ...cfg, seed: s })), value, sharpens, why };
    proposed.set(k, c);
    candidates.push(c);
  };
  const midpoint = (a: number, b: number, integer: boolean): number | null => {
    let m = Math.sqrt(a * b);
    if (integer) m = Math.round(m);
    return m > a && m < b ? m : null;
  };
  const cellsBy = (list: Cell[], key: (c: Cell) => string) => {
    const out = new Map<string, Cell[]>();
    for (const c of list) {
      if (!(c.stats.n > 0 && Number.isFinite(c.stats.mean))) continue;
      const k = key(c);
      const l = out.get(k);
      if (l) l.push(c);
      else out.set(k, [c]);
    }
    return out;
  };
  const ridgeCache = new Map<string, ReturnType<typeof findRidge>>();

  /**
   * The ridge of one map as `datlas ridge` finds it (every row of the map, so a correction across
   * rows applies exactly as the reader will see it), then the row to plan for: `slice` holds that
   * row's cells, `rows` the whole map's. `weight` scales values (1 for the model-wise ridge,
   * SECONDARY for the sample-wise one).
   */
  const ridgeSlice = (slice: Cell[], rows: Cell[], axis: 'width' | 'train_size', weight: number) => {
    const model = axis === 'width';
    const at = (v: number) => slice.find((c) => sameValue(c[axis], v))!;
    const values = [...new Set(slice.map((c) => c[axis]))].sort((a, b) => a - b);
    const first = slice[0];
    const fixed: Record<string, number | string> = model
      ? { condition: first.condition, label_noise: first.label_noise, train_size: first.train_size }
      : { condition: first.condition, label_noise: first.label_noise, width: first.width };
    if (values.length < 3) return;
    const yName = model ? 'epochs' : 'width';
    const yOf = (c: Cell) => (model ? c.epochs : c.width);
    const yHere = yOf(first);
    // Octaves along either axis: log2 always (the resolution is in octaves).
    const xs = [...new Set(rows.map((c) => c[axis]))].sort((a, b) => a - b);
    const ys = [...new Set(rows.map(yOf))].sort((a, b) => a - b);
    const x: MapAxis = { name: axis, scale: 'log2', values: xs, edges: cellEdges('log2', xs) };
    const y: MapAxis = { name: yName, scale: 'log2', values: ys, edges: cellEdges('log2', ys) };
    // One map per (condition, noise[, train size]): the sample map serves each of its width rows.
    const mapKey = `${axis}\u0000${first.condition}\u0000${first.label_noise}\u0000${model ? first.train_size : ''}`;
    let ridge = ridgeCache.get(mapKey);
    if (!ridge) {
      const mapCells: MapCell[] = rows.map((c) => ({ x: c[axis], y: yOf(c), cell: c }));
      ridge = findRidge({ kind: model ? 'model' : 'sample', x, y, cells: mapCells, fixed, metric: first.metric }, { minProminence, alpha, boot, seed });
      ridgeCache.set(mapKey, ridge);
    }
    const row = ridge.rows.find((r) => sameValue(r.y, yHere));
    const found = row ? [row.peak, ...row.others].filter((p): p is Peak => p !== null) : [];
    // A bump that fell short of the bar (by prominence or by the search-wide test) still says
    // where to look: its bracket is refined at half value and its seeds are added where it is
    // borderline (it may be the real peak, under-seeded).
    const weak = found.length === 0 && row?.insideNoise && row.insideNoise.prominenceSe >= 1 ? row.insideNoise : null;
    if (weak) found.push(weak);
    const where = model
      ? `${first.condition ? `${first.condition}, ` : ''}noise ${first.label_noise}, n ${fmt(first.train_size)}`
      : `${first.condition ? `${first.condition}, ` : ''}noise ${first.label_noise}, width ${fmt(first.width)}`;
    const cfgAt = (v: number) => ({ condition: first.condition, label_noise: first.label_noise, width: model ? v : first.width, train_size: model ? first.train_size : v });
    const integer = model ? integerWidths : true;
    const xText = (v: number) => `${model ? 'width' : 'n'} ${fmt(v)}`;
    const before = candidates.length + seedsCandidate.size;
    if (found.length === 0 || weak) {
      // No peak resolved: along width the peak is expected near the interpolation threshold
      // (Nakkiran et al. 2019, effective model complexity ≈ n): bisect the step that holds it.
      if (model && row && row.threshold !== null && !row.thresholdAtEdge) {
        const a = values.filter((w) => w <= row.threshold!).at(-1);
        const b = values.find((w) => w >= row.threshold!);
        const m = a !== undefined && b !== undefined && Math.log2(b / a) > limit ? midpoint(a, b, integer) : null;
        // Half the value of a resolved ridge point: the peak is only expected there.
        if (m !== null) propose(cfgAt(m), Math.log2(b! / a!) / 4, 'model-peak', msg.whyThreshold(where, fmt(row.threshold), fmt(a!), fmt(b!)));
      }
      if (!weak) {
        const more = candidates.length + seedsCandidate.size > before;
        slices.push({ kind: model ? 'model' : 'sample', fixed, status: more ? 'refining' : 'no-peak', peak: null, octaves: null });
        return;
      }
    }
    const main = found[0];
    for (const p of found) {
      const significant = p !== weak;
      if (model) peaks.push({ fixed, peak: p, significant });
      // A bump under 2/3 of the bar may be noise: half value for the widths around it.
      const scale = p === weak && p.prominenceSe < minProminence / 1.5 ? weight / 2 : weight;
      const k = values.findIndex((v) => sameValue(v, p.cellX));
      const near = values.slice(Math.max(0, k - 1), k + 2);
      const nNow = Math.min(...near.map((v) => at(v).stats.n));
      // Borderline peak: short of the bar (prominence under the minimum, or the search-wide p,
      // as the reader is shown it, at or above alpha) with a bump of at least 1 SE, value 1; or
      // passing but close (prominence under 1.5 × the minimum, p above alpha/10), value falling
      // to 0 at those edges. Extra seeds go where the test statistic is made: the peak cell and
      // its key base (the higher flanking minimum).
      const z = Math.max(p.prominenceSe, 1e-6);
      const pShown = (p as Peak & { pAdjusted?: number }).pAdjusted ?? p.p;
      const failing = z < minProminence || (pShown !== undefined && pShown >= alpha);
      const zValue = z < minProminence ? 1 : Math.max(0, 1 - Math.log(z / minProminence) / Math.log(1.5));
      const pValue = pShown === undefined ? 0 : pShown >= alpha ? 1 : Math.max(0, 1 - Math.log(alpha / Math.max(pShown, 1e-9)) / Math.log(10));
      // While the grid beside the peak cell is coarser than twice the resolution, the cell's mean
      // is not the peak's height (a sharp peak between cells): a new width there raises the
      // prominence as well as placing it, so seeds of a passing peak wait (a quarter of their
      // value); those of a failing one get half, at the peak and both neighbours: under a run cap
      // the next round may be the last, and the pair SE of both flanks enters the test.
      const coarse = peakOctaves(values, { ...p, low: p.cellX, high: p.cellX }) > 2 * limit;
      // A failing bump under 2/3 of the bar is more likely noise: a quarter of the value.
      const borderValue = scale * (failing ? (z >= minProminence / 1.5 ? 1 : 0.25) * (coarse ? 0.5 : 1) : Math.max(zValue, pValue) * (coarse ? 0.25 : 1));
      if (borderValue > 0) {
        const target = minProminence * 1.5;
        // SE shrinks as 1/√n: the seeds that bring z to the safe side if the peak is real (at
        // least 1, at most doubling); a search-wide p short of alpha/4 asks for the doubling.
        const ratio = pShown !== undefined && pShown >= alpha / 4 ? 1 : p.prominenceSe < target ? (target / Math.max(p.prominenceSe, 1e-6)) ** 2 - 1 : 0.5;
        const nPeak = at(p.cellX).stats.n;
        const kSeeds = Math.max(1, Math.min(nPeak, Math.ceil(nPeak * ratio)));
        const base = slice.reduce((b, c) => (Math.abs(c.stats.mean - (p.error - p.prominence)) < Math.abs(b.stats.mean - (p.error - p.prominence)) ? c : b), slice[0]);
        for (const v of new Set(failing ? [p.cellX, base[axis], ...near] : [p.cellX, base[axis]]))
          // Diminishing: a cell already above the spec's seeds gains less from the next ones
          // (SE ∝ 1/√n), so another slice's peak or a width comes first.
          addSeeds(cfgAt(v), kSeeds, borderValue * Math.min(1, spec.seeds.length / Math.max(1, at(v).stats.n)), model ? 'model-significance' : 'sample-peak', msg.whyPeakSeeds(where, xText(p.x), p.prominenceSe, minProminence, pShown ?? null, alpha));
      }
      if (!significant && p !== main) continue;
      // The bracket: the measured values beside the peak cell, widened to hold the interval.
      const lo = Math.min(values[Math.max(0, k - 1)], values.filter((v) => v <= p.low).at(-1) ?? values[0]);
      const hi = Math.max(values[Math.min(values.length - 1, k + 1)], values.find((v) => v >= p.high) ?? values[values.length - 1]);
      // The side of the peak cell that holds the parabola's vertex holds the peak: its step
      // first (full value); the other steps of the bracket at half value.
      const cellU = Math.log2(p.cellX);
      const side = Math.log2(p.x) < cellU - 1e-9 ? -1 : Math.log2(p.x) > cellU + 1e-9 ? 1 : 0;
      for (const [a, b] of coarseSteps(values, lo, hi, limit)) {
        const m = midpoint(a, b, integer);
        const adjacent = sameValue(b, p.cellX) ? -1 : sameValue(a, p.cellX) ? 1 : 0;
        const sideWeight = adjacent !== 0 && (side === 0 || side === adjacent) ? 1 : 0.5;
        if (m === null) continue;
        propose(cfgAt(m), (scale * sideWeight * Math.log2(b / a)) / 2, model ? 'model-peak' : 'sample-peak',
          (model ? msg.whyRefine : msg.whyRefineSize)(where, fmt(p.x), fmt(p.low), fmt(p.high), fmt(a), fmt(b)));
        // On the vertex side of a borderline peak the new cell sits nearer the top of a sharp
        // peak than the cell now holding it, raising the measured prominence: it sharpens the
        // significance as much as the extra seeds do.
        if (model && borderValue > 0 && adjacent !== 0 && side === adjacent) propose(cfgAt(m), borderValue, 'model-significance', '');
      }
      // Cells the peak rests on with fewer seeds than the spec (new widths start with
      // `newSeeds`): topped up, value the octaves still unresolved times the SE shrink.
      const unresolved = Math.min(1, peakOctaves(values, p));
      const nSpec = spec.seeds.length;
      for (const v of near) {
        const c = at(v);
        if (c.stats.n >= nSpec) continue;
        addSeeds(cfgAt(v), nSpec - c.stats.n, scale * unresolved * (1 - Math.sqrt(c.stats.n / nSpec)), model ? 'model-peak' : 'sample-peak',
          msg.whyTopUp(where, xText(p.x), c.stats.n, nSpec));
      }
      // Seed noise, not the grid, holds the interval wide: one more seed where the peak rests.
      const half = p.low > 0 ? Math.log2(p.high / p.low) / 2 : 0;
      if (half > resolution)
        for (const v of near) {
          const c = at(v);
          if (c.stats.n >= Math.max(spec.seeds.length, 2) + 2) continue;
          addSeeds(cfgAt(v), 1, weight * half * (1 - Math.sqrt(c.stats.n / (c.stats.n + 1))), model ? 'model-peak' : 'sample-peak',
            msg.whyIntervalSeeds(where, xText(p.x), fmt(p.low), fmt(p.high), resolution));
        }
    }
    const octaves = peakOctaves(values, main);
    const more = candidates.length + seedsCandidate.size > before;
    const located = main !== weak && octaves <= limit;
    slices.push({ kind: model ? 'model' : 'sample', fixed, status: located && !more ? 'located' : 'refining', peak: main, octaves });
  };

  // Ridge along width, per (condition, noise, train size): the model map over every logged
  // epoch, planned for at the target epoch.
  const modelMaps = cellsBy(allCells, (c) => `${c.condition}\u0000${c.label_noise}\u0000${c.train_size}`);
  for (const rows of modelMaps.values()) {
    const slice = rows.filter((c) => sameValue(c.epochs, spec.epochs));
    if (slice.length) ridgeSlice(slice, rows, 'width', 1);
  }
  // Sample-wise peak along train size: the sample map (rows: widths) at the target epoch, per
  // (condition, noise), planned for in every row with three sizes or more.
  for (const rows of cellsBy(cells, (c) => `${c.condition}\u0000${c.label_noise}`).values())
    for (const slice of cellsBy(rows, (c) => String(c.width)).values())
      if (new Set(slice.map((c) => c.train_size)).size >= 3) ridgeSlice(slice, rows, 'train_size', SECONDARY);

  // Hurts segments along train size at the target epoch; a wider alpha finds near misses.
  const wideAlpha = Math.min(0.5, alpha * 4);
  const hurts = findHurts(cells, { alpha: wideAlpha, boot, seed });
  for (const s of hurts.segments) {
    const condition = String(s.fixed.condition ?? '');
    const label_noise = Number(s.fixed.label_noise);
    const width = Number(s.fixed.width);
    const where = `${condition ? `${condition}, ` : ''}width ${fmt(width)}, noise ${label_noise}`;
    const sizes = [...new Set(cells.filter((c) => c.condition === condition && sameValue(c.label_noise, label_noise) && sameValue(c.width, width)).map((c) => c.train_size))].sort((a, b) => a - b);
    const cfgAt = (n: number) => ({ condition, label_noise, width, train_size: n });
    if (s.p >= alpha / 4 && s.p < wideAlpha) {
      const value = SECONDARY * (1 - Math.abs(Math.log(s.p / alpha)) / Math.log(4));
      const at = (n: number) => cells.find((c) => c.condition === condition && sameValue(c.label_noise, label_noise) && sameValue(c.width, width) && sameValue(c.train_size, n));
      const nNow = Math.min(at(s.onset)?.stats.n ?? 1, at(s.peak)?.stats.n ?? 1);
      // Test statistic grows as √n: seeds that would bring p to alpha/4 if the rise is real.
      const k = Math.max(1, Math.min(Math.max(nNow, 1), Math.ceil(nNow * ((zOf(alpha / 4) / Math.max(zOf(s.p), 1e-6)) ** 2 - 1))));
      if (value > 0) for (const n of [s.onset, s.peak]) addSeeds(cfgAt(n), k, value, 'hurts-significance', msg.whyHurtsSeeds(where, fmt(s.onset), fmt(s.peak), s.p, alpha));
    }
    if (!(s.p < alpha)) continue;
    // The rise starts somewhere in the step after the onset; recovery inside the step holding it.
    const i = sizes.findIndex((n) => sameValue(n, s.onset));
    const steps: [number, number, 'hurts-onset' | 'hurts-recovery'][] = [];
    if (i >= 0 && i + 1 < sizes.length) steps.push([sizes[i], sizes[i + 1], 'hurts-onset']);
    if (s.recovery !== null) {
      const a = sizes.filter((n) => n <= s.recovery!).at(-1);
      const b = sizes.find((n) => n >= s.recovery!);
      if (a !== undefined && b !== undefined) steps.push([a, b, 'hurts-recovery']);
    }
    for (const [a, b, what] of steps) {
      const m = Math.log2(b / a) > limit ? midpoint(a, b, true) : null;
      if (m !== null) propose(cfgAt(m), (SECONDARY * Math.log2(b / a)) / 2, what, msg.whyHurtsStep(where, what === 'hurts-onset' ? 'onset' : 'recovery', fmt(a), fmt(b)));
    }
  }

  // Epoch-wise peaks not yet appeared: error fell, then rises significantly over the last decade.
  for (const series of cellsBy(allCells, cfgKey).values()) {
    series.sort((a, b) => a.epochs - b.epochs);
    const last = series[series.length - 1];
    if (!sameValue(last.epochs, spec.epochs) || series.length < 4) continue;
    const u = series.map((c) => Math.log10(c.epochs));
    const noise = seriesNoise(series, u);
    const lp = localPeaks(noise.means, { allowRightEnd: true }).find((q) => q.rightBase < 0);
    if (!lp || lp.leftBase === 0) continue;
    const j = u.findIndex((v) => v >= u[u.length - 1] - 1);
    const se = noise.pairSe(series.length - 1, j);
    const rise = noise.means[series.length - 1] - noise.means[j];
    if (!(j < series.length - 1 && se > 0 && rise / se >= minProminence)) continue;
    const target = Math.round(spec.epochs * epochFactor);
    const runs: CandidateRun[] = [];
    for (let i = 0; i < table.length; i++) {
      if (!(table.condition[i] === last.condition && sameValue(table.label_noise[i], last.label_noise) && sameValue(table.width[i], last.width) && sameValue(table.train_size[i], last.train_size) && sameValue(table.epochs[i], spec.epochs))) continue;
      if (runs.some((r) => r.run === table.run[i])) continue;
      runs.push({ condition: last.condition, label_noise: last.label_noise, width: last.width, train_size: last.train_size, seed: table.seed[i], epochs: target, resume_from: spec.epochs, run: table.run[i] });
    }
    if (runs.length === 0) continue;
    const where = `${last.condition ? `${last.condition}, ` : ''}width ${fmt(last.width)}, n ${fmt(last.train_size)}, noise ${last.label_noise}`;
    candidates.push({ reason: 'resume', runs, value: SECONDARY * Math.log2(epochFactor) / 2, sharpens: 'epoch-peak', why: msg.whyEpochResume(where, rise / se, fmt(spec.epochs), fmt(target)) });
  }

  if (peaks.length === 0 && cells.length > 0) notes.push(msg.noteNoRidge());
  candidates.push(...seedsCandidate.values());
  const done = cells.length > 0 && candidates.length === 0 && slices.some((s) => s.status === 'located');
  return { candidates, peaks, slices, done, resolution, notes };
}
