import { parseCondition } from '../store/conditionText.js';
import type { Cell } from '../cells/Cell.js';
import { buildCells } from '../cells/buildCells.js';
import { mapMessages as msg } from '../messages.js';
import type { Metric, RowTable } from '../store/RowTable.js';
import { AXES, defaultMetric, textReader, textValues } from '../store/RowTable.js';
import { eachRunKey } from '../store/rowKeys.js';
import { UserError, usageError } from '../UserError.js';
import { cellEdges, detectScale, fromScale, toScale } from './axisScale.js';
import { gaussianProcessField } from './gaussianProcessField.js';
import type { FittedField, ScatterPoints } from './Interpolator.js';
import { lowerBound } from './Interpolator.js';
import { linearField } from './linearField.js';
import type { AxisScale, MapAxis, MapCell, MapKind, MethodName, SweepMap } from './SweepMap.js';
import { MAP_AXES, ORIGIN_INTERPOLATED, ORIGIN_MEASURED, ORIGIN_OUTSIDE } from './SweepMap.js';
import { thinPlateField } from './thinPlateField.js';

export interface MapOptions {
  kind?: MapKind;
  x?: string;
  y?: string;
  at?: Record<string, number | string>;
  metric?: Metric;
  method?: MethodName | 'auto';
  raster?: { nx: number; ny: number };
  scales?: Record<string, AxisScale>;
  /** When epochs is a map axis: align every run to these epochs (default: chosen from the logged ones). */
  epochs?: number[];
  /** At most this many epochs on an epochs axis before the logged ones are thinned (default 100). */
  maxEpochs?: number;
}

export const DEFAULT_RASTER = { nx: 256, ny: 256 };
/** `auto` tries the Gaussian process up to this many cells (its cost grows as n³). */
export const GP_AUTO_MAX = 2500;
export const METHODS: readonly MethodName[] = ['linear', 'thin-plate', 'gp'];

/** Names --at may fix: the four axes and the condition. */
const FIXABLE = [...AXES, 'condition'] as const;
/** The order fixed values are picked in: each pick counts only rows matching the earlier ones. */
const PICK_ORDER = ['condition', 'label_noise', 'train_size', 'width', 'epochs'] as const;

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

export { parseCondition };

const sameNumber = (a: number, b: number) => a === b || Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));

// The row loops below run over every row of the store. As small functions of their own they are
// compiled to machine code after a few thousand iterations; inside buildMap (called once per
// command) they stayed in the slower tiers for most of a million rows.

/** Rows with a finite metric or a diverged mark. */
function informativeRows(metric: Float64Array, status: (i: number) => string): Int32Array {
  // Counted first, then filled: a million pushes spent their time growing and copying the array.
  // The status is read only where the metric is missing.
  let count = 0;
  for (let i = 0; i < metric.length; i++) if (Number.isFinite(metric[i]) || status(i) === 'diverged') count++;
  // Row lists are Int32Arrays: a million-element JS array is 8 MB of fresh garbage-collected
  // memory, twice the size and far slower to fault in than a typed array.
  const rows = new Int32Array(count);
  let k = 0;
  for (let i = 0; i < metric.length; i++) if (Number.isFinite(metric[i]) || status(i) === 'diverged') rows[k++] = i;
  return rows;
}

/** Adds the count of each value over `rows`, one map update per stretch of equal values (rows of a run are contiguous). */
function countStretches(rows: Int32Array, col: Float64Array | ((i: number) => number | string), counts: Map<number | string, number>): void {
  const fn = typeof col === 'function' ? col : null;
  const arr = typeof col === 'function' ? null : col;
  let cur: number | string | undefined;
  let run = 0;
  for (let r = 0; r < rows.length; r++) {
    const v = arr ? arr[rows[r]] : fn!(rows[r]);
    if (run > 0 && v === cur) {
      run++;
      continue;
    }
    if (run > 0) counts.set(cur!, (counts.get(cur!) ?? 0) + run);
    cur = v;
    run = 1;
  }
  if (run > 0) counts.set(cur!, (counts.get(cur!) ?? 0) + run);
}

