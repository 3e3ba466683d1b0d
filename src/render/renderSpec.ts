import type { TopLevelSpec } from 'vega-lite';
import { escapeControls } from '../escapeControls.js';

export type ImageFormat = 'png' | 'svg' | 'pdf';
export const IMAGE_FORMATS: readonly ImageFormat[] = ['png', 'svg', 'pdf'];

export interface RenderOptions {
  format: ImageFormat;
  /** Pixel ratio for PNG (default 2: crisp on slides and retina screens). */
  scale?: number;
}

export interface CompiledSpec {
  /** The vega spec vega-lite produced. */
  vega: unknown;
  /** Warnings vega-lite logged while compiling (a clean spec has none). */
  warnings: string[];
}

/** Compiles a vega-lite spec, collecting warnings instead of printing them. */
export async function compileSpec(spec: TopLevelSpec): Promise<CompiledSpec> {
  const vl = await import('vega-lite');
  const warnings: string[] = [];
  const logger = {
    level(): number { return 0; },
    warn: (...a: unknown[]) => { warnings.push(a.map(String).join(' ')); return logger; },
    info: () => logger,
    debug: () => logger,
    error: (...a: unknown[]) => { warnings.push(`error: ${a.map(String).join(' ')}`); return logger; },
  };
  // vega-lite's LoggerInterface is structural; our collector implements the members it calls.
  const compiled = vl.compile(spec, { logger: logger as never });
  return { vega: compiled.spec, warnings };
}

/**
 * The spec with control characters in its text (titles naming a condition, axis and legend
 * titles) written as visible escapes, as on the terminal: they would draw as boxes in PNG and PDF
 * and make the SVG invalid XML. Data rows are left as they are (their values are not drawn as
 * text, and walking them would cost on large maps).
 */
function escapeSpecText<T>(v: T): T {
  if (typeof v === 'string') return escapeControls(v) as T;
  if (Array.isArray(v)) return v.map(escapeSpecText) as T;
  if (v === null || typeof v !== 'object') return v;
  const out: Record<string, unknown> = {};
  for (const [k, x] of Object.entries(v as Record<string, unknown>)) out[k] = k === 'values' || k === 'datasets' ? x : escapeSpecText(x);
  return out as T;
}

/**
 * Renders a vega-lite spec headless: SVG as text, PNG and PDF through node-canvas.
 * PDF text is drawn as glyphs so it stays selectable.
 */
export async function renderSpec(spec: TopLevelSpec, opts: RenderOptions): Promise<Buffer | string> {
  const out = await renderFormats(spec, { formats: [opts.format], scale: opts.scale });
  return out[opts.format]!;
}

/** Renders one spec to several formats, compiling and laying it out once. */
export async function renderFormats(
  spec: TopLevelSpec,
  opts: { formats: readonly ImageFormat[]; scale?: number },
): Promise<Partial<Record<ImageFormat, Buffer | string>>> {
  const { formats, scale = 2 } = opts;
  const vega = await import('vega');
  const { vega: vgSpec } = await compileSpec(escapeSpecText(spec));
  const view = new vega.View(vega.parse(vgSpec as never), { renderer: 'none' });
  const out: Partial<Record<ImageFormat, Buffer | string>> = {};
  try {
    for (const format of formats) {
      if (format === 'svg') out.svg = await view.toSVG();
      else if (format === 'png') {
        const canvas = (await view.toCanvas(scale)) as unknown as { toBuffer(mime: string, opts: { compressionLevel: number; filters: number }): Buffer };
        // No scanline filter: charts are flat colour, where libpng's default (trying every filter
        // per row) costs twice the time and gives larger files (1536×1116 figure: 60 → 33 ms,
        // 163 → 142 KB; an interpolated raster 68 → 34 ms, 208 → 157 KB).
        out.png = canvas.toBuffer('image/png', { compressionLevel: 6, filters: await pngFilterNone() });
      } else {
        const canvas = (await view.toCanvas(1, {
          type: 'pdf',
          context: { textDrawingMode: 'glyph' },
        } as never)) as unknown as { toBuffer(mime: string): Buffer };
        out.pdf = canvas.toBuffer('application/pdf');
      }
    }
    return out;
  } finally {
    view.finalize();
  }
}

/** node-canvas's constant for PNG scanline filter "None" (a static of its Canvas class). */
async function pngFilterNone(): Promise<number> {
  const { Canvas } = (await import('canvas')) as unknown as { Canvas: { PNG_FILTER_NONE: number } };
  return Canvas.PNG_FILTER_NONE;
}
