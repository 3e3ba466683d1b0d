/** An axis as written in a spec: explicit values or a generator. */
export type AxisDef = number[] | { from: number; to: number; count: number; spacing?: 'log' | 'linear'; round?: boolean };

/**
 * Explicit values of an axis, ascending and distinct. A generator spaces `count` values from
 * `from` to `to` (both included) evenly in log space (default for width and train size:
 * capacity sweeps are geometric, common practice) or linearly. Values are rounded to integers
 * when both ends are integers (widths and sizes are counts) unless `round: false`.
 */
export function expandAxis(def: AxisDef, opts: { defaultSpacing: 'log' | 'linear' }): number[] {
  let values: number[];
  if (Array.isArray(def)) values = [...def];
  else {
    const { from, to, count } = def;
    const spacing = def.spacing ?? opts.defaultSpacing;
    const round = def.round ?? (Number.isInteger(from) && Number.isInteger(to));
    values = [];
    for (let i = 0; i < count; i++) {
      const t = count === 1 ? 0 : i / (count - 1);
      let v = spacing === 'log' ? Math.exp(Math.log(from) + t * (Math.log(to) - Math.log(from))) : from + t * (to - from);
      // Rounding to 12 significant digits removes floating noise such as 0.30000000000000004.
      v = round ? Math.round(v) : Number(v.toPrecision(12));
      values.push(v);
    }
  }
  return [...new Set(values)].sort((a, b) => a - b);
}
