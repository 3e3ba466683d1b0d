import type { TopLevelSpec } from 'vega-lite';
import type { RidgeResult } from '../analysis/Ridge.js';
import type { MapAxis, SweepMap } from '../grid/SweepMap.js';
import { axisLabel, axisTicks, metricFormat, metricLabel, tickLabelExpr } from '../render/axisText.js';
import { STYLE } from '../render/figureKey.js';
import { formatFixed } from '../formatNumber.js';

/** One measured cell as the page's hover read-out needs it. */
export interface CellRecord {
  /** Index in the variant's cell list (the chart's rects carry it as `cell`). */
  cell: number;
  x: number;
  y: number;
  x0: number;
  x1: number;
  y0: number;
  y1: number;
  mean: number;
  low: number | null;
  high: number | null;
  n: number;
  sd: number | null;
  train: number | null;
  seeds: number[];
  /** Each seed's value (null where it diverged or was not logged), in the order of `seeds` and `runs`. */
  values: (number | null)[];
  runs: string[];
  diverged: number;
}

/** Cell edges of value i on an axis (the map's own edges: geometric midpoints on log axes). */
function edgesOf(axis: MapAxis, value: number): [number, number] {
  const i = axis.values.indexOf(value);
  if (i < 0) {
    // A value not on the axis (should not happen); give it a zero-width cell rather than a wrong one.
    return [value, value];
  }
  return [axis.edges[i], axis.edges[i + 1]];
}

const finiteOrNull = (v: number | null | undefined): number | null => (v === null || v === undefined || !Number.isFinite(v) ? null : v);

/** The measured cells of a map as plain records (for the hover panel and the chart's data). */
export function cellRecords(map: SweepMap): CellRecord[] {
  return map.cells.map((c, i) => {
    const [x0, x1] = edgesOf(map.x, c.x);
    const [y0, y1] = edgesOf(map.y, c.y);
    return {
      cell: i,
      x: c.x,
      y: c.y,
      x0,
      x1,
      y0,
      y1,
      mean: c.cell.stats.mean,
      low: finiteOrNull(c.cell.stats.low),
      high: finiteOrNull(c.cell.stats.high),
      n: c.cell.stats.n,
      sd: finiteOrNull(c.cell.stats.sd),
      train: finiteOrNull(c.cell.train?.mean),
      seeds: c.cell.seeds,
      values: c.cell.values.map((v) => finiteOrNull(v)),
      runs: c.cell.runs,
      diverged: c.cell.diverged,
    };
  });
}

/** vega-lite scale for a map axis: log base 2 when the map says so and every edge is positive. */
function scaleOf(axis: MapAxis): Record<string, unknown> {
  const lo = axis.edges[0];
  const hi = axis.edges[axis.edges.length - 1];
  const log = axis.scale === 'log2' && lo > 0;
  return log ? { type: 'log', base: 2, domain: [lo, hi], nice: false } : { type: 'linear', domain: [lo, hi], nice: false, zero: false };
}

/** The render stage's tick choice and labels, so the page's maps read like the images. */
function axisOf(axis: MapAxis): Record<string, unknown> {
  return { grid: false, values: axisTicks(axis), labelExpr: tickLabelExpr(axis.name), labelOverlap: 'greedy' };
}

export interface CellMapSpecOptions {
  width?: number;
  height?: number;
  /** Chart title; defaults to the kind and fixed values. */
  title?: string;
}

/**
 * The measured cells of a map as a heatmap (one rect per cell between its edges, viridis), with
 * missing grid points grey and crossed, the ridge (peak and its interval per row) and the
 * interpolation threshold (dashed), in the render stage's mark styles. Only measured values are drawn: nothing here is interpolated.
 * Rects carry `cell`, the index into cellRecords(map), so a page can show the cell's numbers.
 */
/** The range of the cells' means (the colour scale's extent). */
function meanRange(cells: { mean: number }[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of cells) if (Number.isFinite(c.mean)) [lo, hi] = [Math.min(lo, c.mean), Math.max(hi, c.mean)];
  return lo <= hi ? [lo, hi] : [0, 1];
}

