import type { HurtsResult } from '../analysis/Hurts.js';
import { findHurts } from '../analysis/findHurts.js';
import { findRidge } from '../analysis/findRidge.js';
import type { RidgeResult } from '../analysis/Ridge.js';
import { buildCells } from '../cells/buildCells.js';
import { buildMap } from '../grid/buildMap.js';
import { MAP_AXES } from '../grid/SweepMap.js';
import type { MapKind, SweepMap } from '../grid/SweepMap.js';
import { report as msg } from '../messages.js';
import type { CoverageResult } from '../plan/coverage.js';
import type { PlanResult } from '../plan/Plan.js';
import type { SweepSpec } from '../plan/SweepSpec.js';
import { coverageSpec } from '../render/coverageSpec.js';
import { defaultMetric } from '../store/RowTable.js';
import type { Metric, RowTable } from '../store/RowTable.js';
import { formatFixed, formatNumber } from '../formatNumber.js';
import { headlineFindings, metricWords, variantCautions } from './headlineFindings.js';
import type { CoverageSummary, MapSection, MapVariant, PlanSummary, ReportFacts, ReportModel } from './ReportModel.js';
import { rowConfigKey, rowText } from '../store/rowKeys.js';

export interface BuildReportOptions {
  table: RowTable;
  title: string;
  metric?: Metric;
  dataDate?: string | null;
  storeHash?: string | null;
  coverage?: CoverageResult | null;
  /** The spec the coverage was measured against (for the coverage chart). */
  spec?: SweepSpec | null;
  plan?: PlanResult | null;
  /** Report time (ISO); default now. */
  now?: string;
  /** Values per fixed axis offered by a map's selector (default 5; epochs at most 4). */
  perAxis?: number;
  /** Bootstrap rounds of the ridge and hurts analyses (default 400) and their random seed (default 1). */
  boot?: number;
  seed?: number;
  /** Called as each map variant is done (progress). */
  onStep?: (stage: string) => void;
}

const KINDS: MapKind[] = ['model', 'sample', 'epoch'];
const FIXED_KEYS = ['width', 'epochs', 'train_size', 'label_noise', 'condition'] as const;

function distinct(col: ArrayLike<number>, ok?: (i: number) => boolean): number[] {
  const s = new Set<number>();
  for (let i = 0; i < col.length; i++) if (Number.isFinite(col[i]) && (!ok || ok(i))) s.add(col[i]);
  return [...s].sort((a, b) => a - b);
}

function columnValues(table: RowTable, key: string): (number | string)[] {
  if (key === 'condition') return [...new Set(table.condition)].sort();
  return distinct(table[key as 'width' | 'epochs' | 'train_size' | 'label_noise']);
}

/** Up to `k` values spread evenly over the list (by index; the list is log-spaced for most axes), always keeping `keep`. */
function spread<T>(values: T[], k: number, keep: T): T[] {
  if (values.length <= k) return values;
  const out = new Set<T>([keep]);
  for (let i = 0; out.size < k && i < k; i++) out.add(values[Math.round((i * (values.length - 1)) / (k - 1))]);
  return values.filter((v) => out.has(v));
}

function facts(table: RowTable, opts: BuildReportOptions, metric: Metric): ReportFacts {
  const runs = new Set(table.run);
  const perConfig = new Map<string, Set<number>>();
  const text = rowText(table);
  let diverged = 0;
  const divergedRuns = new Set<string>();
  for (let i = 0; i < table.length; i++) {
    if (table.status[i] === 'diverged') {
      diverged++;
      divergedRuns.add(table.run[i]);
    }
    const k = rowConfigKey(table, text, i);
    let s = perConfig.get(k);
    if (!s) perConfig.set(k, (s = new Set()));
    s.add(table.seed[i]);
  }
  const counts = [...perConfig.values()].map((s) => s.size);
  return {
    title: opts.title,
    runs: runs.size,
    rows: table.length,
    seeds: { distinct: distinct(table.seed).length, perCellMin: counts.length ? Math.min(...counts) : 0, perCellMax: counts.length ? Math.max(...counts) : 0 },
    axes: (['width', 'epochs', 'train_size', 'label_noise'] as const).map((name) => ({ name, values: distinct(table[name]) })),
    conditions: [...new Set(table.condition)].sort(),
    metric,
    dataDate: opts.dataDate ?? null,
    storeHash: opts.storeHash ?? null,
    generatedAt: opts.now ?? new Date().toISOString(),
    diverged,
    divergedRuns: divergedRuns.size,
  };
}

