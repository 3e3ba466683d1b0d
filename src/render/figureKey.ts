import type { TopLevelSpec } from 'vega-lite';

/** One line of a figure's key: a sample of the mark, then what it means. */
export type KeySymbol = 'swatch' | 'hatch' | 'missing' | 'cross' | 'diverged' | 'ridge' | 'threshold' | 'none';
export interface KeyEntry {
  symbol: KeySymbol;
  text: string;
  /** Fill of a swatch (colour of a measured cell). */
  color?: string;
  /** Data URL of the hatch sample (symbol 'hatch'). */
  url?: string;
}

/** Shared mark styles, so the key draws exactly what the chart draws. */
export const STYLE = {
  ridge: '#000000',
  casing: '#ffffff',
  threshold: '#ffffff',
  thresholdCasing: '#000000',
  thresholdDash: [7, 4],
  missing: '#d9d9d9',
  missingCross: '#636363',
  diverged: '#ffffff',
  divergedStroke: '#000000',
  warning: '#b30000',
  text: '#222222',
} as const;

export const ROW_HEIGHT = 19;
const SYMBOL_W = 34;

type Layer = Record<string, unknown>;

/**
 * The key under a chart: warnings first (red), then one line per mark actually drawn.
 * A plain layer chart in pixel coordinates (axes hidden), so it renders identically in PNG, SVG
 * and PDF and needs no legend machinery for overlay marks.
 */
export function keySpec(entries: KeyEntry[], warnings: string[], width: number): Record<string, unknown> {
  type Line = { kind: string; text: string; color?: string | null; url?: string | null };
  const lines: Line[] = [];
  for (const w of warnings) for (const t of wrapText(`warning: ${w}`, width - 4, 8)) lines.push({ kind: 'warning', text: t });
  for (const e of entries) {
    wrapText(e.text, width - SYMBOL_W - 8, 7.6).forEach((t, k) =>
      lines.push(k === 0 ? { kind: e.symbol, text: t, color: e.color ?? null, url: e.url ?? null } : { kind: 'none', text: t }),
    );
  }
  const rows = lines.length;
  const values = lines.map((l, i) => ({ ...l, row: i + 0.5, x0: 2, x1: SYMBOL_W - 4, xm: SYMBOL_W / 2 - 1, xt: l.kind === 'warning' ? 2 : SYMBOL_W + 6 }));
  const x = (field: string) => ({ field, type: 'quantitative', scale: { domain: [0, width], range: [0, width] }, axis: null });
  const y = { field: 'row', type: 'quantitative', scale: { domain: [0, rows], range: [0, rows * ROW_HEIGHT] }, axis: null };
  const only = (kinds: string[]) => ({ filter: { field: 'kind', oneOf: kinds } });
  const layers: Layer[] = [
    {
      transform: [only(['swatch'])],
      mark: { type: 'rect', height: 12 },
      encoding: { x: x('x0'), x2: { field: 'x1' }, y, color: { field: 'color', type: 'nominal', scale: null } },
    },
    {
      transform: [only(['hatch'])],
      mark: { type: 'image', height: 12, aspect: false },
      encoding: { x: x('x0'), x2: { field: 'x1' }, y, url: { field: 'url', type: 'nominal' } },
    },
    {
      transform: [only(['missing'])],
      mark: { type: 'rect', height: 12, color: STYLE.missing },
      encoding: { x: x('x0'), x2: { field: 'x1' }, y },
    },
    {
      transform: [only(['missing'])],
      mark: { type: 'point', shape: 'cross', filled: true, opacity: 1, size: 50, color: STYLE.missingCross, angle: 45 },
      encoding: { x: x('xm'), y },
    },
    {
      transform: [only(['cross'])],
      mark: { type: 'point', shape: 'cross', filled: true, opacity: 1, size: 60, color: STYLE.casing, stroke: STYLE.ridge, strokeWidth: 0.8, angle: 45 },
      encoding: { x: x('xm'), y },
    },
    {
      transform: [only(['diverged'])],
      mark: { type: 'point', shape: 'triangle-up', filled: true, opacity: 1, size: 80, color: STYLE.diverged, stroke: STYLE.divergedStroke, strokeWidth: 1.2 },
      encoding: { x: x('xm'), y },
    },
    {
      transform: [only(['ridge'])],
      mark: { type: 'rule', strokeWidth: 4.5, color: STYLE.casing },
      encoding: { x: x('x0'), x2: { field: 'x1' }, y },
    },
    {
      transform: [only(['ridge'])],
      mark: { type: 'rule', strokeWidth: 2, color: STYLE.ridge },
      encoding: { x: x('x0'), x2: { field: 'x1' }, y },
    },
    {
      transform: [only(['ridge'])],
      mark: { type: 'point', filled: true, opacity: 1, size: 45, color: STYLE.casing, stroke: STYLE.ridge, strokeWidth: 1.5 },
      encoding: { x: x('xm'), y },
    },
    {
      transform: [only(['threshold'])],
      mark: { type: 'rule', strokeWidth: 4, color: STYLE.thresholdCasing },
      encoding: { x: x('x0'), x2: { field: 'x1' }, y },
    },
    {
      transform: [only(['threshold'])],
      mark: { type: 'rule', strokeWidth: 2, color: STYLE.threshold, strokeDash: [...STYLE.thresholdDash] },
      encoding: { x: x('x0'), x2: { field: 'x1' }, y },
    },
    {
      transform: [{ filter: "datum.kind !== 'warning'" }],
      mark: { type: 'text', align: 'left', baseline: 'middle', fontSize: 12.5, color: STYLE.text, limit: width - SYMBOL_W - 8 },
      encoding: { x: x('xt'), y, text: { field: 'text', type: 'nominal' } },
    },
    {
      transform: [only(['warning'])],
      mark: { type: 'text', align: 'left', baseline: 'middle', fontSize: 12.5, fontWeight: 'bold', color: STYLE.warning, limit: width - 4 },
      encoding: { x: x('xt'), y, text: { field: 'text', type: 'nominal' } },
    },
  ];
  return {
    width,
    height: rows * ROW_HEIGHT,
    data: { values },
    layer: layers,
    view: { stroke: null },
  };
}

/**
 * Splits text at spaces into lines of at most `width` pixels, estimating glyph width
 * (DejaVu Sans at 12.5 px averages about 7.6 px per character; bold about 8).
 */
export function wrapText(text: string, width: number, charPx: number): string[] {
  const max = Math.max(10, Math.floor(width / charPx));
  const out: string[] = [];
  let line = '';
  for (const word of text.split(' ')) {
    if (line && line.length + 1 + word.length > max) {
      out.push(line);
      line = `  ${word}`;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) out.push(line);
  return out;
}

/** A key-only top-level spec (handy for tests). */
export function keyOnlySpec(entries: KeyEntry[], warnings: string[], width: number): TopLevelSpec {
  return keySpec(entries, warnings, width) as unknown as TopLevelSpec;
}
