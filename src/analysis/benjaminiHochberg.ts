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
 * The BH-adjusted p of `q` standing in for member `at` of the family `p` (a secondary peak of a
 * row, or a second rise of a slice, judged in its row's place): adjust the family with p[at]
 * replaced by q and read position `at`.
 */
export function adjustedAs(q: number, p: readonly number[], at: number, m = p.length): number {
  const f = [...p];
  f[at] = q;
  return benjaminiHochberg(f, m)[at];
}
