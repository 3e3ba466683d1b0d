/**
 * Log-spaced logging epochs 1..max: round(10^(k/perDecade)), duplicates dropped, max included.
 * Log-spaced evaluation is what capacity sweeps log (REFERENCES §5, common practice).
 */
export function epochGrid(opts: { max: number; perDecade?: number }): number[] {
  const { max, perDecade = 6 } = opts;
  if (!(max >= 1)) throw new RangeError(`epochGrid: max must be >= 1, got ${max}`);
  const out: number[] = [];
  const top = Math.ceil(Math.log10(max) * perDecade + 1e-9);
  for (let k = 0; k <= top; k++) {
    const t = Math.min(max, Math.round(10 ** (k / perDecade)));
    if (out[out.length - 1] !== t) out.push(t);
  }
  if (out[out.length - 1] !== Math.round(max)) out.push(Math.round(max));
  return out;
}
