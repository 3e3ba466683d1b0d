/**
 * The condition string of a row, written and read in one place: `key=value` pairs sorted by key,
 * joined by commas (`optimizer=adam,weight_decay=0.0005`); "" when a sweep has none. A value may
 * hold a comma as long as what follows it is not `name=`.
 */

/** Writes pairs as a condition (sorted by key; the array is sorted in place). */
export function formatCondition(pairs: [string, string][]): string {
  return pairs
    .sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0))
    .map(([k, v]) => `${k}=${v}`)
    .join(',');
}

/** Key=value pairs of a condition as ingest writes it; empty for "" or a plain name. */
export function parseCondition(condition: string): Map<string, string> {
  const out = new Map<string, string>();
  if (condition === '') return out;
  for (const part of condition.split(/,(?=[^,=]+=)/)) {
    const eq = part.indexOf('=');
    if (eq <= 0) return new Map();
    out.set(part.slice(0, eq).trim(), part.slice(eq + 1).trim());
  }
  return out;
}
