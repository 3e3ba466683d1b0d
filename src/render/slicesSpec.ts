import type { TopLevelSpec } from 'vega-lite';
import type { RidgeResult } from '../analysis/Ridge.js';
import type { SweepMap } from '../grid/SweepMap.js';
import { render as msg } from '../messages.js';
import { axisLabel, axisTicks, axisTitle, fixedLine, fixedValueText, metricFormat, metricLabel, tickLabelExpr } from './axisText.js';
import { DEFAULT_COLOR_SCHEME } from './colorSchemes.js';
import type { ColorScheme } from './colorSchemes.js';
import { keySpec, STYLE } from './figureKey.js';
import type { KeyEntry } from './figureKey.js';
import { figureWarnings, listValues } from './figureWarnings.js';
import { FIGURE_CONFIG } from './figureConfig.js';

export interface SlicesOptions {
  /** Values of the map's y axis to draw (snapped to the nearest measured row); default: up to 4 spread rows. */
  rows?: number[];
  colors?: ColorScheme;
  width?: number;
  height?: number;
}

/** Up to k values spread evenly over a sorted list (first and last kept). */
function spreadPick(ys: readonly number[], k: number): number[] {
  const n = Math.min(k, ys.length);
  return [...new Set(Array.from({ length: n }, (_, i) => ys[Math.round((i * (ys.length - 1)) / Math.max(1, n - 1))]))];
}

/**
 * The measured rows nearest to the requested values (in the axis's own space), ascending, distinct.
 * With none requested: up to 4 rows spread over the rows where the ridge has a peak (the slices
 * must show the peaks the headline reports), topped up with spread rows when fewer than 2 have one.
 */
export function pickSliceRows(map: Pick<SweepMap, 'y'>, wanted?: number[], ridge?: Pick<RidgeResult, 'rows'> | null): number[] {
  const ys = map.y.values;
  if (!wanted || !wanted.length) {
    const peaked = ys.filter((y) => ridge?.rows.some((r) => r.y === y && r.peak !== null));
    if (peaked.length >= 2) return spreadPick(peaked, 4);
    return [...new Set([...peaked, ...spreadPick(ys, 4 - peaked.length)])].sort((a, b) => a - b);
  }
  const t = map.y.scale === 'log2' ? (v: number) => Math.log2(Math.max(v, 1e-300)) : (v: number) => v;
  const pick = wanted.map((w) => ys.reduce((best, v) => (Math.abs(t(v) - t(w)) < Math.abs(t(best) - t(w)) ? v : best), ys[0]));
  return [...new Set(pick)].sort((a, b) => a - b);
}

/**
 * Line chart of the metric along x for chosen rows: mean over seeds with a band for the seed
 * interval, train error dashed, the ridge's peak marked with its location interval.
 */
