import { findRidge as ridgeOfMap } from '../analysis/findRidge.js';
import type { RidgeOptions } from '../analysis/findRidge.js';
import { buildMap as mapOfRows } from '../grid/buildMap.js';
import type { MapOptions as GridMapOptions } from '../grid/buildMap.js';
import { jsonReplacer, mapFileObject } from '../grid/mapJson.js';
import type { MapFile } from '../grid/mapJson.js';
import type { SweepMap } from '../grid/SweepMap.js';
import type { RidgeResult } from '../analysis/Ridge.js';
import { rowsOf } from './rowsOf.js';
import { Store } from './Store.js';
import { axisSource } from '../ingest/axisSource.js';
import type { RowsInput } from './rowsOf.js';

export interface MapOptions extends GridMapOptions {
  /** Also locate the ridge and put it in the map, as `datlas map` does (default true; false skips the bootstrap). */
  ridge?: boolean | RidgeOptions;
  /** Recorded in the map as its provenance (`store`), as the map file does (default: the directory of an opened store). */
  store?: string;
}

/**
 * A map as `datlas map --format json` writes it: the SweepMap (axes, cells with their seed
 * statistics, missing and diverged cells, raster, leave-one-out error), its `format`, the names
 * of the raster's origin codes, and the ridge. In memory the raster keeps its typed arrays and
 * missing values are NaN; `JSON.stringify(map)` gives the file's text (typed arrays as arrays,
 * NaN as null), and a map file read back with JSON.parse is accepted wherever a map is.
 */
export type MapObject = MapFile & { ridge: RidgeResult | null; store?: string; toJSON(): unknown };

/** Adds the non-enumerable toJSON that writes typed arrays as arrays and NaN as null (the file's text). */
export function asMapObject(map: SweepMap, extra: { ridge: RidgeResult | null; store?: string }): MapObject {
  const obj = mapFileObject(map, extra) as MapObject;
  Object.defineProperty(obj, 'toJSON', {
    enumerable: false,
    value(this: MapObject) {
      const plain: Record<string, unknown> = { ...this };
      return JSON.parse(JSON.stringify(plain, jsonReplacer)) as unknown;
    },
  });
  return obj;
}

/**
 * The map of one metric over two axes with the others fixed, as `datlas map --kind K --format json`:
 * rows from a store, an arquero table (after any verbs) or a RowTable. Unset `at` axes take the
 * value with the most data (listed in `picked`).
 */
export async function buildMap(rows: RowsInput, opts: MapOptions = {}): Promise<MapObject> {
  const { ridge = true, store: given, ...mapOpts } = opts;
  // A map of an opened store records that store, as the map file of `datlas map --store DIR` does.
  const store = given ?? (rows instanceof Store ? rows.dir : undefined);
  const map = mapOfRows(rowsOf(rows), mapOpts);
  if (rows instanceof Store) {
    // Axes read from another column say so (`width (p_over_n)`), as in `datlas map`.
    map.x.source = axisSource(rows.manifest, map.x.name);
    map.y.source = axisSource(rows.manifest, map.y.name);
  }
  const r = ridge === false ? null : ridgeOfMap(map, ridge === true ? {} : ridge);
  return asMapObject(map, { ridge: r, ...(store !== undefined && { store }) });
}
