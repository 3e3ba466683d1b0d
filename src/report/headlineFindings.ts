import type { HurtsResult } from '../analysis/Hurts.js';
import type { RidgeRow } from '../analysis/Ridge.js';
import { report as msg } from '../messages.js';
import { formatCost, formatFixed, formatNumber } from '../formatNumber.js';
import { thresholdText } from './reportTables.js';
import type { CoverageSummary, MapSection, MapVariant, PlanSummary, ReportFacts } from './ReportModel.js';

/** Prominence (in pooled standard errors) under which a peak is "inside seed noise" (about a one-sided 95% z level; common practice). */
export const SIGNIFICANT_SE = 2;

export interface FindingsInput {
  maps: MapSection[];
  /** Hurts scan of the sweep (usually at its last common epoch), null when there is no sample axis. */
  hurts: HurtsResult | null;
  coverage: CoverageSummary | null;
  plan: PlanSummary | null;
  /** The sweep's facts (seeds per configuration, diverged runs), when known. */
  facts?: ReportFacts;
}

const fmt = (v: number | null | undefined) => formatNumber(v);

/** "test error", "test loss", ... for sentences. */
export const metricWords = (m: string) => m.replace('_', ' ');

/** The fixed values of a map without the one a sentence already names. */
function fixedWithout(fixed: Record<string, number | string>, drop: string[] = []): string {
  const f: Record<string, number | string> = {};
  for (const [k, v] of Object.entries(fixed)) if (!drop.includes(k)) f[k] = v;
  return formatFixed(f);
}

const peaked = (rows: RidgeRow[]) => rows.filter((r) => r.peak !== null).sort((a, b) => a.y - b.y);

/** The highest-y ridge row with a peak: for the model map, the latest epoch. */
function lastPeak(v: MapVariant): RidgeRow | null {
  const rows = peaked(v.ridge?.rows ?? []);
  return rows.length ? rows[rows.length - 1] : null;
}

