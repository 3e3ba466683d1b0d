/**
 * Short human numbers for tables and sentences: integers as such (with thin grouping above 1e5
 * written as powers like 1e5 when they are exact powers of ten), fractions to 3 significant digits.
 */
export function formatNumber(v: number | null | undefined, digits = 3): string {
  if (v === null || v === undefined || Number.isNaN(v)) return '–';
  if (!Number.isFinite(v)) return v > 0 ? '∞' : '−∞';
  const a = Math.abs(v);
  if (a >= 1e5) {
    const e = Math.round(Math.log10(a));
    if (Math.abs(a - 10 ** e) < 1e-9 * a) return `${v < 0 ? '−' : ''}1e${e}`;
    return v.toExponential(digits - 1).replace('e+', 'e');
  }
  if (Number.isInteger(v)) return String(v);
  if (a >= 100) return String(Math.round(v));
  if (a === 0) return '0';
  if (a < 1e-3) return v.toExponential(digits - 1);
  return Number(v.toPrecision(digits)).toString();
}

/** "0.412 (0.398–0.425)" or "0.412" when there is no interval. */
export function formatInterval(mean: number, low: number | null, high: number | null): string {
  if (low === null || high === null) return formatNumber(mean);
  return `${formatNumber(mean)} (${formatNumber(low)}–${formatNumber(high)})`;
}

/** "label_noise 0.2 · train_size 1024" from a fixed-values record (condition "" is left out). */
export function formatFixed(fixed: Record<string, number | string>): string {
  return Object.entries(fixed)
    .filter(([k, v]) => !(k === 'condition' && v === ''))
    .map(([k, v]) => `${k} ${typeof v === 'number' ? formatNumber(v) : v}`)
    .join(' · ');
}

/** A compute cost: seconds as s / min / h, relative units as a plain number with the unit named. */
export function formatCost(v: number, units: 'seconds' | 'relative'): string {
  if (units === 'relative') return `${formatNumber(v)} relative units`;
  if (v < 120) return `${formatNumber(v)} s`;
  if (v < 7200) return `${formatNumber(v / 60)} min`;
  return `${formatNumber(v / 3600)} h`;
}
