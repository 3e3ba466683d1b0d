import { curveNoise } from './curveNoise.js';
import type { Rng } from './seededRng.js';
import type { SeriesNoise } from './seriesNoise.js';

/**
 * Look-elsewhere correction by simulation. A series of L noisy cells has several local bumps, and
 * the tallest of them clears a single-comparison bar far more often than that bar's nominal level.
 * This simulates `rounds` flat series of pure noise with the same per-cell noise, records the
 * largest statistic `maxStat` finds in each (the caller's own search, e.g. the tallest prominence
 * in SE), and returns a function giving the search-wide p-value of an observed statistic:
 * (1 + #{null max >= observed}) / (rounds + 1). When the noise comes from the curve itself, it is
 * re-estimated on each simulated series and the statistic rescaled (`scale` = assumed / re-estimated
 * noise), so its own uncertainty is part of the null.
 */
export function searchWideP(opts: {
  noise: SeriesNoise;
  u: ArrayLike<number>;
  rounds: number;
  rng: Rng;
  maxStat: (rep: Float64Array, scale: number) => number;
}): (observed: number) => number {
  const { noise, u, rounds, rng, maxStat } = opts;
  const rep = new Float64Array(u.length);
  const nullMax = new Float64Array(rounds);
  for (let b = 0; b < rounds; b++) {
    noise.nullReplicate(rng, rep);
    const scale = noise.from === 'curve' ? noise.sd / curveNoise(u, rep) : 1;
    nullMax[b] = maxStat(rep, Number.isFinite(scale) ? scale : 1);
  }
  nullMax.sort();
  return (observed) => {
    // count of null maxima >= observed, by binary search on the sorted array
    let lo = 0;
    let hi = rounds;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (nullMax[mid] >= observed) hi = mid;
      else lo = mid + 1;
    }
    return (rounds - lo + 1) / (rounds + 1);
  };
}