/** The rows whose value in `col` is `v` (up to rounding). */
function rowsNear(rows: Int32Array, col: Float64Array, v: number): Int32Array {
  // Counted, then filled (as informativeRows): often nearly every row matches.
  let count = 0;
  for (let r = 0; r < rows.length; r++) if (sameNumber(col[rows[r]], v)) count++;
  if (count === rows.length) return rows; // row lists are never changed in place
  const out = new Int32Array(count);
  let k = 0;
  for (let r = 0; r < rows.length; r++) if (sameNumber(col[rows[r]], v)) out[k++] = rows[r];
  return out;
}

function fitMethod(method: MethodName, p: ScatterPoints): FittedField {
  if (method === 'linear') return linearField(p);
  if (method === 'thin-plate') return thinPlateField(p);
  return gaussianProcessField(p);
}

/** Epochs an epochs axis uses: all logged ones, or (too many) those most runs logged, or a log-spaced subset. */
function chooseEpochs(table: RowTable, rows: Int32Array, max: number, notes: string[]): number[] {
  const perEpoch = new Map<number, Set<string>>();
  const runs = new Set<string>();
  eachRunKey(table, rows, (id, i) => {
    const e = table.epochs[i];
    if (!Number.isFinite(e)) return;
    runs.add(id);
    let s = perEpoch.get(e);
    if (!s) perEpoch.set(e, (s = new Set()));
    s.add(id);
  });
  const all = [...perEpoch.keys()].sort((a, b) => a - b);
  if (all.length <= max) return all;
  const common = all.filter((e) => perEpoch.get(e)!.size * 2 >= runs.size);
  let used: number[];
  if (common.length >= 2 && common.length <= max) used = common;
  else {
    // Nearest logged epoch to each of `max` targets evenly spaced in log epoch (linear when epoch 0 dominates).
    const pos = all.filter((e) => e > 0);
    const lo = Math.log(pos[0]);
    const hi = Math.log(pos[pos.length - 1]);
    const pick = new Set<number>();
    if (all[0] <= 0) pick.add(all[0]);
    for (let k = 0; k < max; k++) {
      const t = Math.exp(lo + ((hi - lo) * k) / (max - 1));
      const j = lowerBound(pos, t);
      const a = pos[Math.max(0, j - 1)];
      const b = pos[Math.min(pos.length - 1, j)];
      pick.add(Math.abs(Math.log(a / t)) <= Math.abs(Math.log(b / t)) ? a : b);
    }
    used = [...pick].sort((a, b) => a - b);
  }
  notes.push(msg.epochsThinned(all.length, used.length));
  return used;
}

function evenly(n: number): Float64Array {
  return Float64Array.from({ length: n }, (_, k) => (n === 1 ? 0 : k / (n - 1)));
}

/** The sweep's conditions, parsed once: their keys (weight_decay, optimizer, ...) can be map axes (numeric ones) or fixed with `at`. */
interface Conditions {
  values: string[];
  parsed: Map<string, Map<string, string>>;
  /** Keys that are not the four axes nor `condition` itself, sorted. */
  keys: string[];
  numericKeys: string[];
  isKey(name: string): boolean;
  keyValue(condition: string, key: string): number | string | undefined;
}

function readConditions(table: RowTable): Conditions {
  const parsed = new Map<string, Map<string, string>>();
  const values = textValues(table, 'condition');
  for (const c of values) parsed.set(c, parseCondition(c));
  const keyValues = new Map<string, string[]>();
  for (const m of parsed.values()) for (const [k, v] of m) keyValues.set(k, [...(keyValues.get(k) ?? []), v]);
  const keys = [...keyValues.keys()].filter((k) => !(FIXABLE as readonly string[]).includes(k)).sort();
  const numericKeys = keys.filter((k) => keyValues.get(k)!.every((v) => NUMBER.test(v)));
  return {
    values, parsed, keys, numericKeys,
    isKey: (n) => keys.includes(n),
    keyValue: (c, key) => {
      const v = parsed.get(c)!.get(key);
      return v === undefined ? undefined : NUMBER.test(v) ? Number(v) : v;
    },
  };
}

