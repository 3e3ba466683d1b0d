import { mkdir, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { TopLevelSpec } from 'vega-lite';
import type { RidgeResult } from '../analysis/Ridge.js';
import type { SweepMap } from '../grid/SweepMap.js';
import type { ColorScheme } from './colorSchemes.js';
import { facetHeatmapSpec } from './heatmapSpec.js';
import type { MapPanel } from './heatmapSpec.js';
import { renderFormats } from './renderSpec.js';
import type { ImageFormat } from './renderSpec.js';
import { slicesSpec } from './slicesSpec.js';

export interface WriteMapImagesOptions {
  map: SweepMap;
  ridge: RidgeResult | null;
  outDir: string;
  formats: ImageFormat[];
  /** PNG pixel ratio (default 2). */
  scale?: number;
  /** Rows (values of the map's y axis) for the slices chart; default: up to 4 spread rows. */
  slices?: number[];
  /** Base file name (default map-<kind>). */
  name?: string;
  /** Draw the interpolated raster instead of the measured cells. */
  raster?: boolean;
  colors?: ColorScheme;
  /** Panels side by side instead of `map` alone (e.g. one per label noise), sharing all scales. */
  facets?: { panels: MapPanel[] };
  /** Also write the slices chart (default true). */
  withSlices?: boolean;
}

/** Writes a file atomically (beside, then rename) so a reader never sees half an image. */
async function writeAtomic(path: string, data: Buffer | string): Promise<void> {
  const tmp = `${path}.${process.pid}.tmp`;
  await writeFile(tmp, data);
  await rename(tmp, path);
}

async function writeFigure(spec: TopLevelSpec, base: string, opts: WriteMapImagesOptions): Promise<string[]> {
  const written: string[] = [];
  const specPath = `${base}.vl.json`;
  await writeAtomic(specPath, `${JSON.stringify(spec)}\n`);
  const images = await renderFormats(spec, { formats: opts.formats, scale: opts.scale ?? 2 });
  for (const format of opts.formats) {
    const path = `${base}.${format}`;
    await writeAtomic(path, images[format]!);
    written.push(path);
  }
  written.push(specPath);
  return written;
}

/**
 * Renders a map's heatmap (with ridge, threshold, missing and diverged cells drawn in) and its
 * slices chart to every requested format; each figure gets its vega-lite spec beside it
 * (`<name>.vl.json`, `<name>-slices.vl.json`). Returns the paths written.
 */
export async function writeMapImages(opts: WriteMapImagesOptions): Promise<string[]> {
  const { map, ridge, outDir, raster = false, colors, withSlices = true } = opts;
  const name = opts.name ?? `map-${map.kind}`;
  await mkdir(outDir, { recursive: true });
  const pixelRatio = opts.formats.includes('png') ? (opts.scale ?? 2) : 2;
  const panels = opts.facets?.panels ?? [{ map, ridge, label: '' }];
  const heat = facetHeatmapSpec(panels, { raster, colors, pixelRatio });
  const written = await writeFigure(heat, join(outDir, name), opts);
  if (withSlices) {
    const slices = slicesSpec(map, ridge, { rows: opts.slices, colors });
    written.push(...(await writeFigure(slices, join(outDir, `${name}-slices`), opts)));
  }
  return written;
}
