import type { HurtsResult } from '../analysis/Hurts.js';
import type { RidgeResult } from '../analysis/Ridge.js';
import { formatFixed, formatNumber } from './formatNumber.js';
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

export const RIDGE_COLUMNS = (r: RidgeResult): string[] => [r.y, `peak ${r.x}`, 'interval', 'error', 'prominence', 'threshold'];

export function ridgeRows(r: RidgeResult): string[][] {
  return r.rows.map((row) => [
    formatNumber(row.y),
    row.peak ? formatNumber(row.peak.x) : 'no peak',
    row.peak ? `${formatNumber(row.peak.low)}–${formatNumber(row.peak.high)}` : '',
    row.peak ? formatNumber(row.peak.error) : '',
    row.peak ? `${formatNumber(row.peak.prominence)} (${formatNumber(row.peak.prominenceSe, 2)} se)${row.noiseFrom === 'curve' ? ' curve' : ''}` : '',
    formatNumber(row.threshold),
  ]);
}

export const HURTS_COLUMNS = ['slice', 'onset n', 'peak n', 'recovery n', 'rise', 'p', 'test'];

export function hurtsRows(results: HurtsResult[]): string[][] {
  return results.flatMap((h) =>
    h.segments.map((s) => [
      formatFixed(s.fixed),
      formatNumber(s.onset),
      formatNumber(s.peak),
      s.recovery === null ? 'not reached' : formatNumber(s.recovery),
      formatNumber(s.rise),
      s.p < 1e-4 ? '< 1e-4' : formatNumber(s.p, 2),
      s.test,
    ]),
  );
}

export const COVERAGE_COLUMNS = ['configuration', 'seed', 'status'];

export function coverageRows(c: CoverageSummary): string[][] {
  return c.gaps.map((g) => [formatFixed(g.config), String(g.seed), g.status]);
}

export const PLAN_COLUMNS = ['#', 'configuration', 'seed', 'epochs', 'reason', 'cost'];

export function planRows(p: PlanSummary): string[][] {
  return p.runs.map((r, i) => [String(i + 1), formatFixed(r.config), String(r.seed), formatNumber(r.epochs), r.reason, formatNumber(r.cost)]);
}
