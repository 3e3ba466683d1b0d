import { formatNumber } from '../formatNumber.js';
import type { TopLevelSpec } from 'vega-lite';
import type { RidgeResult } from '../analysis/Ridge.js';
import type { MapAxis, SweepMap } from '../grid/SweepMap.js';
import { render as msg } from '../messages.js';
import { axisLabel, axisTicks, axisTitle, fixedLine, metricFormat, metricLabel, tickLabelExpr } from './axisText.js';
import { colorLut } from './colorLut.js';
import { DEFAULT_COLOR_SCHEME } from './colorSchemes.js';
import type { ColorScheme } from './colorSchemes.js';
import { pngDataUrl } from './encodePng.js';
import { keySpec, STYLE } from './figureKey.js';
import type { KeyEntry } from './figureKey.js';
import { FIGURE_CONFIG } from './figureConfig.js';
import { figureWarnings } from './figureWarnings.js';
import { paintCells, paintHatchSwatch, paintRaster } from './paintImage.js';
import { axisTransform } from '../grid/axisScale.js';

/** One panel of a (possibly faceted) heatmap. */
export interface MapPanel {
  map: SweepMap;
  ridge: RidgeResult | null;
  /** Facet header, e.g. "label noise 20%"; "" for a single map. */
  label: string;
}

export interface HeatmapOptions {
  /** Draw the interpolated raster (measured cells solid, interpolated areas hatched) instead of cells. */
  raster?: boolean;
  colors?: ColorScheme;
  /** Colour domain; default: the range of everything drawn, shared by all panels. */
  domain?: [number, number];
  /** Plot size of one panel in CSS pixels (default 460 × 340). */
  width?: number;
  height?: number;
  /** Pixel ratio of embedded images (match the PNG scale; default 2). */
  pixelRatio?: number;
  /** Above this many grid points the cells are drawn as one embedded image (default 2,500). */
  maxCellShapes?: number;
}

export const PANEL_WIDTH = 460;
export const PANEL_HEIGHT = 340;

/** Heatmap of one map with its overlays, as a vega-lite spec (pure: images are embedded as data URLs). */
export function heatmapSpec(map: SweepMap, ridge: RidgeResult | null, opts: HeatmapOptions = {}): TopLevelSpec {
  return facetHeatmapSpec([{ map, ridge, label: '' }], opts);
}

type Row = Record<string, number | string | null>;

/** The colour domain covering every panel (cells, and the raster when drawn). */
export function sharedDomain(panels: MapPanel[], raster: boolean): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const { map } of panels) {
    for (const c of map.cells) {
      const v = c.cell.stats.mean;
      if (Number.isFinite(v)) {
        lo = Math.min(lo, v);
        hi = Math.max(hi, v);
      }
    }
    if (raster) {
      for (const v of map.raster.value) {
        if (Number.isFinite(v)) {
          lo = Math.min(lo, v);
          hi = Math.max(hi, v);
        }
      }
    }
  }
  if (!Number.isFinite(lo)) return [0, 1];
  if (hi === lo) return [lo - 0.5 * Math.abs(lo || 1) * 0.01, hi + 0.5 * Math.abs(hi || 1) * 0.01];
  return [lo, hi];
}

/** Union of the panels' axis extents (shared position scales across facets). */
function extent(axes: MapAxis[]): [number, number] {
  return [Math.min(...axes.map((a) => a.edges[0])), Math.max(...axes.map((a) => a.edges[a.edges.length - 1]))];
}

/** Rows split into runs of consecutive rows having a value, so a line leaves gaps instead of jumping. */
function segments<T>(rows: T[], has: (r: T) => boolean): { row: T; seg: number }[] {
  const out: { row: T; seg: number }[] = [];
  let seg = 0;
  for (const r of rows) {
    if (has(r)) out.push({ row: r, seg });
    else seg++;
  }
  return out;
}

const fmtNumber = (v: number) => formatNumber(v, 2);

