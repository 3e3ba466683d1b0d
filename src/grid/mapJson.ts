import type { SweepMap } from './SweepMap.js';
import { ORIGIN_INTERPOLATED, ORIGIN_MEASURED, ORIGIN_OUTSIDE } from './SweepMap.js';

/** Names the layout of a map file for readers (docs/schemas/map.schema.json). */
export const MAP_FORMAT = 'datlas-map/1';

/** What each code of `raster.origin` means; written into every map file beside the codes. */
export const ORIGIN_CODES: Record<string, string> = {
  [ORIGIN_OUTSIDE]: 'no data',
  [ORIGIN_INTERPOLATED]: 'interpolated',
  [ORIGIN_MEASURED]: 'measured',
};

/** JSON replacer: typed arrays become plain arrays, non-finite numbers (NaN, ±Infinity) become null. */
export function jsonReplacer(_key: string, value: unknown): unknown {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) {
    return Array.from(value as unknown as ArrayLike<number>, (v) => (Number.isFinite(v) ? v : null));
  }
  return value;
}

/** A SweepMap as laid out in a map file (still with typed arrays and NaN: jsonReplacer turns those into JSON). */
export type MapFile<M extends SweepMap = SweepMap> = Omit<M, 'raster'> & {
  format: typeof MAP_FORMAT;
  raster: M['raster'] & { originCodes: Record<string, string> };
};

/** The map file's object: the map with its format name and the meaning of the origin codes, plus `extra` fields. */
export function mapFileObject<M extends SweepMap, E extends object>(map: M, extra: E): MapFile<M> & E {
  return { format: MAP_FORMAT, ...map, raster: { ...map.raster, originCodes: ORIGIN_CODES }, ...extra };
}

/**
 * The map file's text: the SweepMap with typed arrays as plain arrays and NaN as null, plus any
 * extra top-level fields (the ridge, provenance). `format` names the layout for readers.
 */
export function mapToJson(map: SweepMap, extra: Record<string, unknown> = {}): string {
  return JSON.stringify(mapFileObject(map, extra), jsonReplacer);
}