export function slicesSpec(map: SweepMap, ridge: RidgeResult | null, opts: SlicesOptions = {}): TopLevelSpec {
  const { colors = DEFAULT_COLOR_SCHEME, width = 560, height = 320 } = opts;
  const rows = pickSliceRows(map, opts.rows, ridge);
  const yName = map.y.name;
  const label = (y: number) => fixedValueText(yName, y);
  const labels = rows.map(label);
  const metric = metricLabel(map.metric);
  const values: Record<string, number | string | null>[] = [];
  let lo = Infinity;
  let hi = -Infinity;
  for (const y of rows) {
    const byX = new Map(map.cells.filter((c) => c.y === y).map((c) => [c.x, c]));
    let segTest = 0;
    let segTrain = 0;
    // A cell without an interval (one seed) breaks the band instead of bridging it.
    let segBand = 0;
    for (const x of map.x.values) {
      const c = byX.get(x);
      const s = c?.cell.stats;
      if (!c || !s || !Number.isFinite(s.mean)) {
        segTest++;
        segTrain++;
        segBand++;
        continue;
      }
      lo = Math.min(lo, s.low ?? s.mean, s.mean);
      hi = Math.max(hi, s.high ?? s.mean, s.mean);
      if (s.low === null || s.high === null) segBand++;
      values.push({ layer: 'test', row: label(y), series: metric, x, value: s.mean, low: s.low, high: s.high, n: s.n, seg: segTest, bandSeg: segBand });
      const tr = c.cell.train;
      if (tr && Number.isFinite(tr.mean)) {
        values.push({ layer: 'train', row: label(y), series: 'train error', x, value: tr.mean, seg: segTrain });
        lo = Math.min(lo, tr.mean);
      } else segTrain++;
      if (c.cell.diverged > 0) values.push({ layer: 'diverged', row: label(y), x, value: s.mean, count: c.cell.diverged });
    }
    const r = ridge?.rows.find((rr) => rr.y === y);
    if (r?.peak) values.push({ layer: 'peak', row: label(y), x: r.peak.x, value: r.peak.error, low: r.peak.low, high: r.peak.high });
    // The smooth the peak was found on (single-value curves), drawn beside the logged points.
    if (r?.smooth) r.smooth.x.forEach((x, i) => values.push({ layer: 'smooth', row: label(y), x, value: r.smooth!.y[i] }));
  }
  if (!values.length) throw new Error(msg.noCells(map.kind));
  const logX = map.x.scale === 'log2';
  const xDomain: [number, number] = [map.x.values[0], map.x.values[map.x.values.length - 1]];
  const X = (field: string) => ({
    field, type: 'quantitative',
    scale: logX ? { type: 'log', base: 2, domain: xDomain, nice: false } : { type: 'linear', domain: xDomain, nice: false, zero: false },
    axis: { title: axisTitle(map.x), values: axisTicks(map.x), labelExpr: tickLabelExpr(map.x.name), grid: true, gridColor: '#eee' },
  });
  const fmt = metricFormat(map.metric, [lo, hi]);
  const Y = (field: string) => ({ field, type: 'quantitative', scale: { zero: false, nice: true }, axis: { title: metric, format: fmt, gridColor: '#eee' } });
  const color = {
    field: 'row', type: 'ordinal', sort: labels, title: axisLabel(yName),
    // The light end of sequential schemes vanishes on white: stop short of it.
    scale: { domain: labels, scheme: { name: colors, extent: [0, 0.82] } },
    legend: { symbolType: 'stroke', symbolOpacity: 1, symbolStrokeWidth: 3, symbolSize: 300 },
  };
  const only = (layer: string | string[]) => ({ filter: { field: 'layer', oneOf: Array.isArray(layer) ? layer : [layer] } });
  const layers: Record<string, unknown>[] = [
    {
      name: 'band',
      transform: [only('test'), { filter: 'isValid(datum.low) && isValid(datum.high)' }],
      mark: { type: 'area', opacity: 0.18 },
      encoding: { x: X('x'), y: Y('low'), y2: { field: 'high' }, color, detail: { field: 'bandSeg', type: 'nominal' } },
    },
    {
      name: 'lines',
      transform: [only(['test', 'train'])],
      mark: { type: 'line', strokeWidth: 2 },
      encoding: {
        x: X('x'), y: Y('value'), color,
        strokeDash: {
          field: 'series', type: 'nominal', title: null,
          scale: { domain: [metric, 'train error'], range: [[1, 0], [6, 4]] },
          legend: { symbolStrokeColor: '#333', symbolSize: 300 },
        },
        detail: { field: 'seg', type: 'nominal' },
      },
    },
    {
      name: 'points',
      transform: [only('test')],
      mark: { type: 'point', filled: true, opacity: 1, size: 22 },
      encoding: {
        x: X('x'), y: Y('value'), color,
        tooltip: [
          { field: 'x', type: 'quantitative', title: axisLabel(map.x.name) },
          { field: 'value', type: 'quantitative', title: metric, format: '.4f' },
          { field: 'n', type: 'quantitative', title: 'seeds' },
        ],
      },
    },
  ];
  const smoothed = values.some((v) => v.layer === 'smooth');
  if (smoothed) {
    layers.push({
      name: 'smooth',
      transform: [only('smooth')],
      mark: { type: 'line', strokeWidth: 5, opacity: 0.45, clip: true },
      encoding: { x: X('x'), y: Y('value'), color },
    });
  }
  if (values.some((v) => v.layer === 'peak')) {
    layers.push({
      name: 'peakWhiskers',
      transform: [only('peak')],
      mark: { type: 'rule', strokeWidth: 2, clip: true },
      encoding: { x: X('low'), x2: { field: 'high' }, y: Y('value'), color },
    });
    layers.push({
      name: 'peaks',
      transform: [only('peak')],
      mark: { type: 'point', shape: 'diamond', filled: true, size: 130, stroke: STYLE.ridge, strokeWidth: 1.2, opacity: 1, clip: true },
      encoding: { x: X('x'), y: Y('value'), color },
    });
  }
  if (values.some((v) => v.layer === 'diverged')) {
    layers.push({
      name: 'diverged',
      transform: [only('diverged')],
      mark: { type: 'point', shape: 'triangle-up', filled: true, opacity: 1, size: 80, color: STYLE.diverged, stroke: STYLE.divergedStroke, strokeWidth: 1.2 },
      encoding: { x: X('x'), y: Y('value') },
    });
  }
  const chosen = ridge ? { ...ridge, rows: ridge.rows.filter((r) => rows.includes(r.y)) } : null;
  let warnings = figureWarnings([{ ridge: chosen, label: '' }]);
  // Rows asked for that miss every peak: say the peaks are elsewhere, not that there are none.
  const peakedElsewhere = (ridge?.rows ?? []).filter((r) => r.peak !== null && !rows.includes(r.y)).map((r) => r.y);
  if (chosen && chosen.rows.every((r) => r.peak === null) && peakedElsewhere.length)
    warnings = [msg.warnPeaksNotShown(axisLabel(yName), listValues(peakedElsewhere.sort((a, b) => a - b)))];
  const diverged = values.some((v) => v.layer === 'diverged');
  const keyItems: KeyEntry[] = [{ symbol: 'none', text: msg.keySlicesBand(diverged, values.some((v) => v.layer === 'peak')) }];
  if (smoothed) keyItems.push({ symbol: 'none', text: msg.keySmoothed });
  const key = keySpec(keyItems, warnings, width + 140);
  const spec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: { text: msg.slicesTitle(metric, axisLabel(map.x.name), axisLabel(yName)), subtitle: fixedLine(map, { method: false }) },
    vconcat: [{ data: { values }, width, height, layer: layers }, key],
    spacing: 16,
    config: FIGURE_CONFIG,
  };
  return spec as unknown as TopLevelSpec;
}