/** Heatmap panels side by side (one per label noise or condition), sharing every scale. */
export function facetHeatmapSpec(panels: MapPanel[], opts: HeatmapOptions = {}): TopLevelSpec {
  if (!panels.length) throw new Error('facetHeatmapSpec: no panels');
  const {
    raster = false,
    colors = DEFAULT_COLOR_SCHEME,
    width = PANEL_WIDTH,
    height = PANEL_HEIGHT,
    pixelRatio = 2,
    maxCellShapes = 2500,
  } = opts;
  const first = panels[0].map;
  const domain = opts.domain ?? sharedDomain(panels, raster);
  const lut = colorLut(colors);
  const xDomain = extent(panels.map((p) => p.map.x));
  const yDomain = extent(panels.map((p) => p.map.y));
  const cellsAsImage = !raster && panels.some((p) => p.map.x.values.length * p.map.y.values.length > maxCellShapes);
  const image = raster || cellsAsImage;
  const faceted = panels.length > 1;

  const values: Row[] = [];
  let cellCount = 0;
  let missingCount = 0;
  let divergedCount = 0;
  for (const { map, ridge, label } of panels) {
    const panel = label;
    const xi = new Map(map.x.values.map((v, i) => [v, i]));
    const yi = new Map(map.y.values.map((v, i) => [v, i]));
    const box = (x: number, y: number) => {
      const i = xi.get(x);
      const j = yi.get(y);
      if (i === undefined || j === undefined) return null;
      return { x: map.x.edges[i], x2: map.x.edges[i + 1], y: map.y.edges[j], y2: map.y.edges[j + 1] };
    };
    if (image) {
      // The image spans this panel's own edges; pixels are laid out in the transformed space.
      const frac = (a: MapAxis, d: [number, number]) => {
        const t = axisTransform(a.scale).to;
        return (t(a.edges[a.edges.length - 1]) - t(a.edges[0])) / (t(d[1]) - t(d[0]));
      };
      const w = Math.max(1, Math.round(width * pixelRatio * frac(map.x, xDomain)));
      const h = Math.max(1, Math.round(height * pixelRatio * frac(map.y, yDomain)));
      const po = { width: w, height: h, domain, lut, hatchPeriod: 9 * pixelRatio };
      const px = raster ? paintRaster(map, po) : paintCells(map, po);
      values.push({
        layer: 'image',
        panel,
        x: map.x.edges[0],
        x2: map.x.edges[map.x.edges.length - 1],
        y: map.y.edges[0],
        y2: map.y.edges[map.y.edges.length - 1],
        url: pngDataUrl(px, w, h),
      });
      values.push({ layer: 'domain', panel, xc: map.x.values[0], yc: map.y.values[0], value: domain[0] });
      values.push({ layer: 'domain', panel, xc: map.x.values[0], yc: map.y.values[0], value: domain[1] });
    }
    for (const c of map.cells) {
      cellCount++;
      if (image) continue;
      const b = box(c.x, c.y);
      if (!b) continue;
      const s = c.cell.stats;
      values.push({ layer: 'cell', panel, ...b, xc: c.x, yc: c.y, value: s.mean, n: s.n, low: s.low, high: s.high });
    }
    const crosses = map.x.values.length * map.y.values.length <= 900;
    for (const m of map.missing) {
      missingCount++;
      const b = box(m.x, m.y);
      if (!b) continue;
      if (!image) values.push({ layer: 'missing', panel, ...b });
      if (crosses) values.push({ layer: 'missingMark', panel, xc: m.x, yc: m.y });
    }
    for (const d of map.diverged) {
      divergedCount++;
      values.push({ layer: 'diverged', panel, xc: d.x, yc: d.y, count: d.count });
    }
    if (ridge) {
      const rows = [...ridge.rows].sort((a, b) => a.y - b.y);
      for (const { row, seg } of segments(rows, (r) => r.peak !== null)) {
        const p = row.peak!;
        values.push({
          layer: 'ridge', panel, seg, xc: p.x, yc: row.y, low: p.low, high: p.high,
          error: p.error, prominenceSe: p.prominenceSe, noiseFrom: row.noiseFrom,
        });
      }
      // A threshold at the sweep's edge is only a bound: it is named in the key, never drawn as measured.
      const th = segments(rows, (r) => r.threshold !== null && !r.thresholdAtEdge);
      for (const { row, seg } of th) {
        // A row whose neighbours have no threshold gets a dot: a one-point line draws nothing.
        const alone = th.filter((t) => t.seg === seg).length === 1;
        values.push({ layer: alone ? 'thresholdDot' : 'threshold', panel, seg, xc: row.threshold, yc: row.y });
      }
    }
  }
  if (!cellCount) throw new Error(msg.noCells(first.kind));

  const metric = metricLabel(first.metric);
  const logX = first.x.scale === 'log2';
  const logY = first.y.scale === 'log2';
  const posScale = (log: boolean, d: [number, number]) =>
    log ? { type: 'log', base: 2, domain: d, nice: false } : { type: 'linear', domain: d, nice: false, zero: false };
  const ticks = (axes: MapAxis[]) => [...new Set(axes.flatMap((a) => axisTicks(a)))].sort((a, b) => a - b);
  const axisX = { title: axisTitle(first.x), values: ticks(panels.map((p) => p.map.x)), labelExpr: tickLabelExpr(first.x.name), grid: false, labelFlush: false };
  const axisY = { title: axisTitle(first.y), values: ticks(panels.map((p) => p.map.y)), labelExpr: tickLabelExpr(first.y.name), grid: false, labelFlush: false };
  const X = (field: string) => ({ field, type: 'quantitative', scale: posScale(logX, xDomain), axis: axisX });
  const Y = (field: string) => ({ field, type: 'quantitative', scale: posScale(logY, yDomain), axis: axisY });
  const only = (layer: string) => ({ filter: { field: 'layer', equal: layer } });
  const fmt = metricFormat(first.metric, domain);
  const color = {
    field: 'value',
    type: 'quantitative',
    title: [metric, '(mean of seeds)'],
    scale: { scheme: colors, domain, clamp: true },
    legend: { format: fmt, gradientLength: Math.max(120, height - 60), titleFontSize: 13, labelFontSize: 12 },
  };
  const has = (layer: string) => values.some((v) => v.layer === layer);
  const layers: Record<string, unknown>[] = [];
  if (image) {
    layers.push({
      name: 'image',
      transform: [only('image')],
      mark: { type: 'image', aspect: false, smooth: false },
      encoding: { x: X('x'), x2: { field: 'x2' }, y: Y('y'), y2: { field: 'y2' }, url: { field: 'url', type: 'nominal' } },
    });
    // Invisible: gives the colour legend the domain of the embedded image.
    layers.push({
      name: 'legend',
      transform: [only('domain')],
      mark: { type: 'point', opacity: 0 },
      encoding: { x: X('xc'), y: Y('yc'), color },
    });
  } else {
    layers.push({
      name: 'cells',
      transform: [only('cell')],
      // The 0.5 px stroke in the cell's own colour hides anti-aliasing seams between cells.
      mark: { type: 'rect', strokeWidth: 0.5, stroke: { expr: "scale('color', datum.value)" } },
      encoding: {
        x: X('x'), x2: { field: 'x2' }, y: Y('y'), y2: { field: 'y2' }, color,
        tooltip: [
          { field: 'xc', type: 'quantitative', title: axisLabel(first.x.name) },
          { field: 'yc', type: 'quantitative', title: axisLabel(first.y.name) },
          { field: 'value', type: 'quantitative', title: metric, format: '.4f' },
          { field: 'n', type: 'quantitative', title: 'seeds' },
        ],
      },
    });
    if (has('missing')) {
      layers.push({
        name: 'missing',
        transform: [only('missing')],
        mark: { type: 'rect', color: STYLE.missing, strokeWidth: 0.5, stroke: STYLE.missing },
        encoding: { x: X('x'), x2: { field: 'x2' }, y: Y('y'), y2: { field: 'y2' } },
      });
    }
  }
  if (has('missingMark')) {
    layers.push({
      name: 'missingMarks',
      transform: [only('missingMark')],
      // Over an image the cross needs a light fill and dark edge to show on any colour.
      mark: image
        ? { type: 'point', shape: 'cross', angle: 45, filled: true, opacity: 1, size: 60, color: STYLE.casing, stroke: STYLE.ridge, strokeWidth: 0.8 }
        : { type: 'point', shape: 'cross', angle: 45, filled: true, opacity: 1, size: 50, color: STYLE.missingCross },
      encoding: { x: X('xc'), y: Y('yc') },
    });
  }
  if (has('threshold')) {
    const th = { transform: [only('threshold')], encoding: { x: X('xc'), y: Y('yc'), detail: { field: 'seg', type: 'nominal' }, order: { field: 'yc', type: 'quantitative' } } };
    layers.push({ name: 'thresholdCasing', ...th, mark: { type: 'line', strokeWidth: 4, color: STYLE.thresholdCasing, clip: true } });
    layers.push({ name: 'threshold', ...th, mark: { type: 'line', strokeWidth: 2, color: STYLE.threshold, strokeDash: [...STYLE.thresholdDash], clip: true } });
  }
  if (has('thresholdDot')) {
    layers.push({
      name: 'thresholdDots',
      transform: [only('thresholdDot')],
      mark: { type: 'point', shape: 'square', filled: true, opacity: 1, size: 40, color: STYLE.threshold, stroke: STYLE.thresholdCasing, strokeWidth: 1.5, clip: true },
      encoding: { x: X('xc'), y: Y('yc') },
    });
  }
  if (has('ridge')) {
    const line = { transform: [only('ridge')], encoding: { x: X('xc'), y: Y('yc'), detail: { field: 'seg', type: 'nominal' }, order: { field: 'yc', type: 'quantitative' } } };
    const whisker = { transform: [only('ridge')], encoding: { x: X('low'), x2: { field: 'high' }, y: Y('yc') } };
    layers.push({ name: 'whiskerCasing', ...whisker, mark: { type: 'rule', strokeWidth: 4, color: STYLE.casing, clip: true } });
    layers.push({ name: 'ridgeCasing', ...line, mark: { type: 'line', strokeWidth: 4.5, color: STYLE.casing, clip: true } });
    layers.push({ name: 'whiskers', ...whisker, mark: { type: 'rule', strokeWidth: 1.5, color: STYLE.ridge, clip: true } });
    layers.push({ name: 'ridge', ...line, mark: { type: 'line', strokeWidth: 2, color: STYLE.ridge, clip: true } });
    layers.push({
      name: 'peaks',
      transform: [only('ridge')],
      mark: { type: 'point', filled: true, opacity: 1, size: 45, color: STYLE.casing, stroke: STYLE.ridge, strokeWidth: 1.5, clip: true },
      encoding: {
        x: X('xc'), y: Y('yc'),
        tooltip: [
          { field: 'yc', type: 'quantitative', title: axisLabel(first.y.name) },
          { field: 'xc', type: 'quantitative', title: `peak ${axisLabel(first.x.name)}`, format: '.4~g' },
          { field: 'low', type: 'quantitative', title: 'interval low', format: '.4~g' },
          { field: 'high', type: 'quantitative', title: 'interval high', format: '.4~g' },
          { field: 'prominenceSe', type: 'quantitative', title: 'prominence (SE)', format: '.2f' },
        ],
      },
    });
  }
  if (has('diverged')) {
    layers.push({
      name: 'diverged',
      transform: [only('diverged')],
      mark: { type: 'point', shape: 'triangle-up', filled: true, opacity: 1, size: 80, color: STYLE.diverged, stroke: STYLE.divergedStroke, strokeWidth: 1.2 },
      encoding: { x: X('xc'), y: Y('yc'), tooltip: [{ field: 'count', type: 'quantitative', title: 'diverged seeds' }] },
    });
  }

  // The key names every mark that is drawn.
  const entries: KeyEntry[] = [];
  if (raster) {
    const url = pngDataUrl(paintHatchSwatch({ width: 32 * pixelRatio, height: 12 * pixelRatio, lut, period: 9 * pixelRatio }), 32 * pixelRatio, 12 * pixelRatio);
    entries.push({ symbol: 'hatch', url, text: msg.keyRaster(first.method, fmtNumber(first.loo.rmse)) });
  } else {
    entries.push({ symbol: 'swatch', color: `rgb(${lut[128 * 3]},${lut[128 * 3 + 1]},${lut[128 * 3 + 2]})`, text: msg.keyCells(cellCount) });
  }
  if (missingCount) entries.push({ symbol: raster ? 'cross' : 'missing', text: msg.keyMissing(missingCount, raster) });
  if (divergedCount) entries.push({ symbol: 'diverged', text: msg.keyDiverged(divergedCount) });
  if (has('ridge')) {
    const rows = panels.flatMap((p) => p.ridge?.rows ?? []).filter((r) => r.peak);
    const from = rows.every((r) => r.noiseFrom === 'curve') ? 'curve noise' : rows.some((r) => r.noiseFrom === 'curve') ? 'bootstrap over seeds or curve noise' : 'bootstrap over seeds';
    entries.push({ symbol: 'ridge', text: msg.keyRidge(from) });
  }
  const edgeRows = panels.flatMap((p) => p.ridge?.rows ?? []).filter((r) => r.threshold !== null && r.thresholdAtEdge);
  if (has('threshold') || has('thresholdDot') || edgeRows.length) {
    const eps = panels.find((p) => p.ridge)!.ridge!.epsilon;
    // The threshold is on train error, a fraction: show it as percent.
    const epsText = `${Number((eps * 100).toPrecision(3))}%`;
    // Along train size the threshold is the largest n the model still fits (findRidge: last-below).
    const largest = first.x.name === 'train_size';
    const edge = edgeRows.length ? formatNumber(edgeRows[0].threshold!) : '';
    if (has('threshold') || has('thresholdDot'))
      entries.push({ symbol: 'threshold', text: msg.keyThreshold(axisLabel(first.x.name), epsText, has('thresholdDot'), largest, edgeRows.length, edge) });
    else entries.push({ symbol: 'none', text: msg.keyThresholdEdgeOnly(axisLabel(first.x.name), epsText, largest, edgeRows.length, edge) });
  }
  const warnings = figureWarnings(panels.map((p) => ({ ridge: p.ridge, label: p.label })));

  const legendRoom = 110;
  const plotsWidth = faceted ? panels.length * width + (panels.length - 1) * 20 : width;
  const key = keySpec(entries, warnings, plotsWidth + legendRoom);
  const main: Record<string, unknown> = faceted
    ? {
        data: { values },
        facet: {
          column: {
            field: 'panel',
            type: 'nominal',
            sort: panels.map((p) => p.label),
            header: { title: null, labelFontSize: 14, titleFontSize: 14, labelPadding: 6 },
          },
        },
        spacing: 20,
        spec: { width, height, layer: layers },
      }
    : { data: { values }, width, height, layer: layers };

  const omit = faceted ? [...new Set(panels.flatMap((p) => Object.keys(p.map.fixed)).filter((k) => new Set(panels.map((p) => String(p.map.fixed[k]))).size > 1))] : [];
  const spec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: {
      text: msg.title(metric, first.kind, axisLabel(first.x.name), axisLabel(first.y.name)),
      subtitle: fixedLine({ ...first, cells: panels.flatMap((p) => p.map.cells) }, { omit }),
    },
    vconcat: [main, key],
    spacing: 16,
    config: FIGURE_CONFIG,
  };
  return spec as unknown as TopLevelSpec;
}