/** Why the sweep cannot support a map of this kind, or null when it can. */
function unsupported(table: RowTable, kind: MapKind): string | null {
  const { x, y } = MAP_AXES[kind];
  const nx = distinct(table[x as 'width']).length;
  const ny = distinct(table[y as 'width']).length;
  // A peak needs a rise and a fall along x: three values at least; a map needs two rows.
  if (nx < 3) return msg.skipAxis(x, nx, 3);
  if (ny < 2) return msg.skipAxis(y, ny, 2);
  return null;
}

/** The selector's label of a variant: the varying axes first, then the rest. */
function variantLabel(fixed: Record<string, number | string>, selector: string[]): string {
  const first: Record<string, number | string> = {};
  for (const k of selector) if (k in fixed) first[k] = fixed[k];
  return formatFixed({ ...first, ...fixed });
}

/** Variants only feed the interactive measured-cell maps, ridges and facets: no field is drawn from them, so a cheap one will do. */
const VARIANT_FIELD = { method: 'linear', raster: { nx: 8, ny: 8 } } as const;

/** At most this many variants of one map kind come from a full product of fixed values; beyond it, one axis at a time. */
const MAX_PRODUCT = 16;

/** Rows with a significant peak, then their summed prominence (in standard errors): how much a map shows. */
function peakScore(r: RidgeResult | null): [number, number] {
  const rows = (r?.rows ?? []).filter((x) => x.peak !== null);
  return [rows.length, rows.reduce((a, x) => a + (Number.isFinite(x.peak!.prominenceSe) ? x.peak!.prominenceSe : 0), 0)];
}

