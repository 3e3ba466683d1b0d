import { findRidge as ridgeOfMap } from '../analysis/findRidge.js';
import type { RidgeOptions } from '../analysis/findRidge.js';
import type { SweepMap } from '../grid/SweepMap.js';
import { reviveMap } from './reviveMap.js';
import { ridgeJson } from './ridgeJson.js';
import type { RidgeJson } from './ridgeJson.js';

export type { RidgeJson };

/**
 * The double-descent ridge of a map, as `datlas ridge --json`: per row y, the significant
 * intermediate peak along x with its bootstrap interval (or null: never a fabricated one), and the
 * interpolation threshold. Takes a map from buildMap, or a map file read back with JSON.parse.
 */
export function findRidge(map: SweepMap | object, opts: RidgeOptions = {}): RidgeJson {
  const m = reviveMap(map);
  return ridgeJson(ridgeOfMap(m, opts), m);
}