export function cellMapSpec(map: SweepMap, ridge: RidgeResult | null, opts: CellMapSpecOptions = {}): TopLevelSpec {
  const { width = 560, height = 360 } = opts;
  const title = opts.title ?? `${map.kind}-wise map of ${metricLabel(map.metric)}${Object.keys(map.fixed).length ? ` at ${formatFixed(map.fixed)}` : ''}`;
  const xScale = scaleOf(map.x);
  const yScale = scaleOf(map.y);
  const cells = cellRecords(map).map((c) => ({ cell: c.cell, x0: c.x0, x1: c.x1, y0: c.y0, y1: c.y1, mean: c.mean }));
  const missing = map.missing.map((m) => {
    const [x0, x1] = edgesOf(map.x, m.x);
    const [y0, y1] = edgesOf(map.y, m.y);
    return { x: m.x, y: m.y, x0, x1, y0, y1 };
  });
  const peaks: { y: number; x: number; low: number; high: number; run: number }[] = [];
  const thresholds: { y: number; t: number; run: number }[] = [];
  // `run` numbers the unbroken stretches of rows: a row without a peak (or threshold) breaks the line.
  let peakRun = 0;
  let thrRun = 0;
  for (const row of [...(ridge?.rows ?? [])].sort((a, b) => a.y - b.y)) {
    if (row.peak) peaks.push({ y: row.y, x: row.peak.x, low: row.peak.low, high: row.peak.high, run: peakRun });
    else peakRun++;
    // At the sweep's edge the threshold is only a bound: not drawn as if measured.
    if (row.threshold !== null && !row.thresholdAtEdge) thresholds.push({ y: row.y, t: row.threshold, run: thrRun });
    else thrRun++;
  }
  const xEnc = { field: 'x', type: 'quantitative', scale: xScale, title: map.x.name };
  const yEnc = { field: 'y', type: 'quantitative', scale: yScale, title: map.y.name };
  const layers: unknown[] = [
    {
      data: { values: cells },
      // A hairline in the cell's own colour hides anti-aliasing seams without drawing a grid.
      mark: { type: 'rect', strokeWidth: 0.5, stroke: { expr: "scale('color', datum.mean)" } },
      encoding: {
        x: { field: 'x0', type: 'quantitative', scale: xScale, title: axisLabel(map.x.name), axis: axisOf(map.x) },
        x2: { field: 'x1' },
        y: { field: 'y0', type: 'quantitative', scale: yScale, title: axisLabel(map.y.name), axis: axisOf(map.y) },
        y2: { field: 'y1' },
        // Named and formatted as on the static figures (error rates in percent), not the raw column name.
        color: { field: 'mean', type: 'quantitative', title: `${metricLabel(map.metric)} (mean of seeds)`, scale: { scheme: 'viridis' }, legend: { format: metricFormat(map.metric, meanRange(cells)) } },
      },
    },
  ];
  if (missing.length) {
    layers.push(
      {
        data: { values: missing },
        mark: { type: 'rect', color: STYLE.missing },
        encoding: { x: { field: 'x0', type: 'quantitative', scale: xScale, title: map.x.name }, x2: { field: 'x1' }, y: { field: 'y0', type: 'quantitative', scale: yScale, title: map.y.name }, y2: { field: 'y1' } },
      },
      {
        data: { values: missing },
        mark: { type: 'point', shape: 'cross', angle: 45, color: STYLE.missingCross, size: 60, filled: true },
        encoding: { x: xEnc, y: yEnc },
      },
    );
  }
  if (thresholds.length) {
    const thr = { x: { field: 't', type: 'quantitative', scale: xScale, title: map.x.name }, y: yEnc, order: { field: 'y' }, detail: { field: 'run', type: 'nominal' } };
    layers.push(
      { data: { values: thresholds }, mark: { type: 'line', color: STYLE.thresholdCasing, strokeWidth: 3.5 }, encoding: thr },
      { data: { values: thresholds }, mark: { type: 'line', color: STYLE.threshold, strokeDash: STYLE.thresholdDash, strokeWidth: 1.5 }, encoding: thr },
    );
  }
  if (peaks.length) {
    const line = { x: xEnc, y: yEnc, order: { field: 'y' }, detail: { field: 'run', type: 'nominal' } };
    const bar = { x: { field: 'low', type: 'quantitative', scale: xScale, title: map.x.name }, x2: { field: 'high' }, y: yEnc };
    layers.push(
      { data: { values: peaks }, mark: { type: 'line', color: STYLE.casing, strokeWidth: 4.5 }, encoding: line },
      { data: { values: peaks }, mark: { type: 'line', color: STYLE.ridge, strokeWidth: 2 }, encoding: line },
      { data: { values: peaks }, mark: { type: 'rule', color: STYLE.casing, strokeWidth: 4 }, encoding: bar },
      { data: { values: peaks }, mark: { type: 'rule', color: STYLE.ridge, strokeWidth: 1.5 }, encoding: bar },
      {
        data: { values: peaks },
        mark: { type: 'point', shape: 'circle', filled: true, color: STYLE.casing, stroke: STYLE.ridge, strokeWidth: 1.5, size: 60, opacity: 1 },
        encoding: { x: xEnc, y: yEnc },
      },
    );
  }
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: { text: title, anchor: 'start', fontSize: 13 },
    width,
    height,
    background: '#ffffff',
    layer: layers,
    config: { font: 'DejaVu Sans, sans-serif', view: { stroke: null } },
    // Layers are built as plain objects; vega-lite's deep union types do not narrow piecewise.
  } as unknown as TopLevelSpec;
}