function mapSection(
  table: RowTable,
  kind: MapKind,
  o: { metric: Metric; perAxis: number; boot: number; seed: number; onStep?: (stage: string) => void; at?: Record<string, number | string> },
): MapSection | null {
  // The tool's own pick (most data) fixes the values not given; a cheap field is enough to learn them.
  const first = buildMap(table, { kind, metric: o.metric, ...VARIANT_FIELD, ...(o.at ? { at: o.at } : {}) });
  if (first.cells.length === 0) return null;
  // Epoch-wise rows are curves along epochs: the shown map keeps 100 epochs, but the curve model
  // smooths and tests on every logged epoch (as `datlas ridge` does); thinned, a flat curve's
  // spikes read as peaks.
  const ridgeOf = (map: SweepMap): RidgeResult | null => {
    if (map.cells.length < 3) return null;
    const dense = kind === 'epoch' ? buildMap(table, { kind, metric: o.metric, ...VARIANT_FIELD, at: { ...map.fixed }, maxEpochs: 10_000 }) : map;
    return findRidge(dense, { boot: o.boot, seed: o.seed, nullRounds: o.boot });
  };
  o.onStep?.(`analysing the ${kind}-wise maps`);

  // Values offered per fixed axis (the pick always among them).
  const axes: { key: string; values: (number | string)[] }[] = [];
  for (const key of FIXED_KEYS) {
    if (!(key in first.fixed)) continue;
    const all = columnValues(table, key);
    if (all.length < 2) continue;
    // Big maps make a big page (every variant's cells travel inside it): offer fewer values then.
    const per = first.cells.length > 2500 ? Math.min(3, o.perAxis) : o.perAxis;
    const k = key === 'epochs' ? Math.min(4, per) : per;
    axes.push({ key, values: spread(all as (number | string)[], k, first.fixed[key]) });
  }
  const product = axes.reduce((a, x) => a * x.values.length, 1);
  const ats: Record<string, number | string>[] = [];
  if (product <= (first.cells.length > 2500 ? MAX_PRODUCT / 2 : MAX_PRODUCT)) {
    // Every combination: small enough, and it lets findings compare train sizes at each noise level.
    let combos: Record<string, number | string>[] = [{ ...first.fixed }];
    for (const { key, values } of axes) combos = combos.flatMap((c) => values.map((v) => ({ ...c, [key]: v })));
    ats.push(...combos.filter((c) => axes.some(({ key }) => c[key] !== first.fixed[key])));
  } else {
    for (const { key, values } of axes) for (const v of values) if (v !== first.fixed[key]) ats.push({ ...first.fixed, [key]: v });
  }
  const maps: SweepMap[] = [first];
  for (const at of ats) {
    try {
      const m = buildMap(table, { kind, metric: o.metric, ...VARIANT_FIELD, at });
      if (m.cells.length >= 3) maps.push(m);
    } catch {
      // A slice the sweep does not cover (buildMap refuses it): nothing to offer there.
    }
    o.onStep?.(`analysing the ${kind}-wise maps`);
  }
  const selector = axes.map((a) => a.key).filter((key) => new Set(maps.map((m) => m.fixed[key])).size > 1);
  const variants: MapVariant[] = maps.map((map) => ({ label: variantLabel(map.fixed, selector), map, ridge: ridgeOf(map), cautions: [] }));

  // Shown first: the variant with the most significant peaks (ties: the most data, the tool's pick).
  let best = 0;
  for (let i = 1; i < variants.length; i++) {
    const [a, b] = [peakScore(variants[i].ridge), peakScore(variants[best].ridge)];
    if (a[0] > b[0] || (a[0] === b[0] && a[1] > b[1] + 1e-9)) best = i;
  }
  // The shown map gets the full treatment: interpolation chosen by leave-one-out, full raster.
  const full = buildMap(table, { kind, metric: o.metric, method: 'auto', at: { ...variants[best].map.fixed } });
  full.picked = best === 0 ? first.picked : [];
  variants[best] = { ...variants[best], map: full };
  for (const v of variants) v.cautions = variantCautions(v, kind);

  // Keep the selector in a reading order: sorted by the selector axes' values.
  const order = variants.map((_, i) => i);
  const keyOf = (v: MapVariant) => selector.map((k) => v.map.fixed[k]);
  order.sort((a, b) => {
    const ka = keyOf(variants[a]);
    const kb = keyOf(variants[b]);
    for (let i = 0; i < ka.length; i++) {
      if (ka[i] === kb[i]) continue;
      return typeof ka[i] === 'number' && typeof kb[i] === 'number' ? (ka[i] as number) - (kb[i] as number) : String(ka[i]).localeCompare(String(kb[i]));
    }
    return 0;
  });
  return {
    kind,
    x: MAP_AXES[kind].x,
    y: MAP_AXES[kind].y,
    selector,
    variants: order.map((i) => variants[i]),
    main: order.indexOf(best),
    chosen: best === 0 ? 'data' : 'peaks',
  };
}

/** `{ width, train_size, label_noise }` of the model-wise peak at its latest epoch, width snapped to a measured one. */
function nearPeakWidth(model: MapSection | undefined, widths: number[]): Record<string, number | string> | undefined {
  const main = model?.variants[model.main];
  const rows = (main?.ridge?.rows ?? []).filter((r) => r.peak !== null).sort((a, b) => b.y - a.y);
  if (!main || rows.length === 0 || widths.length === 0) return undefined;
  const x = rows[0].peak!.x;
  const width = widths.reduce((best, w) => (Math.abs(Math.log(w / x)) < Math.abs(Math.log(best / x)) ? w : best), widths[0]);
  const at: Record<string, number | string> = { width };
  if (typeof main.map.fixed.label_noise === 'number') at.label_noise = main.map.fixed.label_noise;
  return at;
}

function coverageSummary(c: CoverageResult): CoverageSummary {
  return {
    counts: { complete: c.counts.complete, partial: c.counts.partial, missing: c.counts.missing, diverged: c.counts.diverged },
    gaps: c.runs
      .filter((r) => r.status !== 'complete')
      .map((r) => ({
        config: { ...(r.condition ? { condition: r.condition } : {}), label_noise: r.label_noise, width: r.width, train_size: r.train_size },
        seed: r.seed,
        status: r.status === 'partial' && r.epoch !== null ? `partial (stopped at epoch ${formatNumber(r.epoch)})` : r.status,
      })),
  };
}