/** Step 1: which axes the map is over, and what kind of map that is. Usage errors for unknown or equal axes and bad `at` names. */
function resolveAxes(opts: MapOptions, conds: Conditions): { kind: SweepMap['kind']; xName: string; yName: string } {
  const kindAxes = MAP_AXES[opts.kind ?? 'model'];
  const xName = opts.x ?? kindAxes.x;
  const yName = opts.y ?? kindAxes.y;
  const axisNames = [...AXES, ...conds.numericKeys];
  for (const n of [xName, yName]) if (!axisNames.includes(n)) throw usageError(msg.unknownAxis(n, axisNames));
  if (xName === yName) throw usageError(msg.sameAxes(xName));
  const kind: SweepMap['kind'] =
    xName === kindAxes.x && yName === kindAxes.y ? (opts.kind ?? 'model') : ((Object.keys(MAP_AXES) as MapKind[]).find((k) => MAP_AXES[k].x === xName && MAP_AXES[k].y === yName) ?? 'custom');
  for (const name of Object.keys(opts.at ?? {})) {
    if (!(FIXABLE as readonly string[]).includes(name) && !conds.isKey(name)) throw usageError(msg.atUnknown(name, [...FIXABLE, ...conds.keys]));
    if (name === xName || name === yName) throw usageError(msg.atOnMapAxis(name));
  }
  return { kind, xName, yName };
}

/**
 * Step 2: the rows of the slice. Rows carrying information (a finite metric or a diverged mark),
 * restricted to the `at` values, then every other axis (and the condition) fixed: the given value,
 * or the one with the most rows (ties to the largest), listed in `picked` (an axis with a single
 * value left in the slice is fixed but not listed: nothing was chosen). Epochs are fixed later,
 * by aligning runs along their curves.
 */
function sliceRows(table: RowTable, opts: MapOptions, conds: Conditions, axes: { xName: string; yName: string }, metric: Metric): {
  rows: Int32Array;
  fixed: Record<string, number | string>;
  picked: string[];
  /** Picked names whose value tied with others for the most rows: how many levels tied. */
  pickedTies: Record<string, number>;
} {
  const { xName, yName } = axes;
  const at = opts.at ?? {};
  const { isKey, keyValue } = conds;
  // Row loops read text through the store's codes when it has them (no whole-column decoding).
  const condition = textReader(table, 'condition');
  // The condition left to fix once axis keys and `at` keys are taken out of it.
  const setAside = new Set([xName, yName, ...Object.keys(at)].filter(isKey));
  const restCache = new Map<string, string>();
  const restOf = (c: string): string => {
    let r = restCache.get(c);
    if (r === undefined) {
      const m = conds.parsed.get(c)!;
      r = m.size === 0 ? c : [...m].filter(([k]) => !setAside.has(k)).map(([k, v]) => `${k}=${v}`).join(',');
      restCache.set(c, r);
    }
    return r;
  };

  let rows: Int32Array = informativeRows(table[metric], textReader(table, 'status'));
  if (rows.length === 0) throw new UserError(msg.noMetric(metric));
  for (const [key, want] of Object.entries(at)) {
    if (!isKey(key)) continue;
    const match = (v: number | string | undefined) => (typeof v === 'number' && typeof want === 'number' ? sameNumber(v, want) : v !== undefined && String(v) === String(want));
    const kept = rows.filter((i) => match(keyValue(condition(i), key)));
    if (kept.length === 0) throw new UserError(msg.atValueAbsent(key, want, [...new Set(Array.from(rows, (i) => keyValue(condition(i), key)).filter((v) => v !== undefined))] as (number | string)[]));
    rows = kept;
  }

  const fixed: Record<string, number | string> = {};
  for (const [key, v] of Object.entries(at)) if (isKey(key)) fixed[key] = v;
  const picked: string[] = [];
  const pickedTies: Record<string, number> = {};
  // Only a condition that has something left can be in a row (a store of one condition never loops).
  const hasConditions = conds.values.some((c) => restOf(c) !== '') && rows.some((i) => restOf(condition(i)) !== '');
  for (const name of PICK_ORDER) {
    if (name === xName || name === yName) continue;
    if (name === 'condition' && !hasConditions && at.condition === undefined) continue;
    const valueOf = (i: number): number | string => (name === 'condition' ? restOf(condition(i)) : table[name][i]);
    const given = at[name];
    let value: number | string;
    if (given !== undefined) {
      if (name === 'condition') value = String(given);
      else {
        value = typeof given === 'number' ? given : Number(given);
        if (!Number.isFinite(value)) throw usageError(msg.atNotNumber(name, String(given)));
      }
      // Epochs need not be logged exactly: runs are aligned to it along their own curves.
      if (name !== 'epochs' && !rows.some((i) => (typeof value === 'number' ? sameNumber(valueOf(i) as number, value) : valueOf(i) === value))) {
        const available = [...new Set(Array.from(rows, valueOf))].sort((a, b) => (typeof a === 'number' && typeof b === 'number' ? a - b : String(a) < String(b) ? -1 : 1));
        throw new UserError(msg.atValueAbsent(name, value, available));
      }
    } else {
      const counts = new Map<number | string, number>();
      countStretches(rows, name === 'condition' ? valueOf : table[name], counts);
      let best: number | string | undefined;
      let bestCount = -1;
      for (const [v, c] of counts) {
        const better =
          c > bestCount ||
          (c === bestCount && (typeof v === 'number' ? (v as number) > (best as number) : String(v) < String(best)));
        if (better && !(typeof v === 'number' && !Number.isFinite(v))) {
          best = v;
          bestCount = c;
        }
      }
      if (best === undefined) throw new UserError(msg.noMetric(metric));
      value = best;
      const levels = [...counts].filter(([v]) => !(typeof v === 'number' && !Number.isFinite(v)));
      // An axis with one value left in the slice offers no choice: it is fixed, not picked.
      if (levels.length > 1) {
        picked.push(name);
        // Levels with as much data as the pick: the pick is only the tie-break (largest), not "most data".
        const tied = levels.filter(([, c]) => c === bestCount).length;
        if (tied > 1) pickedTies[name] = tied;
      }
    }
    fixed[name] = value;
    if (name !== 'epochs') {
      const v = value;
      // Numeric axes read their column directly (this runs over every row of the store).
      const col = name === 'condition' ? null : table[name];
      rows = col && typeof v === 'number' ? rowsNear(rows, col, v) : rows.filter((i) => (typeof v === 'number' ? sameNumber(valueOf(i) as number, v) : valueOf(i) === v));
    }
  }
  return { rows, fixed, picked, pickedTies };
}

