/**
 * The interpolation threshold of one series in transformed coordinates, or null when never reached.
 * `first-below` (x = width or epochs, train error falls with x): the smallest u whose train error
 * is <= epsilon, linearly interpolated between the bracketing cells. `last-below` (x = train_size,
 * train error grows with n): the largest u that still reaches epsilon — the effective model
 * complexity of Nakkiran et al. (2019). When the very first (last) cell already qualifies, its own
 * u is returned: the crossing lies beyond the sweep and cannot be located more precisely.
 */
export function findThreshold(
  u: readonly number[],
  train: readonly number[],
  opts: { epsilon: number; direction: 'first-below' | 'last-below' },
): number | null {
  return thresholdCrossing(u, train, opts)?.u ?? null;
}

/** As findThreshold, also saying whether the crossing is only bounded by the sweep's edge. */
export function thresholdCrossing(
  u: readonly number[],
  train: readonly number[],
  opts: { epsilon: number; direction: 'first-below' | 'last-below' },
): { u: number; atEdge: boolean } | null {
  const pts: { u: number; e: number }[] = [];
  for (let i = 0; i < u.length; i++) if (Number.isFinite(train[i]) && Number.isFinite(u[i])) pts.push({ u: u[i], e: train[i] });
  if (opts.direction === 'last-below') pts.reverse();
  const k = pts.findIndex((p) => p.e <= opts.epsilon);
  if (k < 0) return null;
  if (k === 0) return { u: pts[0].u, atEdge: true };
  const a = pts[k - 1];
  const b = pts[k];
  const f = (a.e - opts.epsilon) / (a.e - b.e);
  return { u: a.u + f * (b.u - a.u), atEdge: false };
}
