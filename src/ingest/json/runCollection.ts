/**
 * An object of per-run objects (`{"r1": {"width": 8, "epoch": [...]}, "r2": {...}}`): two or more
 * children, all objects, whose key sets mostly agree. Its keys name runs, not settings.
 */
const isRecord = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === 'object' && !Array.isArray(v);

export function isRunCollection(obj: Record<string, unknown>): boolean {
  const keys = Object.keys(obj);
  if (keys.length < 2) return false;
  const sets: Set<string>[] = [];
  for (const k of keys) {
    const v = obj[k];
    if (!isRecord(v)) return false;
    sets.push(new Set(Object.keys(v)));
  }
  // Each child shares at least half of its keys with the first child (Jaccard-like overlap).
  const first = sets[0];
  if (first.size === 0) return false;
  return sets.every((s) => {
    let shared = 0;
    for (const k of s) if (first.has(k)) shared++;
    return shared * 2 >= Math.max(s.size, first.size);
  });
}