/**
 * Step 3: the seed-aggregated cells of the slice. With epochs fixed or an epochs axis, every run
 * is aligned to the target epochs along its own curve; runs that stopped before a fixed epoch are
 * counted in a note, since they silently thin the cells.
 */
function sliceCells(table: RowTable, opts: MapOptions, slice: { rows: Int32Array; fixed: Record<string, number | string> }, axes: { xName: string; yName: string }, metric: Metric, notes: string[]): { cells: Cell[]; epochTargets: number[] | undefined } {
  const { rows, fixed } = slice;
  const epochTargets =
    fixed.epochs !== undefined ? [fixed.epochs as number] : axes.xName === 'epochs' || axes.yName === 'epochs' ? (opts.epochs ?? chooseEpochs(table, rows, opts.maxEpochs ?? 100, notes)) : undefined;
  const cells = buildCells(table, { metric, epochs: epochTargets, rows });
  if (fixed.epochs !== undefined) {
    const last = new Map<string, number>();
    eachRunKey(table, rows, (id, i) => last.set(id, Math.max(last.get(id) ?? -Infinity, table.epochs[i])));
    const short = [...last.values()].filter((e) => e < (fixed.epochs as number)).length;
    if (short > 0) notes.push(msg.runsEndBefore(short, fixed.epochs as number));
  }
  const fixedText = Object.entries(fixed).map(([k, v]) => `${k}=${v}`).join(', ') || 'the whole sweep';
  if (cells.length === 0) throw new UserError(msg.noCells(fixedText));
  return { cells, epochTargets };
}

