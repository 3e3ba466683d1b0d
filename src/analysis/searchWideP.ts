import { nullMaxP } from './nullMaxP.js';
import type { Rng } from './seededRng.js';
import type { SeriesNoise, SeriesView } from './seriesNoise.js';

/**
 * Look-elsewhere correction by simulation. A series of L noisy cells has several local bumps, and
 * the tallest of them clears a single-comparison bar far more often than that bar's nominal level.
 * This draws `rounds` series of pure noise with the same seeds per cell (SeriesNoise.nullSeries),
 * records the largest statistic `maxStat` finds in each (the caller's own search, e.g. the tallest
 * prominence in SE), and returns a function giving the search-wide p-value of an observed
 * statistic (nullMaxP: Monte Carlo, with a fitted Gumbel tail beyond the simulated range). The statistic must be in SE units
 * (scale-free), computed from the view it is given, so noise-estimation error is part of the null.
 */
export function searchWideP(opts: {
  noise: SeriesNoise;
  rounds: number;
  rng: Rng;
  maxStat: (series: SeriesView) => number;
}): (observed: number) => number {
  const { noise, rounds, rng, maxStat } = opts;
  const nullMax = new Float64Array(rounds);
  for (let b = 0; b < rounds; b++) nullMax[b] = maxStat(noise.nullSeries(rng));
  nullMax.sort();
  return nullMaxP(nullMax);
}
