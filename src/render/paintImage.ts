import { ORIGIN_INTERPOLATED, ORIGIN_OUTSIDE } from '../grid/SweepMap.js';
import type { AxisScale, MapAxis, SweepMap } from '../grid/SweepMap.js';
import { axisTransform } from '../grid/axisScale.js';

/**
 * Paints a map panel as RGBA pixels covering exactly the axis domains (edges[0] … edges[n]),
 * top row = largest y. Used for the interpolated raster and for maps with too many cells to draw
 * one shape each: SVG and PDF then hold one embedded image instead of thousands of paths.
 */
export interface PaintOptions {
  /** Image size in pixels (the panel size times the pixel ratio). */
  width: number;
  height: number;
  /** Colour domain [low, high]; values outside are clamped. */
  domain: [number, number];
  /** 256 RGB triples (colorLut). */
  lut: Uint8Array;
  /** Hatch interpolated pixels (raster only; default true). */
  hatch?: boolean;
  /** Stripe period in pixels (default 9 at 1×, scale it with the pixel ratio). */
  hatchPeriod?: number;
}

/** Colour of a grid point with no data (cells mode): light grey, outside every sequential scheme. */
export const MISSING_RGB = [217, 217, 217] as const;
/** Hatch stripes: white at this opacity over the interpolated colour. */
const HATCH_ALPHA = 0.55;

const tf = (scale: AxisScale) => axisTransform(scale).to;

/** Transformed coordinate of each pixel centre along an axis (n pixels spanning the edges). */
function pixelCoords(axis: Pick<MapAxis, 'scale' | 'edges'>, n: number, reverse: boolean): Float64Array {
  const t = tf(axis.scale);
  const a = t(axis.edges[0]);
  const b = t(axis.edges[axis.edges.length - 1]);
  const out = new Float64Array(n);
  for (let p = 0; p < n; p++) {
    const f = (p + 0.5) / n;
    out[p] = a + (reverse ? 1 - f : f) * (b - a);
  }
  return out;
}

function setColor(px: Uint8Array, o: number, v: number, opts: PaintOptions): void {
  const [lo, hi] = opts.domain;
  const f = hi > lo ? (v - lo) / (hi - lo) : 0.5;
  const k = Math.round(Math.min(1, Math.max(0, f)) * 255) * 3;
  px[o] = opts.lut[k];
  px[o + 1] = opts.lut[k + 1];
  px[o + 2] = opts.lut[k + 2];
  px[o + 3] = 255;
}

function hatchAt(px: Uint8Array, o: number, x: number, y: number, period: number): void {
  // Diagonal stripes (lower-left to upper-right), about a third of the period wide.
  if ((x + y) % period < period / 3) {
    for (let c = 0; c < 3; c++) px[o + c] = Math.round(px[o + c] * (1 - HATCH_ALPHA) + 255 * HATCH_ALPHA);
  }
}

/** Fractional index of each pixel coordinate into evenly spaced raster coordinates, clamped to the samples. */
function rasterIndex(coords: Float64Array, samples: number[], scale: AxisScale): Float64Array {
  const t = tf(scale);
  const n = samples.length;
  const a = t(samples[0]);
  const step = n > 1 ? (t(samples[n - 1]) - a) / (n - 1) : 0;
  const out = new Float64Array(coords.length);
  for (let p = 0; p < coords.length; p++) {
    if (n === 1) {
      out[p] = 0;
      continue;
    }
    // Pixels lie inside the map's cell edges; past the outermost sample they take its value
    // (the outer half of an edge cell belongs to that cell).
    out[p] = Math.min(n - 1, Math.max(0, (coords[p] - a) / step));
  }
  return out;
}

/** The interpolated raster, bilinear between raster samples, interpolated areas hatched. */
export function paintRaster(map: Pick<SweepMap, 'x' | 'y' | 'raster'>, opts: PaintOptions): Uint8Array {
  const { width: W, height: H, hatch = true } = opts;
  const period = Math.max(3, Math.round(opts.hatchPeriod ?? 9));
  const r = map.raster;
  const fx = rasterIndex(pixelCoords(map.x, W, false), r.xs, map.x.scale);
  const fy = rasterIndex(pixelCoords(map.y, H, true), r.ys, map.y.scale);
  const px = new Uint8Array(W * H * 4);
  const val = (i: number, j: number) => r.value[j * r.nx + i];
  for (let y = 0; y < H; y++) {
    const gy = fy[y];
    if (Number.isNaN(gy)) continue;
    const j0 = Math.floor(gy);
    const j1 = Math.min(r.ny - 1, j0 + 1);
    const ty = gy - j0;
    for (let x = 0; x < W; x++) {
      const gx = fx[x];
      if (Number.isNaN(gx)) continue;
      const i0 = Math.floor(gx);
      const i1 = Math.min(r.nx - 1, i0 + 1);
      const tx = gx - i0;
      const ni = Math.round(gx);
      const nj = Math.round(gy);
      const origin = r.origin[nj * r.nx + ni];
      if (origin === ORIGIN_OUTSIDE) continue;
      const a = val(i0, j0);
      const b = val(i1, j0);
      const c = val(i0, j1);
      const d = val(i1, j1);
      let v = (a * (1 - tx) + b * tx) * (1 - ty) + (c * (1 - tx) + d * tx) * ty;
      if (!Number.isFinite(v)) v = val(ni, nj);
      if (!Number.isFinite(v)) continue;
      const o = (y * W + x) * 4;
      setColor(px, o, v, opts);
      if (hatch && origin === ORIGIN_INTERPOLATED) hatchAt(px, o, x, y, period);
    }
  }
  return px;
}