/** The cells placed on the two axes, with the grid points that lack a measurement. */
interface PlacedCells {
  xAxis: MapAxis;
  yAxis: MapAxis;
  mapCells: MapCell[];
  measured: MapCell[];
  /** 1 where grid point (x value i, y value j) holds a measured cell, at j * nx + i. */
  isMeasured: Uint8Array;
  missing: { x: number; y: number }[];
  diverged: { x: number; y: number; count: number }[];
}

/**
 * Step 4: the axes. Each axis's scale (log2 when its values are roughly geometric, or as given),
 * cells without a place dropped (a condition lacking an axis key; values <= 0 on a log2 axis,
 * noted), each axis's values and cell edges, and the missing and diverged grid points.
 */
function chooseAxes(cells: Cell[], opts: MapOptions, conds: Conditions, axes: { xName: string; yName: string }, notes: string[]): PlacedCells {
  const { xName, yName } = axes;
  const coord = (c: Cell, name: string) => (conds.isKey(name) ? (conds.keyValue(c.condition, name) as number) : (c[name as keyof Cell] as number));
  const placed = cells.filter((c) => Number.isFinite(coord(c, xName)) && Number.isFinite(coord(c, yName)));
  const axisScale = (name: string): AxisScale => {
    if (opts.scales?.[name]) return opts.scales[name];
    const vals = [...new Set(placed.map((c) => coord(c, name)))].sort((a, b) => a - b);
    const pos = vals.filter((v) => v > 0);
    return pos.length < vals.length && pos.length >= 3 && detectScale(pos) === 'log2' && name === 'epochs' ? 'log2' : detectScale(vals);
  };
  const xScale = axisScale(xName);
  const yScale = axisScale(yName);
  let kept = placed;
  for (const [name, scale] of [[xName, xScale], [yName, yScale]] as const) {
    if (scale !== 'log2') continue;
    const before = kept.length;
    kept = kept.filter((c) => coord(c, name) > 0);
    if (kept.length < before) notes.push(msg.droppedNonPositive(name, before - kept.length));
  }
  const makeAxis = (name: string, scale: AxisScale): MapAxis => {
    const values = [...new Set(kept.map((c) => coord(c, name)))].sort((a, b) => a - b);
    return { name, scale, values, edges: cellEdges(scale, values) };
  };
  const xAxis = makeAxis(xName, xScale);
  const yAxis = makeAxis(yName, yScale);

  const mapCells: MapCell[] = kept.map((cell) => ({ x: coord(cell, xName), y: coord(cell, yName), cell }));
  const measured = mapCells.filter((m) => m.cell.stats.n > 0);
  const xIndex = new Map(xAxis.values.map((v, k) => [v, k]));
  const yIndex = new Map(yAxis.values.map((v, k) => [v, k]));
  const nxv = xAxis.values.length;
  const isMeasured = new Uint8Array(nxv * yAxis.values.length);
  for (const m of measured) isMeasured[yIndex.get(m.y)! * nxv + xIndex.get(m.x)!] = 1;
  const missing: { x: number; y: number }[] = [];
  yAxis.values.forEach((y, j) => xAxis.values.forEach((x, i) => {
    if (!isMeasured[j * nxv + i]) missing.push({ x, y });
  }));
  const diverged = mapCells.filter((m) => m.cell.diverged > 0).map((m) => ({ x: m.x, y: m.y, count: m.cell.diverged }));
  return { xAxis, yAxis, mapCells, measured, isMeasured, missing, diverged };
}

/** The transformed plane the field lives in: each axis's [min, max] in its scale mapped to [0, 1]. */
interface Plane {
  sx: { lo: number; hi: number; norm: (v: number) => number };
  sy: { lo: number; hi: number; norm: (v: number) => number };
  xVaries: boolean;
  yVaries: boolean;
  dims: 1 | 2;
}

function planeOf(xAxis: MapAxis, yAxis: MapAxis): Plane {
  const span = (a: MapAxis) => {
    const lo = toScale(a.scale, a.values[0]);
    const hi = toScale(a.scale, a.values[a.values.length - 1]);
    return { lo, hi, norm: (v: number) => (hi > lo ? (toScale(a.scale, v) - lo) / (hi - lo) : 0) };
  };
  const xVaries = xAxis.values.length > 1;
  const yVaries = yAxis.values.length > 1;
  return { sx: span(xAxis), sy: span(yAxis), xVaries, yVaries, dims: xVaries && yVaries ? 2 : 1 };
}