function modelFindings(sec: MapSection): string[] {
  const out: string[] = [];
  const main = sec.variants[sec.main];
  if (!main) return out;
  const rows = main.ridge?.rows ?? [];
  const withPeak = peaked(rows);
  const fixed = fixedWithout(main.map.fixed);
  if (withPeak.length === 0) {
    out.push(msg.modelNoPeak(fixed));
  } else {
    const last = withPeak[withPeak.length - 1];
    const p = last.peak!;
    const n = main.map.fixed.train_size;
    const ratio = typeof n === 'number' && n > 0 ? formatNumber(p.x / n, 3) : null;
    out.push(msg.modelPeak(metricWords(main.map.metric), sec.y, fmt(last.y), fixed, sec.x, fmt(p.x), fmt(p.low), fmt(p.high), ratio, last.threshold === null ? null : thresholdText(last, sec.x)));
    if (withPeak.length >= 2) {
      const first = withPeak[0];
      const noneBefore = rows.some((r) => r.y < first.y && r.peak === null);
      out.push(msg.modelPeakMoves(sec.y, fmt(first.y), sec.x, fmt(first.peak!.x), fmt(p.x), fmt(last.y), noneBefore));
    }
  }
  // The interpolation threshold over training time (effective model complexity grows with epochs).
  // A threshold at the sweep's edge is only a bound: it cannot show the threshold moving.
  const withThr = rows.filter((r) => r.threshold !== null && !r.thresholdAtEdge).sort((a, b) => a.y - b.y);
  if (withThr.length >= 2 && withThr[0].threshold !== withThr[withThr.length - 1].threshold) {
    const a = withThr[0];
    const b = withThr[withThr.length - 1];
    const n = main.map.fixed.train_size;
    out.push(msg.thresholdMoves(sec.y, fmt(a.y), fmt(b.y), sec.x, fmt(a.threshold), fmt(b.threshold), typeof n === 'number' ? fmt(n) : null, b.threshold! < a.threshold!));
  }
  // Train size: where the peak sits relative to n at every train size (the same noise and condition).
  const sameBut = (key: string) => {
    const rest = Object.entries(main.map.fixed).filter(([k]) => k !== key);
    return sec.variants.filter((v) => typeof v.map.fixed[key] === 'number' && rest.every(([k, val]) => v.map.fixed[k] === val)).sort((a, b) => (a.map.fixed[key] as number) - (b.map.fixed[key] as number));
  };
  const bySize = sameBut('train_size');
  if (bySize.length >= 2) {
    const parts = bySize.map((v) => {
      const r = lastPeak(v);
      const n = v.map.fixed.train_size as number;
      return r ? `n ${fmt(n)} → width ${fmt(r.peak!.x)} (${formatNumber(r.peak!.x / n, 3)} × n)` : `n ${fmt(n)} → no significant peak`;
    });
    const ratios = bySize.flatMap((v) => {
      const r = lastPeak(v);
      return r ? [r.peak!.x / (v.map.fixed.train_size as number)] : [];
    });
    // "≈ n" only when every peak is within a factor √2 of n (about the resolution of a 4-per-doubling grid's neighbours; common practice).
    if (ratios.length) out.push(msg.peakBySize(parts.join(', '), ratios.every((q) => q > Math.SQRT1_2 && q < Math.SQRT2)));
  }
  // Label noise: the variants that differ from the main one only in label_noise.
  const others = Object.entries(main.map.fixed).filter(([k]) => k !== 'label_noise');
  const byNoise = sec.variants
    .filter((v) => typeof v.map.fixed.label_noise === 'number' && others.every(([k, val]) => v.map.fixed[k] === val))
    .sort((a, b) => (a.map.fixed.label_noise as number) - (b.map.fixed.label_noise as number));
  if (byNoise.length >= 2 && byNoise.some((v) => lastPeak(v) !== null)) {
    const heights = byNoise.map((v) => {
      const r = lastPeak(v);
      return { noise: v.map.fixed.label_noise as number, prominence: r?.peak?.prominence ?? 0, row: r };
    });
    const parts = heights
      .map((h) => `noise ${fmt(h.noise)}: ${h.row ? `${fmt(h.row.peak!.prominence)} at ${sec.x} ${fmt(h.row.peak!.x)}` : 'no peak'}`)
      .join('; ');
    const diffs = heights.slice(1).map((h, i) => h.prominence - heights[i].prominence);
    const trend = diffs.every((d) => d > 0) ? 'grows' : diffs.every((d) => d < 0) ? 'shrinks' : 'mixed';
    out.push(msg.noiseEffect(parts, trend));
  }
  // Conditions (optimizer, weight decay, ...): the same map under each, when the sweep has several.
  const rest = Object.entries(main.map.fixed).filter(([k]) => k !== 'condition');
  const byCondition = sec.variants.filter((v) => typeof v.map.fixed.condition === 'string' && rest.every(([k, val]) => v.map.fixed[k] === val));
  if (byCondition.length >= 2) {
    const parts = byCondition
      .map((v) => {
        const r = lastPeak(v);
        return `${v.map.fixed.condition || '(none)'}: ${r ? `width ${fmt(r.peak!.x)}, height ${fmt(r.peak!.prominence)} at ${sec.y} ${fmt(r.y)}` : 'no significant peak'}`;
      })
      .join('; ');
    out.push(msg.conditionEffect(parts));
  }
  return out;
}

function sampleFindings(sec: MapSection): string[] {
  const main = sec.variants[sec.main];
  if (!main) return [];
  const withPeak = peaked(main.ridge?.rows ?? []);
  if (withPeak.length === 0) return [msg.sampleNoPeak(fixedWithout(main.map.fixed))];
  // Rows are widths: say where the peak sits relative to each width (a few, spread out).
  const pick = withPeak.length <= 3 ? withPeak : [withPeak[0], withPeak[Math.floor(withPeak.length / 2)], withPeak[withPeak.length - 1]];
  const parts = pick
    .map((r) => `${sec.x} ${fmt(r.peak!.x)} for ${sec.y} ${fmt(r.y)}${sec.y === 'width' ? ` (${formatNumber(r.peak!.x / r.y, 2)} × the width)` : ''}`)
    .join(', ');
  return [msg.samplePeaks(metricWords(main.map.metric), parts, fixedWithout(main.map.fixed))];
}

function epochFindings(sec: MapSection): string[] {
  const main = sec.variants[sec.main];
  if (!main) return [];
  const withPeak = peaked(main.ridge?.rows ?? []);
  if (withPeak.length === 0) return [msg.epochNoPeak(metricWords(main.map.metric), fixedWithout(main.map.fixed))];
  const pick = withPeak.length <= 3 ? withPeak : [withPeak[0], withPeak[withPeak.length - 1]];
  const parts = pick.map((r) => `${sec.y} ${fmt(r.y)} (peak at epoch ${fmt(r.peak!.x)}, height ${fmt(r.peak!.prominence)})`).join(', ');
  return [msg.epochPeak(metricWords(main.map.metric), parts, fixedWithout(main.map.fixed))];
}