/** Index of the cell (between edges) holding each pixel coordinate; -1 outside. */
function cellIndex(coords: Float64Array, axis: Pick<MapAxis, 'scale' | 'edges'>): Int32Array {
  const t = tf(axis.scale);
  const edges = axis.edges.map(t);
  const out = new Int32Array(coords.length);
  let k = 0;
  const ascending = coords.length < 2 || coords[1] >= coords[0];
  for (let q = 0; q < coords.length; q++) {
    const p = ascending ? q : coords.length - 1 - q;
    const v = coords[p];
    while (k < edges.length - 2 && v >= edges[k + 1]) k++;
    out[p] = v < edges[0] || v > edges[edges.length - 1] ? -1 : k;
  }
  return out;
}

/** Measured cells at their true extent (missing grid points grey), as one image. */
export function paintCells(map: Pick<SweepMap, 'x' | 'y' | 'cells'>, opts: PaintOptions): Uint8Array {
  const { width: W, height: H } = opts;
  const nx = map.x.values.length;
  const grid = new Float64Array(nx * map.y.values.length).fill(NaN);
  const xi = new Map(map.x.values.map((v, i) => [v, i]));
  const yi = new Map(map.y.values.map((v, i) => [v, i]));
  for (const c of map.cells) {
    const i = xi.get(c.x);
    const j = yi.get(c.y);
    if (i !== undefined && j !== undefined) grid[j * nx + i] = c.cell.stats.mean;
  }
  const cx = cellIndex(pixelCoords(map.x, W, false), map.x);
  const cy = cellIndex(pixelCoords(map.y, H, true), map.y);
  // One colour per grid point, then whole pixel rows: a row is copied from the one above when both
  // fall in the same cells (a 2× image of a 40×71 map has ~700k pixels but only 71 distinct rows).
  const rgba = new Uint8Array(grid.length * 4);
  for (let k = 0; k < grid.length; k++) {
    const v = grid[k];
    if (Number.isFinite(v)) setColor(rgba, k * 4, v, opts);
    else {
      rgba[k * 4] = MISSING_RGB[0];
      rgba[k * 4 + 1] = MISSING_RGB[1];
      rgba[k * 4 + 2] = MISSING_RGB[2];
      rgba[k * 4 + 3] = 255;
    }
  }
  const px = new Uint8Array(W * H * 4);
  const rowBytes = W * 4;
  for (let y = 0; y < H; y++) {
    if (cy[y] < 0) continue;
    if (y > 0 && cy[y] === cy[y - 1]) {
      px.copyWithin(y * rowBytes, (y - 1) * rowBytes, y * rowBytes);
      continue;
    }
    const base = cy[y] * nx;
    for (let x = 0; x < W; x++) {
      if (cx[x] < 0) continue;
      const o = (y * W + x) * 4;
      const q = (base + cx[x]) * 4;
      px[o] = rgba[q];
      px[o + 1] = rgba[q + 1];
      px[o + 2] = rgba[q + 2];
      px[o + 3] = rgba[q + 3];
    }
  }
  return px;
}

/** A small hatched swatch (for the figure key): a mid-scheme colour with the interpolation hatch. */
export function paintHatchSwatch(opts: { width: number; height: number; lut: Uint8Array; period: number }): Uint8Array {
  const px = new Uint8Array(opts.width * opts.height * 4);
  const po: PaintOptions = { width: opts.width, height: opts.height, domain: [0, 1], lut: opts.lut };
  for (let y = 0; y < opts.height; y++) {
    for (let x = 0; x < opts.width; x++) {
      const o = (y * opts.width + x) * 4;
      setColor(px, o, 0.55, po);
      hatchAt(px, o, x, y, opts.period);
    }
  }
  return px;
}
