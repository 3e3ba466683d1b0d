import { formatNumber } from '../formatNumber.js';
import { buildCells } from '../cells/buildCells.js';
import type { Cell } from '../cells/Cell.js';
import { tQuantile } from '../cells/tQuantile.js';
import { findHurts } from '../analysis/findHurts.js';
import { findRidge } from '../analysis/findRidge.js';
import type { Peak } from '../analysis/Ridge.js';
import { cellEdges, detectScale } from '../grid/axisScale.js';
import type { MapAxis, MapCell } from '../grid/SweepMap.js';
import type { Metric, RowTable } from '../store/RowTable.js';
import { sameValue } from './SweepSpec.js';
import type { SpecRun, SweepSpec } from './SweepSpec.js';
import { planText as msg } from '../messages.js';
import { configKey } from '../store/rowKeys.js';

/** A group of runs refinement proposes together (one new width with all its seeds, or extra seeds for one decision). */
export interface Candidate {
  reason: 'refine' | 'seeds';
  runs: SpecRun[];
  /** Expected value of the group (see proposeRefinements); ranked per unit cost. */
  value: number;
  why: string;
}

export interface RefineOptions {
  table: RowTable;
  spec: SweepSpec;
  metric?: Metric;
  /**
   * Target resolution in octaves (log2 units of width; default 0.5): a ridge point is refined while
   * the measured widths around its interval (its bracket) span more than this.
   */
  resolution?: number;
  /** Significance rule of the analyses: peak prominence in pooled SEs (default 2), hurts alpha (default 0.05). */
  minProminence?: number;
  alpha?: number;
  /** Bootstrap rounds of the analyses (default 400) and their random seed. */
  boot?: number;
  seed?: number;
}

export interface RefineResult {
  candidates: Candidate[];
  /** Ridge points seen at the target epoch, per slice (for reporting). */
  peaks: { fixed: Record<string, number | string>; peak: Peak; significant: boolean }[];
  notes: string[];
}

/**
 * Grid steps within 10% of the resolution count as resolved: integer rounding makes a √2 grid's
 * steps 0.49–0.51 octaves, and those should not be split unevenly.
 */
const SLACK = 1.1;

/** One-sided normal quantile through Student t with very many degrees of freedom. */
const zOf = (p: number) => tQuantile(1 - p, 1e7);

const fmt = (v: number) => formatNumber(v, 4);

/**
 * Refinement proposals from the analyses at the spec's target epoch (DESIGN.md §5 "Plan"):
 * - refine: for each significant ridge point along width (per condition, noise and train size)
 *   whose bracket (largest measured width at or below its interval to the smallest at or above)
 *   spans more than `resolution` octaves, the geometric midpoint (bisection in log space) of
 *   every grid step in the bracket coarser than `resolution`: a parabola through cells far
 *   apart pins the peak no better than the grid does. Value: the bracket's octaves shared
 *   among its new widths. A slice with no peak resolved but an interpolation threshold gets
 *   the midpoint of the grid step holding the threshold (the peak is expected near it), at
 *   half that value.
 * - seeds: where a peak is borderline (prominence within a factor 1.5 of the minimum, either
 *   side) extra seeds at the peak cell and its two neighbours; where a hurts segment is
 *   borderline (p within a factor 4 of alpha, either side) extra seeds at its onset and peak.
 *   The number of seeds is what would move the statistic to the safe side if the effect is real
 *   (standard errors shrink as 1/√n); value 1 at the threshold, falling to 0 at the edge of
 *   the borderline band.
 * The values are our own heuristic scale, comparable across the two kinds.
 */
