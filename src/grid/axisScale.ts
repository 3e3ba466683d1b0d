import type { AxisScale } from './SweepMap.js';

/** Coefficient of variation of consecutive gaps (0 for perfectly even spacing). */
function gapSpread(values: readonly number[]): number {
  if (values.length < 3) return 0;
  const gaps: number[] = [];
  for (let k = 1; k < values.length; k++) gaps.push(values[k] - values[k - 1]);
  const mean = gaps.reduce((s, g) => s + g, 0) / gaps.length;
  const sd = Math.sqrt(gaps.reduce((s, g) => s + (g - mean) * (g - mean), 0) / gaps.length);
  return mean > 0 ? sd / mean : 0;
}

/**
 * log2 when the values look geometric: all positive, spanning at least a factor 4, and spaced
 * at least as evenly in log as in linear units (widths 4, 8, 16, 32; epochs 1, 10, 100).
 * Everything else (label noise 0, 0.1, 0.2; a few evenly spaced sizes) is linear.
 * Ascending distinct values expected.
 */
export function detectScale(values: readonly number[]): AxisScale {
  const v = [...new Set(values.filter((x) => Number.isFinite(x)))].sort((a, b) => a - b);
  if (v.length < 2 || v[0] <= 0) return 'linear';
  if (v[v.length - 1] / v[0] < 4) return 'linear';
  return gapSpread(v.map(Math.log2)) <= gapSpread(v) ? 'log2' : 'linear';
}

/** Data units → the transformed units interpolation and distances work in. */
export function toScale(scale: AxisScale, v: number): number {
  return scale === 'log2' ? Math.log2(v) : v;
}

/** Transformed units → data units. */
export function fromScale(scale: AxisScale, t: number): number {
  return scale === 'log2' ? 2 ** t : t;
}

/** Forward and inverse maps between data units and transformed units, as functions. */
export interface AxisTransform {
  to: (v: number) => number;
  from: (u: number) => number;
}

/** log2 for geometric axes, identity for linear ones: the functions themselves, for hot loops. */
export function axisTransform(scale: AxisScale): AxisTransform {
  return scale === 'log2' ? { to: Math.log2, from: (u) => 2 ** u } : { to: (v) => v, from: (u) => u };
}

/**
 * values.length + 1 cell edges: midpoints between neighbours in transformed units (geometric
 * midpoints on log2 axes), the outer edges half a gap outside. A single value gets a cell of one
 * transformed unit (a factor of 2 on log2 axes; ±0.5, or ±5% of the value, on linear ones).
 */
export function cellEdges(scale: AxisScale, values: readonly number[]): number[] {
  const t = values.map((v) => toScale(scale, v));
  const n = t.length;
  if (n === 0) return [];
  if (n === 1) {
    const half = scale === 'log2' ? 0.5 : t[0] !== 0 ? Math.abs(t[0]) * 0.05 : 0.5;
    return [finiteEdge(scale, fromScale(scale, t[0] - half)), finiteEdge(scale, fromScale(scale, t[0] + half))];
  }
  // Halves before sums and differences: values near the largest double (1e308) must not overflow.
  const edges = [t[0] - (t[1] / 2 - t[0] / 2)];
  for (let k = 1; k < n; k++) edges.push(t[k - 1] / 2 + t[k] / 2);
  edges.push(t[n - 1] + (t[n - 1] / 2 - t[n - 2] / 2));
  return edges.map((e) => finiteEdge(scale, fromScale(scale, e)));
}

/**
 * An edge kept finite (and, on a log2 axis, above zero): past the largest double the outer edge
 * of a cell at 1e308 is the largest double; below the smallest one the edge of a cell at 5e-324
 * is the smallest. Cells at such values are absurd, but the map must still draw, never hold null.
 */
function finiteEdge(scale: AxisScale, v: number): number {
  if (scale === 'log2') return v > Number.MAX_VALUE ? Number.MAX_VALUE : v < Number.MIN_VALUE ? Number.MIN_VALUE : v;
  return v > Number.MAX_VALUE ? Number.MAX_VALUE : v < -Number.MAX_VALUE ? -Number.MAX_VALUE : v;
}
