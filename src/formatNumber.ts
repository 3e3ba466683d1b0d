/**
 * The one number formatter of the tool: text, tables, chart labels (numberExpr, the same rules in
 * vega's expression language) and the HTML page (which embeds this very function's source) all
 * print a number the same way.
 *
 * SI style for large magnitudes, chosen once: |v| >= 1e4 as 3 significant digits with k, M, G, T
 * (56234 → "56.2k", 1e5 → "100k", 178000 → "178k", 1e6 → "1M"); integers below 1e4 exactly
 * (512, 1024); 100..1e4 rounded to a whole number; smaller values to `digits` significant digits
 * (0.412, 0.1); below 1e-3 in e-notation (1.2e-4). Missing values are "–".
 *
 * Self-contained on purpose (no references outside its body): its source is embedded in the
 * report page's script.
 */
export function formatNumber(v: number | null | undefined, digits = 3): string {
  if (v === null || v === undefined || typeof v !== 'number' || Number.isNaN(v)) return '–';
  if (!Number.isFinite(v)) return v > 0 ? '∞' : '−∞';
  const sign = v < 0 ? '-' : '';
  const a = Math.abs(v);
  if (a >= 1e4) {
    const units = ['', 'k', 'M', 'G', 'T', 'P', 'E'];
    let k = Math.min(units.length - 1, Math.floor(Math.log10(a) / 3));
    let m = Number((a / 10 ** (3 * k)).toPrecision(Math.max(digits, 1)));
    // 999.96k rounds to 1000k: move up a unit.
    if (m >= 1000 && k < units.length - 1) {
      k += 1;
      m = Number((a / 10 ** (3 * k)).toPrecision(Math.max(digits, 1)));
    }
    return `${sign}${m}${units[k]}`;
  }
  if (Number.isInteger(v)) return `${sign}${a}`;
  if (a >= 100) return `${sign}${Math.round(a)}`;
  if (a === 0) return '0';
  if (a < 1e-3) {
    const [mant, exp] = a.toExponential(Math.max(digits - 1, 0)).split('e');
    return `${sign}${Number(mant)}e${Number(exp)}`;
  }
  return `${sign}${Number(a.toPrecision(digits))}`;
}

/**
 * formatNumber written in vega's expression language (d3-format underneath), for chart labels
 * (an axis labelExpr): plain vega, so a written .vl.json opens in any vega-lite viewer. Tests check
 * it against formatNumber value by value. d3 writes minus as U+2212; it is replaced by '-'.
 */
export function numberExpr(field = 'datum.value'): string {
  const v = field;
  return (
    `!isValid(${v}) || isNaN(${v}) ? '–'` +
    ` : abs(${v}) >= 1e4 ? replace(format(${v}, '.3~s'), '−', '-')` +
    ` : ${v} == floor(${v}) ? replace(format(${v}, 'd'), '−', '-')` +
    ` : abs(${v}) >= 100 ? replace(format(round(${v}), 'd'), '−', '-')` +
    ` : abs(${v}) < 1e-3 ? replace(format(${v}, '.2~e'), '−', '-')` +
    ` : replace(format(${v}, '.3~r'), '−', '-')`
  );
}

/** The browser-side definition for the report page's read-outs: this function's own source. */
export function numberFormatScript(): string {
  return `var formatNumber = ${formatNumber.toString()};\n`;
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

/** A p-value: "< 1e-4" below that, else 2 significant digits. */
export function formatP(p: number): string {
  return p < 1e-4 ? '< 1e-4' : formatNumber(p, 2);
}

/** A compute cost: seconds as s / min / h, relative units as a plain number with the unit named. */
export function formatCost(v: number, units: 'seconds' | 'relative'): string {
  if (units === 'relative') return `${formatNumber(v)} relative units`;
  if (v < 120) return `${formatNumber(v)} s`;
  if (v < 7200) return `${formatNumber(v / 60)} min`;
  return `${formatNumber(v / 3600)} h`;
}