/**
 * Step 5: fit the field. The measured cell means (with their squared standard errors as noise)
 * in the normalised plane, fitted by the requested method, or under `auto` by every method, the
 * one with the lowest leave-one-out RMSE kept (compared on the cells every tried method predicts).
 */
function fitField(measured: MapCell[], plane: Plane, opts: MapOptions, names: { xName: string; yName: string }): {
  method: MethodName;
  fitted: FittedField;
  loo: SweepMap['loo'];
} {
  const { sx, sy, xVaries, yVaries, dims } = plane;
  const n = measured.length;
  if (n < 2 || (!xVaries && !yVaries)) throw new UserError(msg.tooFewCells(n, names.xName, names.yName));
  // In one dimension the varying axis plays x for the interpolators.
  const u = (m: MapCell) => (dims === 2 || xVaries ? sx.norm(m.x) : sy.norm(m.y));
  const w = (m: MapCell) => (dims === 2 ? sy.norm(m.y) : 0);
  const pooledVar = (() => {
    const v = measured.filter((m) => m.cell.stats.n >= 2).map((m) => m.cell.stats.sd ** 2).sort((a, b) => a - b);
    return v.length ? v[Math.floor(v.length / 2)] : NaN;
  })();
  const points: ScatterPoints = {
    dims,
    x: Float64Array.from(measured, u),
    y: Float64Array.from(measured, w),
    v: Float64Array.from(measured, (m) => m.cell.stats.mean),
    // Noise of a cell mean: its squared standard error; a one-seed cell takes the median seed variance.
    noise: Number.isFinite(pooledVar)
      ? Float64Array.from(measured, (m) => (m.cell.stats.n >= 2 ? m.cell.stats.se ** 2 : pooledVar / Math.max(1, m.cell.stats.n)))
      : null,
  };

  const requested = opts.method ?? 'auto';
  const candidates: MethodName[] = requested === 'auto' ? [...METHODS] : [requested];
  const fits = new Map<MethodName, FittedField>();
  const skipped: Partial<Record<MethodName, string>> = {};
  for (const m of candidates) {
    if (requested === 'auto' && m === 'gp' && n > GP_AUTO_MAX) {
      skipped.gp = msg.gpSkipped(n, GP_AUTO_MAX);
      continue;
    }
    try {
      fits.set(m, fitMethod(m, points));
    } catch (err) {
      const why = (err as Error).message;
      if (requested !== 'auto') throw new UserError(msg.methodFailed(m, why));
      skipped[m] = msg.triedFailed(m, why);
    }
  }
  if (fits.size === 0) throw new UserError(msg.noMethodWorked(Object.values(skipped).join('; ')));
  const common: number[] = [];
  for (let i = 0; i < n; i++) if ([...fits.values()].every((f) => Number.isFinite(f.loo[i]))) common.push(i);
  const tried: Partial<Record<MethodName, number>> = {};
  for (const [m, f] of fits) {
    let s = 0;
    for (const i of common) s += (f.loo[i] - points.v[i]) ** 2;
    tried[m] = common.length ? Math.sqrt(s / common.length) : NaN;
  }
  let method = [...fits.keys()][0];
  for (const m of fits.keys()) if ((tried[m] ?? Infinity) < (tried[method] ?? Infinity)) method = m;
  return {
    method,
    fitted: fits.get(method)!,
    loo: { method, rmse: tried[method] ?? NaN, tried, points: common.length, ...(Object.keys(skipped).length ? { skipped } : {}) },
  };
}

/**
 * Step 6: rasterise. The fitted field on a regular raster over the normalised plane (one raster
 * line along an axis with a single value), each raster point's origin marked: inside a measured
 * cell, interpolated, or outside the data.
 */