function hurtsFindings(h: HurtsResult): string[] {
  const segs = h.segments;
  if (segs.length === 0) return [msg.hurtsNone(h.slices ?? 0, formatFixed(h.fixed) || 'any epoch')];
  const s = segs[0];
  const w = s.fixed.width;
  const ratio = typeof w === 'number' && w > 0 ? formatNumber(s.peak / w, 2) : null;
  const slicesWith = new Set(segs.map((x) => JSON.stringify(x.fixed))).size;
  if (h.correction === 'benjamini-hochberg' && s.pAdjusted !== undefined) {
    const pa = s.pAdjusted < 1e-4 ? '< 1e-4' : `= ${formatNumber(s.pAdjusted, 2)}`;
    return [msg.hurtsOf(metricWords(h.metric), formatFixed(s.fixed), fmt(s.onset), fmt(s.peak), fmt(s.rise), pa, ratio, s.recovery === null ? null : fmt(s.recovery), h.slicesWithRise ?? slicesWith, h.slices ?? slicesWith)];
  }
  const p = s.p < 1e-4 ? '< 1e-4' : `= ${formatNumber(s.p, 2)}`;
  return [msg.hurts(metricWords(h.metric), formatFixed(s.fixed), fmt(s.onset), fmt(s.peak), fmt(s.rise), p, ratio, s.recovery === null ? null : fmt(s.recovery), slicesWith - 1)];
}

/** Variant-level warnings: peaks inside seed noise, intervals from curve noise. */
export function variantCautions(v: MapVariant, kind: string): string[] {
  const out: string[] = [];
  const rows = v.ridge?.rows ?? [];
  const y = v.map.y.name;
  const list = (rs: RidgeRow[]) => (rs.length <= 4 ? rs.map((r) => fmt(r.y)).join(', ') : `${fmt(rs[0].y)}, ${fmt(rs[1].y)}, … ${fmt(rs[rs.length - 1].y)} (${rs.length} rows)`);
  const weak = rows.filter((r) => r.peak !== null && !(r.peak.prominenceSe >= SIGNIFICANT_SE));
  if (weak.length) out.push(msg.weakPeaks(kind, v.label, y, list(weak)));
  const smoothed = rows.filter((r) => r.peak !== null && r.model === 'smoothed-curve');
  if (smoothed.length) out.push(msg.smoothedPeaks(kind, v.label, y, list(smoothed)));
  const curve = rows.filter((r) => r.peak !== null && r.noiseFrom === 'curve' && r.model !== 'smoothed-curve');
  if (curve.length) out.push(msg.curveNoise(kind, v.label, y, list(curve)));
  return out;
}

/** Headline findings in plain sentences, from the report's analyses (nothing else is computed here). */
export function headlineFindings(input: FindingsInput): string[] {
  const out: string[] = [];
  const byKind = (k: string) => input.maps.find((m) => m.kind === k);
  const model = byKind('model');
  if (model) out.push(...modelFindings(model));
  const sample = byKind('sample');
  if (sample) out.push(...sampleFindings(sample));
  if (input.hurts) out.push(...hurtsFindings(input.hurts));
  const epoch = byKind('epoch');
  if (epoch) out.push(...epochFindings(epoch));
  if (input.coverage) {
    const c = input.coverage.counts;
    const total = c.complete + c.partial + c.missing + c.diverged;
    out.push(c.complete === total ? msg.coverageComplete(total) : msg.coverage(c.missing, c.partial, c.diverged, c.complete, total));
  } else if (model) {
    const m = model.variants[model.main]?.map;
    if (m && m.missing.length) out.push(msg.mapGaps('model', m.missing.length, m.missing.length + m.cells.length));
  }
  const f = input.facts;
  if (f && f.seeds.perCellMin < f.seeds.perCellMax) out.push(msg.unevenSeeds(f.seeds.perCellMin, f.seeds.perCellMax));
  if (f && f.divergedRuns) out.push(msg.divergedRuns(f.divergedRuns, f.runs));
  if (input.plan && input.plan.runs.length) {
    const counts = new Map<string, number>();
    for (const r of input.plan.runs) counts.set(r.reason, (counts.get(r.reason) ?? 0) + 1);
    const reasons = [...counts].map(([r, n]) => `${n} ${r}`).join(', ');
    out.push(msg.plan(input.plan.runs.length, formatCost(input.plan.cost, input.plan.units), reasons));
  }
  return out;
}
