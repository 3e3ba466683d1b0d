import type { HurtsResult } from '../analysis/Hurts.js';
import type { RidgeResult } from '../analysis/Ridge.js';
import { formatCost, formatFixed, formatNumber } from '../formatNumber.js';
import { report as msg } from '../messages.js';
import type { CoverageSummary, PlanSummary, ReportFacts } from './ReportModel.js';

/** The tables of the report as rows of text, shared by the PDF deck and the HTML page. */

function range(values: number[]): string {
  if (values.length === 0) return 'none';
  if (values.length <= 6) return values.map((v) => formatNumber(v)).join(', ');
  return `${formatNumber(values[0])} … ${formatNumber(values[values.length - 1])} (${values.length} values)`;
}

export function factRows(f: ReportFacts): string[][] {
  const rows: string[][] = [
    ['runs', `${f.runs} (${f.rows} logged rows${f.diverged ? `, ${f.diverged} diverged rows` : ''})`],
    ['seeds', `${f.seeds.distinct} distinct; ${f.seeds.perCellMin === f.seeds.perCellMax ? f.seeds.perCellMin : `${f.seeds.perCellMin}–${f.seeds.perCellMax}`} per cell`],
  ];
  for (const a of f.axes) rows.push([a.name, range(a.values)]);
  if (f.conditions.length > 1 || (f.conditions.length === 1 && f.conditions[0] !== '')) rows.push(['conditions', f.conditions.map((c) => c || '(none)').join(', ')]);
  rows.push(['metric', f.metric], ['data date', f.dataDate ?? 'unknown'], ['store hash', f.storeHash ?? 'unknown'], ['report made', f.generatedAt]);
  return rows;
}

/** A threshold cell: the value, or a bound at the sweep's edge ("≥ 512 (at the edge)" along train size). */
export function thresholdText(row: { threshold: number | null; thresholdAtEdge?: boolean }, x: string): string {
  if (row.threshold === null) return formatNumber(null);
  if (!row.thresholdAtEdge) return formatNumber(row.threshold);
  return `${x === 'train_size' ? '≥' : '≤'} ${formatNumber(row.threshold)} (at the edge)`;
}

export const RIDGE_COLUMNS = (r: RidgeResult): string[] => [r.y, `peak ${r.x}`, 'interval', 'error', 'prominence', 'threshold'];

export function ridgeRows(r: RidgeResult): string[][] {
  return r.rows.map((row) => [
    formatNumber(row.y),
    row.peak ? formatNumber(row.peak.x) : 'no peak',
    row.peak ? `${formatNumber(row.peak.low)}–${formatNumber(row.peak.high)}` : '',
    row.peak ? formatNumber(row.peak.error) : '',
    row.peak ? `${formatNumber(row.peak.prominence)} (${formatNumber(row.peak.prominenceSe, 2)} se)${row.noiseFrom === 'curve' ? ' curve' : ''}` : '',
    thresholdText(row, r.x),
  ]);
}

/**
 * The hurts segments as a table: one column per slice value that differs between segments
 * (values all segments share — the scan's epoch, an empty condition — are said in the caption).
 */
const pText = (p: number) => (p < 1e-4 ? '< 1e-4' : formatNumber(p, 2));

export function hurtsTable(results: HurtsResult[]): { columns: string[]; rows: string[][] } {
  const segs = results.flatMap((h) => h.segments);
  const keys = [...new Set(segs.flatMap((s) => Object.keys(s.fixed)))];
  const varying = keys.filter((k) => segs.length === 1 ? !(k === 'condition' && segs[0].fixed[k] === '') : segs.some((s) => s.fixed[k] !== segs[0].fixed[k]));
  const cell = (v: number | string | undefined) => (typeof v === 'number' ? formatNumber(v) : (v ?? ''));
  return {
    columns: [...varying, 'onset n', 'peak n', 'recovery n', 'rise', 'p', 'adjusted p', 'test'],
    rows: segs.map((s) => [
      ...varying.map((k) => cell(s.fixed[k])),
      formatNumber(s.onset),
      formatNumber(s.peak),
      s.recovery === null ? 'not reached' : formatNumber(s.recovery),
      formatNumber(s.rise),
      pText(s.p),
      s.pAdjusted === undefined ? '' : pText(s.pAdjusted),
      s.test,
    ]),
  };
}