export function proposeRefinements(opts: RefineOptions): RefineResult {
  const { table, spec, metric, resolution = 0.5, minProminence = 2, alpha = 0.05, boot = 400, seed = 1 } = opts;
  const notes: string[] = [];
  const peaks: RefineResult['peaks'] = [];
  const candidates: Candidate[] = [];
  const cells = buildCells(table, { metric, epochs: [spec.epochs] }).filter(
    (c) => sameValue(c.epochs, spec.epochs) && spec.conditions.includes(c.condition) && spec.axes.label_noise.some((l) => sameValue(l, c.label_noise)),
  );
  const integerWidths = spec.axes.width.every(Number.isInteger);
  const seedIds = new Map<string, Set<number>>();
  const cfgKey = configKey;
  for (let i = 0; i < table.length; i++) {
    const k = cfgKey({ condition: table.condition[i], label_noise: table.label_noise[i], width: table.width[i], train_size: table.train_size[i] });
    let s = seedIds.get(k);
    if (!s) seedIds.set(k, (s = new Set()));
    s.add(table.seed[i]);
  }
  // Fresh seed ids for a configuration: above every id the spec or the store uses there.
  const freshSeeds = (cfg: Omit<SpecRun, 'seed'>, k: number): number[] => {
    const used = [...(seedIds.get(cfgKey(cfg)) ?? []), ...spec.seeds].filter(Number.isFinite);
    const start = Math.max(-1, ...used) + 1;
    return Array.from({ length: k }, (_, i) => start + i);
  };
  const seedsCandidate = new Map<string, Candidate>();
  const addSeeds = (cfg: Omit<SpecRun, 'seed'>, k: number, value: number, why: string) => {
    const key = cfgKey(cfg);
    const prev = seedsCandidate.get(key);
    if (prev && prev.runs.length >= k && prev.value >= value) return;
    seedsCandidate.set(key, {
      reason: 'seeds',
      runs: freshSeeds(cfg, Math.max(k, prev?.runs.length ?? 0)).map((s) => ({ ...cfg, seed: s })),
      value: Math.max(value, prev?.value ?? 0),
      why,
    });
  };

  // Ridge along width, per (condition, noise, train size) slice at the target epoch.
  const slices = new Map<string, Cell[]>();
  for (const c of cells) {
    const k = `${c.condition}\u0000${c.label_noise}\u0000${c.train_size}`;
    const list = slices.get(k) ?? [];
    list.push(c);
    slices.set(k, list);
  }
  const proposedWidths = new Set<string>();
  for (const slice of slices.values()) {
    const { condition, label_noise, train_size } = slice[0];
    const widths = [...new Set(slice.filter((c) => c.stats.n > 0).map((c) => c.width))].sort((a, b) => a - b);
    if (widths.length < 3) continue;
    const scale = detectScale(widths);
    const x: MapAxis = { name: 'width', scale, values: widths, edges: cellEdges(scale, widths) };
    const y: MapAxis = { name: 'epochs', scale: 'log2', values: [spec.epochs], edges: cellEdges('log2', [spec.epochs]) };
    const mapCells: MapCell[] = slice.filter((c) => c.stats.n > 0).map((c) => ({ x: c.width, y: spec.epochs, cell: c }));
    const fixed = { condition, label_noise, train_size };
    // A lower bar finds near-miss peaks too (borderline from below).
    const lowBar = minProminence / 1.5;
    const ridge = findRidge({ kind: 'model', x, y, cells: mapCells, fixed, metric: slice[0].metric }, { minProminence: lowBar, boot, seed });
    const row = ridge.rows[0];
    const found = row ? [row.peak, ...row.others].filter((p): p is Peak => p !== null) : [];
    const where = `${condition ? `${condition}, ` : ''}noise ${label_noise}, n ${fmt(train_size)}`;
    const propose = (m: number, value: number, why: string) => {
      const k = `${condition}\u0000${label_noise}\u0000${train_size}\u0000${m}`;
      if (proposedWidths.has(k)) return;
      proposedWidths.add(k);
      const cfg = { condition, label_noise, train_size, width: m };
      candidates.push({ reason: 'refine', runs: spec.seeds.map((s) => ({ ...cfg, seed: s })), value, why });
    };
    const midpoint = (a: number, b: number): number | null => {
      let m = Math.sqrt(a * b);
      if (integerWidths) m = Math.round(m);
      return m > a && m < b ? m : null;
    };
    // No peak resolved: the peak is expected near the interpolation threshold (Nakkiran et al.
    // 2019, effective model complexity ≈ n), so bisect the grid step that holds the threshold.
    if (found.length === 0 && row && row.threshold !== null && !row.thresholdAtEdge) {
      const a = widths.filter((w) => w <= row.threshold!).at(-1);
      const b = widths.find((w) => w >= row.threshold!);
      const m = a !== undefined && b !== undefined && Math.log2(b / a) > resolution * SLACK ? midpoint(a, b) : null;
      // Half the value of a resolved ridge point: the peak is only expected there.
      if (m !== null) propose(m, Math.log2(b! / a!) / 2, msg.whyThreshold(where, fmt(row.threshold), fmt(a!), fmt(b!)));
    }
    for (const p of found) {
      const significant = p.prominenceSe >= minProminence;
      peaks.push({ fixed, peak: p, significant });
      const n = Math.min(...slice.filter((c) => widths.indexOf(c.width) >= 0 && Math.abs(widths.indexOf(c.width) - widths.indexOf(p.cellX)) <= 1).map((c) => c.stats.n));
      // Borderline peak: extra seeds at the three cells the peak rests on.
      if (p.prominenceSe < minProminence * 1.5) {
        const target = minProminence * 1.5;
        const k = Math.max(1, Math.min(n, Math.ceil(n * ((target / p.prominenceSe) ** 2 - 1))));
        const value = 1 - Math.abs(Math.log(p.prominenceSe / minProminence)) / Math.log(1.5);
        const i = widths.indexOf(p.cellX);
        for (const w of widths.slice(Math.max(0, i - 1), i + 2))
          addSeeds({ condition, label_noise, train_size, width: w }, k, value, msg.whyPeakSeeds(where, fmt(p.x), p.prominenceSe, minProminence));
      }
      if (!significant) continue;
      // The grid resolves the peak only to the measured widths around its interval (the
      // bracket); bisect every grid step inside the bracket that is coarser than `resolution`.
      const lo = widths.filter((w) => w <= p.low).at(-1) ?? widths[0];
      const hi = widths.find((w) => w >= p.high) ?? widths[widths.length - 1];
      const octaves = Math.log2(hi / lo);
      if (!(octaves > resolution * SLACK)) continue;
      const mids: number[] = [];
      for (let i = 0; i + 1 < widths.length; i++) {
        const a = widths[i], b = widths[i + 1];
        if (a < lo || b > hi || !(Math.log2(b / a) > resolution * SLACK)) continue;
        const m = midpoint(a, b);
        if (m !== null) mids.push(m);
      }
      for (const m of mids) propose(m, octaves / mids.length, msg.whyRefine(where, fmt(p.x), fmt(p.low), fmt(p.high), fmt(lo), fmt(hi)));
    }
  }

  // Hurts segments along train size at the target epoch; a wider alpha finds near misses.
  const wideAlpha = Math.min(0.5, alpha * 4);
  const hurts = findHurts(cells, { alpha: wideAlpha, boot, seed });
  for (const s of hurts.segments) {
    if (!(s.p >= alpha / 4 && s.p < wideAlpha)) continue;
    const value = 1 - Math.abs(Math.log(s.p / alpha)) / Math.log(4);
    const condition = String(s.fixed.condition ?? '');
    const label_noise = Number(s.fixed.label_noise);
    const width = Number(s.fixed.width);
    const at = (n: number) => cells.find((c) => c.condition === condition && sameValue(c.label_noise, label_noise) && sameValue(c.width, width) && sameValue(c.train_size, n));
    const nNow = Math.min(at(s.onset)?.stats.n ?? 1, at(s.peak)?.stats.n ?? 1);
    // Test statistic grows as √n: seeds that would bring p to alpha/4 if the rise is real.
    const k = Math.max(1, Math.min(Math.max(nNow, 1), Math.ceil(nNow * ((zOf(alpha / 4) / Math.max(zOf(s.p), 1e-6)) ** 2 - 1))));
    for (const n of [s.onset, s.peak])
      addSeeds({ condition, label_noise, width, train_size: n }, k, value,
        msg.whyHurtsSeeds(`${condition ? `${condition}, ` : ''}width ${fmt(width)}, noise ${label_noise}`, fmt(s.onset), fmt(s.peak), s.p, alpha));
  }
  if (peaks.length === 0 && cells.length > 0) notes.push(msg.noteNoRidge());
  candidates.push(...seedsCandidate.values());
  return { candidates, peaks, notes };
}
