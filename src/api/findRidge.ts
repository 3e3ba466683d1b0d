import { findRidge as ridgeOfMap } from '../analysis/findRidge.js';
import type { RidgeOptions } from '../analysis/findRidge.js';
import type { RidgeResult } from '../analysis/Ridge.js';
import type { SweepMap } from '../grid/SweepMap.js';
import { reviveMap } from './reviveMap.js';

/** `datlas ridge --json`: the ridge (DESIGN.md §6) plus the values the tool picked and the map's notes. */
export type RidgeJson = RidgeResult & { picked: string[]; notes: string[] };

/**
 * The ridge with the map's picked values and its notes about the data (shared by the CLI's --json
 * and the library). The ridge reads the measured cells only, so notes on the interpolator's fit
 * are left out: the ridge is the same whichever method drew the map.
 */
export function ridgeJson(r: RidgeResult, map: Pick<SweepMap, 'picked' | 'notes' | 'fitNotes'>): RidgeJson {
  const fit = new Set(map.fitNotes ?? []);
  return { ...r, picked: map.picked, notes: (map.notes ?? []).filter((n) => !fit.has(n)) };
}

/**
 * The double-descent ridge of a map, as `datlas ridge --json`: per row y, the significant
 * intermediate peak along x with its bootstrap interval (or null: never a fabricated one), and the
 * interpolation threshold. Takes a map from buildMap, or a map file read back with JSON.parse.
 */
export function findRidge(map: SweepMap | object, opts: RidgeOptions = {}): RidgeJson {
  const m = reviveMap(map);
  return ridgeJson(ridgeOfMap(m, opts), m);
}