/**
 * What the hurts table stands on: how many of the slices scanned hold a rise, and the correction
 * across them (deck subtitle and HTML line alike, so neither can drop the multiple-testing word).
 */
export function hurtsSubtitle(h: HurtsResult): string {
  const slices = h.slices ?? 0;
  const withRise = h.slicesWithRise ?? new Set(h.segments.map((s) => JSON.stringify(s.fixed))).size;
  return msg.hurtsSubtitle({ withRise, slices, fixed: formatFixed(h.fixed), alpha: formatNumber(h.alpha ?? 0.05), correction: h.correction ?? 'benjamini-hochberg' });
}

export const COVERAGE_COLUMNS = ['configuration', 'seed', 'status'];

export function coverageRows(c: CoverageSummary): string[][] {
  return c.gaps.map((g) => [formatFixed(g.config), String(g.seed), g.status]);
}

export const COVERAGE_GROUP_COLUMNS = ['status', 'runs', 'which runs'];

/** Coverage gaps grouped by status, with the ranges of the configurations in each group. */
export function coverageGroups(c: CoverageSummary): string[][] {
  const byStatus = new Map<string, CoverageSummary['gaps']>();
  for (const g of c.gaps) {
    const k = g.status.startsWith('partial') ? 'partial' : g.status;
    let list = byStatus.get(k);
    if (!list) byStatus.set(k, (list = []));
    list.push(g);
  }
  return [...byStatus].map(([status, gaps]) => {
    const runs = gaps.map((g) => ({ config: g.config, seed: g.seed, epochs: 0, reason: status, cost: 0, why: '' }));
    const keys = [...new Set(gaps.flatMap((g) => Object.keys(g.config)))];
    const which = [...keys.map((k) => `${k} ${valuesOf(runs, k)}`), `seeds ${[...new Set(gaps.map((g) => g.seed))].sort((a, b) => a - b).join(', ')}`].join(' · ');
    return [status, String(gaps.length), which];
  });
}

export const PLAN_COLUMNS = ['#', 'configuration', 'seed', 'epochs', 'reason', 'cost', 'why'];

export function planRows(p: PlanSummary): string[][] {
  return p.runs.map((r, i) => [String(i + 1), formatFixed(r.config), String(r.seed), formatNumber(r.epochs), r.reason, formatCost(r.cost, p.units), r.why]);
}

export const PLAN_GROUP_COLUMNS = ['reason', 'runs', 'cost', 'which runs', 'why'];

/** "8 … 4096 (25 values)" or "0.1, 0.2": the values of a config key among some runs. */
function valuesOf(runs: PlanSummary['runs'], key: string): string {
  const vals = [...new Set(runs.map((r) => r.config[key]).filter((v) => v !== undefined))];
  const nums = vals.every((v) => typeof v === 'number') ? (vals as number[]).sort((a, b) => a - b) : null;
  const list = nums ?? vals.map(String).sort();
  const text = (v: number | string) => (typeof v === 'number' ? formatNumber(v) : v);
  if (list.length <= 3) return list.map(text).join(', ');
  return `${text(list[0])} … ${text(list[list.length - 1])} (${list.length} values)`;
}

/** The plan grouped by reason and explanation, in plan order: what a meeting needs to decide on. */
export function planGroups(p: PlanSummary): string[][] {
  const groups = new Map<string, PlanSummary['runs']>();
  for (const r of p.runs) {
    const k = `${r.reason}\u0000${r.why}`;
    let g = groups.get(k);
    if (!g) groups.set(k, (g = []));
    g.push(r);
  }
  return [...groups.values()].map((runs) => {
    const keys = [...new Set(runs.flatMap((r) => Object.keys(r.config)))];
    const which = [...keys.map((k) => `${k} ${valuesOf(runs, k)}`), `seeds ${[...new Set(runs.map((r) => r.seed))].sort((a, b) => a - b).join(', ')}`].join(' · ');
    return [runs[0].reason, String(runs.length), formatCost(runs.reduce((a, r) => a + r.cost, 0), p.units), which, runs[0].why];
  });
}
