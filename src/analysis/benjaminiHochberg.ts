/**
 * Benjamini–Hochberg step-up adjustment (Benjamini & Hochberg 1995, J. R. Stat. Soc. B 57:289):
 * adjusted p_(i) = min over j ≥ i of p_(j)·m/j, capped at 1. Rejecting every hypothesis with an
 * adjusted p below q controls the false discovery rate at q for independent (or positively
 * dependent) tests. `m` is the number of hypotheses in the family (default: the length of `p`;
 * larger when some hypotheses were scanned but not tested, which count as p = 1).
 * NaN entries are treated as p = 1 and stay NaN.
 */
export function benjaminiHochberg(p: readonly number[], m = p.length): number[] {
  const order = p.map((v, i) => ({ v: Number.isFinite(v) ? v : 1, i })).sort((a, b) => a.v - b.v);
  const out = new Array<number>(p.length).fill(NaN);
  let running = 1;
  for (let r = order.length - 1; r >= 0; r--) {
    running = Math.min(running, (order[r].v * m) / (r + 1));
    if (Number.isFinite(p[order[r].i])) out[order[r].i] = Math.min(1, running);
  }
  return out;
}

/**
 * The BH-adjusted p of a further p-value `q` judged against the family `p` (for a secondary
 * peak of a row whose row-level p is in the family): min over family members p_(j) ≥ q of
 * p_(j)·m/j. q is below the BH cutoff exactly when this is at most the level.
 */
export function adjustAgainst(q: number, p: readonly number[], m = p.length): number {
  const s = p.filter(Number.isFinite).sort((a, b) => a - b);
  let best = 1;
  for (let j = 0; j < s.length; j++) if (s[j] >= q) best = Math.min(best, (s[j] * m) / (j + 1));
  return Math.min(1, Math.max(q, best));
}