function planSummary(p: PlanResult): PlanSummary {
  return {
    budget: p.budget,
    cost: p.cost,
    units: p.model.units,
    runs: p.runs.map((r) => ({
      config: { ...(r.condition ? { condition: r.condition } : {}), label_noise: r.label_noise, width: r.width, train_size: r.train_size },
      seed: r.seed,
      epochs: r.epochs,
      reason: r.reason,
      cost: r.cost,
      why: r.why,
    })),
  };
}

/**
 * Everything the report shows, computed from the store's table: the sweep's facts; the
 * model-, sample- and epoch-wise maps (each at its most-data fixed values, plus variants along
 * one fixed axis at a time for the page's selector) with their ridges; the hurts scan at the
 * sample map's epoch; coverage and plan when given; headline findings and the warnings a
 * reader needs. Kinds the sweep cannot support are listed with the reason.
 */
export function buildReport(opts: BuildReportOptions): ReportModel {
  const { table } = opts;
  const metric = opts.metric ?? defaultMetric(table);
  const o = { metric, perAxis: opts.perAxis ?? 5, boot: opts.boot ?? 400, seed: opts.seed ?? 1, onStep: opts.onStep };
  const maps: MapSection[] = [];
  const skipped: ReportModel['skipped'] = [];
  for (const kind of KINDS) {
    const why = unsupported(table, kind);
    if (why) {
      skipped.push({ kind, reason: why });
      continue;
    }
    // Epoch-wise double descent shows best near the interpolation threshold: draw the epoch map
    // at the measured width nearest the model-wise peak (latest epoch), when there is one.
    const at = kind === 'epoch' ? nearPeakWidth(maps.find((m) => m.kind === 'model'), distinct(table.width)) : undefined;
    const sec = mapSection(table, kind, { ...o, at });
    if (sec) maps.push(sec);
    else skipped.push({ kind, reason: msg.skipNoCells });
  }

  // More data hurts: along train size at every width and noise, at the epoch the sample map uses.
  let hurts: HurtsResult | null = null;
  if (distinct(table.train_size).length >= 3) {
    const sample = maps.find((m) => m.kind === 'sample');
    const epochs = sample ? sample.variants[sample.main].map.fixed.epochs : Math.max(...distinct(table.epochs));
    const at: Record<string, number | string> = typeof epochs === 'number' ? { epochs } : {};
    const cells = buildCells(table, { metric, ...(typeof epochs === 'number' ? { epochs: [epochs] } : {}) });
    hurts = findHurts(cells, { at, boot: o.boot, seed: o.seed });
  }

  const coverage = opts.coverage ? coverageSummary(opts.coverage) : null;
  if (coverage && opts.coverage && opts.spec) coverage.figure = coverageSpec({ coverage: opts.coverage, spec: opts.spec });
  const plan = opts.plan ? planSummary(opts.plan) : null;
  const f = facts(table, opts, metric);
  const findings = headlineFindings({ maps, hurts, coverage, plan, facts: f });

  const cautions: string[] = [];
  for (const sec of maps) {
    const main = sec.variants[sec.main];
    cautions.push(...main.cautions);
  }
  if (f.seeds.perCellMin === 1) cautions.push(msg.oneSeed);
  if (metric === 'test_loss' || metric === 'train_loss') cautions.push(msg.heavyTail(metricWords(metric)));
  const first = maps[0]?.variants[maps[0].main]?.map;
  if (first) cautions.push(msg.interpolated(first.method, formatNumber(first.loo.rmse)));
  if (hurts && (hurts.slices ?? 0) > 1)
    cautions.push(
      hurts.correction === 'benjamini-hochberg'
        ? msg.hurtsCorrected(hurts.slices ?? 0, formatNumber(hurts.alpha ?? 0.05))
        : msg.hurtsMultiple(hurts.slices ?? 0, formatNumber(hurts.alpha ?? 0.05)),
    );

  return { facts: f, findings, cautions, maps, skipped, hurts: hurts ? [hurts] : [], coverage, plan };
}
