import type { SweepMap } from './SweepMap.js';

/** JSON replacer: typed arrays become plain arrays, non-finite numbers (NaN, ±Infinity) become null. */
export function jsonReplacer(_key: string, value: unknown): unknown {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) {
    return Array.from(value as unknown as ArrayLike<number>, (v) => (Number.isFinite(v) ? v : null));
  }
  return value;
}

/**
 * The map file's text: the SweepMap with typed arrays as plain arrays and NaN as null, plus any
 * extra top-level fields (the ridge, provenance). `format` names the layout for readers.
 */
export function mapToJson(map: SweepMap, extra: Record<string, unknown> = {}): string {
  return JSON.stringify({ format: 'datlas-map/1', ...map, ...extra }, jsonReplacer);
}