function rasterise(fitted: FittedField, plane: Plane, placed: PlacedCells, size: { nx: number; ny: number } | undefined): SweepMap['raster'] {
  const { sx, sy, xVaries, yVaries, dims } = plane;
  const { xAxis, yAxis, isMeasured } = placed;
  const nx = xVaries ? (size?.nx ?? DEFAULT_RASTER.nx) : 1;
  const ny = yVaries ? (size?.ny ?? DEFAULT_RASTER.ny) : 1;
  const gxN = evenly(nx);
  const gyN = evenly(ny);
  let value: Float64Array;
  let sd: Float64Array | null;
  if (dims === 2) ({ value, sd } = fitted.grid(gxN, gyN));
  else ({ value, sd } = fitted.grid(xVaries ? gxN : gyN, new Float64Array(1))); // nx × 1 or 1 × ny: same row-major order
  const xs = Array.from(gxN, (t) => fromScale(xAxis.scale, sx.lo + t * (sx.hi - sx.lo)));
  const ys = Array.from(gyN, (t) => fromScale(yAxis.scale, sy.lo + t * (sy.hi - sy.lo)));
  const origin = new Uint8Array(nx * ny);
  const nxv = xAxis.values.length;
  const xi = xs.map((x) => Math.min(xAxis.values.length - 1, Math.max(0, lowerBound(xAxis.edges, x) - 1)));
  const yi = ys.map((y) => Math.min(yAxis.values.length - 1, Math.max(0, lowerBound(yAxis.edges, y) - 1)));
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = j * nx + i;
      origin[k] = isMeasured[yi[j] * nxv + xi[i]]
        ? ORIGIN_MEASURED
        : Number.isFinite(value[k])
          ? ORIGIN_INTERPOLATED
          : ORIGIN_OUTSIDE;
    }
  }
  return { nx, ny, xs, ys, value, sd, origin };
}

/** Notes a reader of the cells should see: cells resting on one seed, and heavy-tailed cells (mean and median far apart). */
function cellNotes(measured: MapCell[]): string[] {
  const notes: string[] = [];
  const oneSeed = measured.filter((m) => m.cell.stats.n === 1).length;
  if (oneSeed > 0) notes.push(msg.oneSeedCells(oneSeed));
  const heavy = measured.filter((m) => {
    const { n: k, mean, median } = m.cell.stats;
    return k >= 3 && mean > 0 && median > 0 && (mean > 2 * median || median > 2 * mean);
  }).length;
  if (heavy > 0) notes.push(msg.heavyTails(heavy));
  return notes;
}

/**
 * A map: the metric over two axes with every other axis (and the condition) fixed, from the
 * seed-aggregated cells, interpolated on a regular raster in the transformed plane.
 * Fixed values not given in `at` are picked — the value with the most rows, ties to the largest —
 * and listed in `picked` (unless the slice holds a single value of that axis). `auto` picks the method with the lowest leave-one-out RMSE.
 * The steps: resolve the axes, slice the rows, aggregate the cells, choose the axes' scales and
 * values, fit the field, rasterise it.
 */
export function buildMap(table: RowTable, opts: MapOptions): SweepMap {
  const conds = readConditions(table);
  const { kind, xName, yName } = resolveAxes(opts, conds);
  const names = { xName, yName };
  const metric = opts.metric ?? defaultMetric(table);
  const notes: string[] = [];
  const slice = sliceRows(table, opts, conds, names, metric);
  const { cells, epochTargets } = sliceCells(table, opts, slice, names, metric, notes);
  const placed = chooseAxes(cells, opts, conds, names, notes);
  const plane = planeOf(placed.xAxis, placed.yAxis);
  const { method, fitted, loo } = fitField(placed.measured, plane, opts, names);
  notes.push(...fitted.notes);
  const raster = rasterise(fitted, plane, placed, opts.raster);
  notes.push(...cellNotes(placed.measured));
  return {
    kind,
    x: placed.xAxis,
    y: placed.yAxis,
    metric,
    fixed: slice.fixed,
    picked: slice.picked,
    pickedTies: slice.pickedTies,
    method,
    loo,
    cells: placed.mapCells,
    missing: placed.missing,
    diverged: placed.diverged,
    raster,
    notes,
    fitNotes: fitted.notes,
    ...(fitted.params ? { fit: fitted.params } : {}),
    ...(epochTargets ? { alignedEpochs: epochTargets } : {}),
  };
}
