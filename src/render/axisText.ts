import type { MapAxis, SweepMap } from '../grid/SweepMap.js';
import type { Metric } from '../store/RowTable.js';
import { formatNumber, numberExpr } from '../formatNumber.js';
import { pickWhy } from '../messages.js';

/** Plain names of the sweep axes, as they appear in titles. */
const AXIS_LABEL: Record<string, string> = {
  width: 'width',
  epochs: 'epochs',
  train_size: 'train size',
  label_noise: 'label noise',
};

/** Units for axis titles (what one step of the axis counts). */
const AXIS_UNIT: Record<string, string> = {
  width: 'model size',
  train_size: 'samples',
  label_noise: 'fraction of labels corrupted',
};

export function axisLabel(name: string): string {
  return AXIS_LABEL[name] ?? name.replace(/_/g, ' ');
}

export function metricLabel(metric: Metric): string {
  return metric.replace(/_/g, ' ');
}

/** An axis title with its unit and scale, e.g. "train size (samples, log scale)". */
export function axisTitle(axis: Pick<MapAxis, 'name' | 'scale' | 'source'>): string {
  // Read from another column (a ratio p/n, a feature count D): that name, not the generic unit.
  const parts = [axis.source ?? AXIS_UNIT[axis.name], axis.scale === 'log2' ? 'log scale' : null].filter(Boolean);
  return parts.length ? `${axisLabel(axis.name)} (${parts.join(', ')})` : axisLabel(axis.name);
}

/** An axis value as text: the tool's one number format (formatNumber). */
export function groupDigits(v: number): string {
  return formatNumber(v, 4);
}

/** One fixed value in words: "train size 4000", "label noise 0.2", "condition adam". */
export function fixedValueText(name: string, value: number | string): string {
  if (name === 'condition') return value === '' ? 'no condition' : `condition ${value}`;
  if (typeof value === 'string') return `${axisLabel(name)} ${value}`;
  return `${axisLabel(name)} ${groupDigits(value)}`;
}

/** Seeds per cell as words: "3 seeds per cell", "1–5 seeds per cell". */
export function seedsText(map: Pick<SweepMap, 'cells'>): string {
  let lo = Infinity;
  let hi = 0;
  for (const c of map.cells) {
    lo = Math.min(lo, c.cell.stats.n);
    hi = Math.max(hi, c.cell.stats.n);
  }
  if (!map.cells.length) return 'no measured cells';
  const range = lo === hi ? String(lo) : `${lo}–${hi}`;
  return `${range} seed${hi === 1 ? '' : 's'} per cell`;
}

/**
 * The subtitle line naming everything held fixed:
 * "train size 4,000 · label noise 20% · 3 seeds per cell · method gp".
 * Values the tool picked (most data) are marked so a reader knows they were not asked for.
 */
export function fixedLine(map: Pick<SweepMap, 'fixed' | 'picked' | 'pickedTies' | 'cells' | 'method'>, opts: { omit?: string[]; method?: boolean } = {}): string {
  const { omit = [], method = true } = opts;
  const parts: string[] = [];
  for (const [name, value] of Object.entries(map.fixed)) {
    if (omit.includes(name)) continue;
    if (name === 'condition' && value === '') continue;
    parts.push(fixedValueText(name, value) + (map.picked.includes(name) ? pickWhy(map.pickedTies?.[name]) : ''));
  }
  parts.push(seedsText(map));
  if (method) parts.push(`method ${map.method}`);
  return parts.join(' · ');
}

/**
 * Tick values that read well: powers of two for width, the sweep's own values when there are few,
 * powers of ten over long log ranges. At most `max` ticks.
 */
export function axisTicks(axis: Pick<MapAxis, 'name' | 'scale' | 'values' | 'edges'>, max = 8): number[] {
  const lo = Math.min(axis.edges[0], axis.values[0]);
  const hi = Math.max(axis.edges[axis.edges.length - 1], axis.values[axis.values.length - 1]);
  const inside = (v: number) => v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9);
  if (axis.scale === 'log2' && lo > 0) {
    if (axis.name === 'width') {
      const pow: number[] = [];
      for (let e = Math.ceil(Math.log2(lo) - 1e-9); e <= Math.floor(Math.log2(hi) + 1e-9); e++) pow.push(2 ** e);
      return thin(pow, max);
    }
    if (hi / lo > 1e4 && axis.values.length > max) {
      const pow: number[] = [];
      for (let e = Math.ceil(Math.log10(lo) - 1e-9); e <= Math.floor(Math.log10(hi) + 1e-9); e++) pow.push(10 ** e);
      if (pow.length >= 3) return thin(pow, max);
    }
  }
  const round = (v: number) => Number.isInteger(v) && (Number.isInteger(Math.log2(v)) || v === Number(v.toPrecision(2)));
  if (axis.scale === 'log2' && lo > 0 && !axis.values.every((v) => v === 0 || round(v))) {
    // Irregular values (e.g. 1, 3.3, 10.8, ...) make poor labels: use powers of two or ten instead.
    const base = hi / lo > 1e4 ? 10 : 2;
    const pow: number[] = [];
    for (let e = Math.ceil(Math.log(lo) / Math.log(base) - 1e-9); e <= Math.floor(Math.log(hi) / Math.log(base) + 1e-9); e++) pow.push(base ** e);
    if (pow.length >= 2) return thin(pow, max);
  }
  return thin(axis.values.filter(inside), max);
}

/** Every k-th value (k smallest that fits), always keeping the first. */
function thin(values: number[], max: number): number[] {
  if (values.length <= max) return values;
  const k = Math.ceil(values.length / max);
  return values.filter((_, i) => i % k === 0);
}

/** Vega expression formatting a tick with the tool's one number format: 512, 16.4k, 1M, 0.2. */
export const TICK_LABEL_EXPR = numberExpr('datum.value');

/** Tick label expression for an axis (every axis, label noise included, as in text and tables). */
export function tickLabelExpr(_name: string): string {
  return TICK_LABEL_EXPR;
}

/** Vega number format for a metric: error rates as percent, losses as plain numbers. */
export function metricFormat(metric: Metric, domain: [number, number]): string {
  if (metric.endsWith('_error')) return domain[1] - domain[0] < 0.05 ? '.1%' : '.0%';
  return '.3~g';
}
