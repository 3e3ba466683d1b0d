/**
 * Edit distance with adjacent transpositions (optimal string alignment, Damerau 1964): 'sedes' is
 * one swap from 'seeds'. Used for "did you mean" on misspelt keys, flags and commands.
 */
export function editDistance(a: string, b: string): number {
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) => Array.from({ length: b.length + 1 }, (_, j) => (i === 0 ? j : j === 0 ? i : 0)));
  for (let i = 1; i <= a.length; i++)
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
    }
  return d[a.length][b.length];
}

/** The known name nearest to a misspelt one, when it is near enough to be the one meant (a third of its letters). */
export function nearestName(name: string, known: readonly string[]): string | null {
  let best: string | null = null;
  let bestD = Infinity;
  for (const k of known) {
    const d = editDistance(name.toLowerCase(), k.toLowerCase());
    if (d < bestD) [best, bestD] = [k, d];
  }
  // Near: within a third of the letters, and never a whole name replaced ('q' is not a typo of 'x').
  return best !== null && bestD < name.length && bestD <= Math.max(1, Math.floor(Math.max(name.length, best.length) / 3)) ? best : null;
}
