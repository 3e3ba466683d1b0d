import type { RidgeResult } from '../analysis/Ridge.js';
import type { SweepMap } from '../grid/SweepMap.js';
import type { ColorScheme } from '../render/colorSchemes.js';
import type { ImageFormat } from '../render/renderSpec.js';
import { reviveMap } from './reviveMap.js';

export interface RenderMapOptions {
  /** Directory the images go to (default "."). */
  out?: string;
  /** Image formats (default ['png']); each figure also gets its vega-lite spec beside it (.vl.json). */
  formats?: ImageFormat[];
  /** The ridge to draw (default: the map's own `ridge`, as buildMap puts it there). Null draws none. */
  ridge?: RidgeResult | null;
  /** PNG pixel ratio (default 2). */
  scale?: number;
  /** Rows (y values) of the slices chart (default: up to 4 spread rows). */
  slices?: number[];
  /** Base file name (default map-KIND). */
  name?: string;
  /** Draw the interpolated raster (measured cells solid, interpolated hatched) instead of the cells. */
  raster?: boolean;
  colors?: ColorScheme;
}

/**
 * Draws a map as `datlas map --format png,...` does: the heatmap with ridge, threshold, missing and
 * diverged cells marked, and the slices chart. Returns the files written.
 */
export async function renderMap(map: SweepMap | object, opts: RenderMapOptions = {}): Promise<{ files: string[] }> {
  const m = reviveMap(map);
  const own = (map as { ridge?: RidgeResult | null }).ridge ?? null;
  const { writeMapImages } = await import('../render/writeMapImages.js');
  const files = await writeMapImages({
    map: m, ridge: opts.ridge === undefined ? own : opts.ridge, outDir: opts.out ?? '.', formats: opts.formats ?? ['png'],
    scale: opts.scale, slices: opts.slices, name: opts.name, raster: opts.raster, colors: opts.colors,
  });
  return { files };
}
