/**
 * A multi-page 16:9 PDF deck drawn with node-canvas's PDF context. Text is drawn as glyphs
 * (textDrawingMode 'glyph') so every word on a page can be selected and searched; charts are
 * embedded as PNG images.
 */
import { escapeControls } from '../escapeControls.js';

export type DeckBlock =
  | { kind: 'heading'; text: string }
  | { kind: 'text'; text: string; size?: number; color?: string }
  | { kind: 'bullets'; items: string[]; size?: number }
  /** A warning box: what a figure on this page could make a reader believe wrongly. */
  | { kind: 'note'; text: string }
  | { kind: 'image'; png: Buffer }
  | { kind: 'table'; columns: string[]; rows: string[][]; size?: number; align?: ('left' | 'right')[] };

export interface DeckPage {
  title: string;
  subtitle?: string;
  /** Side-by-side columns of blocks, left to right. */
  columns: DeckBlock[][];
  /** Relative column widths (default equal). */
  widths?: number[];
}

export interface DeckOptions {
  pages: DeckPage[];
  /** Small text at the bottom of every page (e.g. the store hash). */
  footer?: string;
  /** Page size in PDF points; default 960 × 540 (16:9). */
  width?: number;
  height?: number;
}

const FONT = 'DejaVu Sans';
const MARGIN = 36;
const GAP = 10;
const INK = '#1d2430';
const MUTED = '#5b6472';
const WARN_BG = '#fff4e0';
const WARN_EDGE = '#e0a030';

// node-canvas types are structural here: the PDF context is a CanvasRenderingContext2D plus
// textDrawingMode, which the lib.dom-free build does not declare.
interface Ctx {
  font: string;
  fillStyle: string;
  strokeStyle: string;
  lineWidth: number;
  textBaseline: string;
  textAlign: string;
  textDrawingMode: string;
  measureText(t: string): { width: number };
  fillText(t: string, x: number, y: number): void;
  fillRect(x: number, y: number, w: number, h: number): void;
  strokeRect(x: number, y: number, w: number, h: number): void;
  beginPath(): void;
  moveTo(x: number, y: number): void;
  lineTo(x: number, y: number): void;
  stroke(): void;
  drawImage(img: unknown, x: number, y: number, w: number, h: number): void;
  addPage(w?: number, h?: number): void;
}

/** Splits text into lines no wider than `width` at the current font (long words are split). */
function wrap(ctx: Ctx, text: string, width: number): string[] {
  const lines: string[] = [];
  for (const para of text.split('\n')) {
    let line = '';
    for (const word of para.split(/\s+/).filter(Boolean)) {
      const next = line ? `${line} ${word}` : word;
      if (ctx.measureText(next).width <= width || !line) {
        line = next;
        while (ctx.measureText(line).width > width && line.length > 1) {
          // A single word wider than the column: break it.
          let cut = line.length - 1;
          while (cut > 1 && ctx.measureText(line.slice(0, cut)).width > width) cut--;
          lines.push(line.slice(0, cut));
          line = line.slice(cut);
        }
      } else {
        lines.push(line);
        line = word;
      }
    }
    lines.push(line);
  }
  return lines;
}

/** Shortens text with an ellipsis to fit `width`. */
function fit(ctx: Ctx, text: string, width: number): string {
  if (ctx.measureText(text).width <= width) return text;
  let s = text;
  while (s.length > 1 && ctx.measureText(`${s}…`).width > width) s = s.slice(0, -1);
  return `${s}…`;
}

interface Image {
  width: number;
  height: number;
}

/**
 * Column widths that fit `w`: every column keeps its natural width when they all fit; otherwise
 * only the widest are cut, down to a common cap (short number columns never shrink first).
 */
export function fitColumns(natural: number[], w: number): number[] {
  const total = natural.reduce((a, v) => a + v, 0);
  if (total <= w) return natural;
  const sorted = [...natural].sort((a, b) => a - b);
  let rest = w;
  for (let i = 0; i < sorted.length; i++) {
    const cap = rest / (sorted.length - i);
    if (sorted[i] > cap) return natural.map((v) => Math.min(v, cap));
    rest -= sorted[i];
  }
  return natural;
}

/** Lines a table cell may wrap onto before the rest is cut with an ellipsis. */
const MAX_CELL_LINES = 3;

interface TableLayout {
  size: number;
  /** Column widths. */
  cw: number[];
  /** Text lines of each cell: header first, then the rows. */
  cells: string[][][];
  /** Height of each row (header first). */
  heights: number[];
  lineH: number;
}

/**
 * A table's layout at width `w`: natural column widths, the widest cut to fit (fitColumns), and a
 * cell wider than its column wraps onto up to MAX_CELL_LINES lines (the row grows) instead of
 * being cut, so a long "why" reads whole.
 */
function tableLayout(ctx: Ctx, b: Extract<DeckBlock, { kind: 'table' }>, w: number): TableLayout {
  const size = b.size ?? 10.5;
  const lineH = size * 1.25;
  const pad = size * 0.6;
  const natural = b.columns.map((c, j) => {
    ctx.font = `bold ${size}px "${FONT}"`;
    let m = ctx.measureText(c).width;
    ctx.font = `${size}px "${FONT}"`;
    for (const r of b.rows) if (r.length > 1) m = Math.max(m, ctx.measureText(r[j] ?? '').width);
    return m + 12;
  });
  const cw = fitColumns(natural, w);
  const cells: string[][][] = [];
  const heights: number[] = [];
  [b.columns, ...b.rows].forEach((row, i) => {
    ctx.font = `${i === 0 ? 'bold ' : ''}${size}px "${FONT}"`;
    const lines = row.map((text, j) => {
      const width = (row.length === 1 ? w : cw[j]) - 10;
      if (ctx.measureText(text).width <= width) return [text];
      const ls = wrap(ctx, text, width);
      if (ls.length <= MAX_CELL_LINES) return ls;
      return [...ls.slice(0, MAX_CELL_LINES - 1), fit(ctx, ls.slice(MAX_CELL_LINES - 1).join(' '), width)];
    });
    cells.push(lines);
    heights.push(Math.max(1, ...lines.map((l) => l.length)) * lineH + pad);
  });
  return { size, cw, cells, heights, lineH };
}

/** Height a block needs at column width `w` (images: 0, they take what is left). */
function measure(ctx: Ctx, b: DeckBlock, w: number): number {
  switch (b.kind) {
    case 'heading':
      ctx.font = `bold 15px "${FONT}"`;
      return wrap(ctx, b.text, w).length * 19 + 4;
    case 'text': {
      const size = b.size ?? 12;
      ctx.font = `${size}px "${FONT}"`;
      return wrap(ctx, b.text, w).length * size * 1.35 + 4;
    }
    case 'bullets': {
      const size = b.size ?? 12;
      ctx.font = `${size}px "${FONT}"`;
      return b.items.reduce((h, it) => h + wrap(ctx, it, w - 16).length * size * 1.35 + 5, 0);
    }
    case 'note':
      ctx.font = `11px "${FONT}"`;
      return wrap(ctx, `⚠ ${b.text}`, w - 16).length * 14.5 + 12;
    case 'table':
      return tableLayout(ctx, b, w).heights.reduce((a, h) => a + h, 0) + 4;
    case 'image':
      return 0;
  }
}

/** Draws a block at (x, y) in width w; returns its height. */
function draw(ctx: Ctx, b: DeckBlock, x: number, y: number, w: number, maxH: number, images: Map<Buffer, Image>): number {
  ctx.textBaseline = 'top';
  ctx.textAlign = 'left';
  switch (b.kind) {
    case 'heading': {
      ctx.font = `bold 15px "${FONT}"`;
      ctx.fillStyle = INK;
      const lines = wrap(ctx, b.text, w);
      lines.forEach((l, i) => ctx.fillText(l, x, y + i * 19));
      return lines.length * 19 + 4;
    }
    case 'text': {
      const size = b.size ?? 12;
      ctx.font = `${size}px "${FONT}"`;
      ctx.fillStyle = b.color ?? INK;
      const lines = wrap(ctx, b.text, w);
      lines.forEach((l, i) => ctx.fillText(l, x, y + i * size * 1.35));
      return lines.length * size * 1.35 + 4;
    }
    case 'bullets': {
      const size = b.size ?? 12;
      ctx.font = `${size}px "${FONT}"`;
      ctx.fillStyle = INK;
      let h = 0;
      for (const item of b.items) {
        ctx.fillText('•', x + 2, y + h);
        const lines = wrap(ctx, item, w - 16);
        lines.forEach((l, i) => ctx.fillText(l, x + 16, y + h + i * size * 1.35));
        h += lines.length * size * 1.35 + 5;
      }
      return h;
    }
    case 'note': {
      ctx.font = `11px "${FONT}"`;
      const lines = wrap(ctx, `⚠ ${b.text}`, w - 16);
      const h = lines.length * 14.5 + 8;
      ctx.fillStyle = WARN_BG;
      ctx.fillRect(x, y, w, h);
      ctx.fillStyle = WARN_EDGE;
      ctx.fillRect(x, y, 3, h);
      ctx.fillStyle = INK;
      lines.forEach((l, i) => ctx.fillText(l, x + 10, y + 4 + i * 14.5));
      return h + 4;
    }
    case 'image': {
      const img = images.get(b.png);
      if (!img || maxH <= 10) return 0;
      const s = Math.min(w / img.width, maxH / img.height);
      ctx.drawImage(img, x, y, img.width * s, img.height * s);
      return img.height * s + 6;
    }
    case 'table': {
      const { size, cw, cells, heights, lineH } = tableLayout(ctx, b, w);
      const ncol = b.columns.length;
      // Rows that fit below the header; past that, one line says where the rest is.
      let fitRows = 0;
      for (let used = heights[0]; fitRows < b.rows.length && used + heights[fitRows + 1] <= maxH; fitRows++) used += heights[fitRows + 1];
      const cut = fitRows < b.rows.length;
      const shown = cut ? Math.max(0, fitRows - 1) : b.rows.length;
      const moreRow = [[`… ${b.rows.length - shown} more rows in the HTML page and JSON`]];
      const drawRow = (lines: string[][], yy: number, bold: boolean) => {
        ctx.font = `${bold ? 'bold ' : ''}${size}px "${FONT}"`;
        let xx = x;
        for (let j = 0; j < ncol; j++) {
          if (lines.length === 1 && j > 0) break;
          const width = lines.length === 1 ? w : cw[j];
          const right = (b.align?.[j] ?? 'left') === 'right' && lines.length > 1;
          ctx.textAlign = right ? 'right' : 'left';
          (lines[j] ?? ['']).forEach((t, k) => ctx.fillText(fit(ctx, t, width - 10), right ? xx + width - 6 : xx + 4, yy + size * 0.3 + k * lineH));
          xx += width;
        }
        ctx.textAlign = 'left';
      };
      ctx.fillStyle = '#eef1f5';
      ctx.fillRect(x, y, w, heights[0]);
      ctx.fillStyle = INK;
      drawRow(cells[0], y, true);
      let yy = y + heights[0];
      const body = cells.slice(1, 1 + shown).map((c, i) => ({ c, h: heights[i + 1] }));
      if (cut) body.push({ c: moreRow, h: lineH + size * 0.6 });
      body.forEach(({ c, h }, i) => {
        if (i % 2 === 1) {
          ctx.fillStyle = '#f7f8fa';
          ctx.fillRect(x, yy, w, h);
        }
        ctx.fillStyle = INK;
        drawRow(c, yy, false);
        yy += h;
      });
      ctx.strokeStyle = '#c9ced6';
      ctx.lineWidth = 0.6;
      ctx.beginPath();
      ctx.moveTo(x, y + heights[0]);
      ctx.lineTo(x + w, y + heights[0]);
      ctx.stroke();
      return yy - y + 4;
    }
  }
}

/** A block with its text size scaled by f (headings and images unchanged). */
function scaleBlock(b: DeckBlock, f: number): DeckBlock {
  if (b.kind === 'text') return { ...b, size: (b.size ?? 12) * f };
  if (b.kind === 'bullets') return { ...b, size: (b.size ?? 12) * f };
  if (b.kind === 'table') return { ...b, size: (b.size ?? 10.5) * f };
  return b;
}

/** Lays out and draws the pages; returns the PDF bytes. */
export async function composeDeck(opts: DeckOptions): Promise<Buffer> {
  const { pages, footer = '', width = 960, height = 540 } = opts;
  const { createCanvas, loadImage } = await import('canvas');
  const canvas = createCanvas(width, height, 'pdf');
  const ctx = canvas.getContext('2d') as unknown as Ctx;
  ctx.textDrawingMode = 'glyph';
  // Run names, conditions and titles come from the user's logs: control characters are drawn as
  // visible escapes (as on the terminal), and measured the way they are drawn.
  const fill = ctx.fillText.bind(ctx);
  const measureRaw = ctx.measureText.bind(ctx);
  ctx.fillText = (t, x, y) => fill(escapeControls(t), x, y);
  ctx.measureText = (t) => measureRaw(escapeControls(t));

  const images = new Map<Buffer, Image>();
  for (const p of pages) for (const col of p.columns) for (const b of col) if (b.kind === 'image' && !images.has(b.png)) images.set(b.png, (await loadImage(b.png)) as unknown as Image);

  pages.forEach((page, pi) => {
    if (pi > 0) ctx.addPage(width, height);
    ctx.textBaseline = 'top';
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, width, height);
    ctx.fillStyle = '#2b4c7e';
    ctx.fillRect(0, 0, width, 5);
    // A long title shrinks (down to 16 px) before it is cut.
    let titleSize = 22;
    ctx.font = `bold ${titleSize}px "${FONT}"`;
    while (titleSize > 16 && ctx.measureText(page.title).width > width - 2 * MARGIN) ctx.font = `bold ${--titleSize}px "${FONT}"`;
    ctx.fillStyle = INK;
    ctx.textAlign = 'left';
    ctx.fillText(fit(ctx, page.title, width - 2 * MARGIN), MARGIN, 20 + (22 - titleSize) / 2);
    let top = 52;
    if (page.subtitle) {
      ctx.font = `12px "${FONT}"`;
      ctx.fillStyle = MUTED;
      ctx.fillText(fit(ctx, page.subtitle, width - 2 * MARGIN), MARGIN, 50);
      top = 72;
    }
    const bottom = height - 28;
    ctx.font = `9px "${FONT}"`;
    ctx.fillStyle = MUTED;
    ctx.fillText(fit(ctx, footer, width - 2 * MARGIN - 60), MARGIN, height - 18);
    ctx.textAlign = 'right';
    ctx.fillText(`${pi + 1} / ${pages.length}`, width - MARGIN, height - 18);
    ctx.textAlign = 'left';

    const rel = page.widths ?? page.columns.map(() => 1);
    const relSum = rel.reduce((a, v) => a + v, 0);
    const usable = width - 2 * MARGIN - GAP * 2 * (page.columns.length - 1);
    let x = MARGIN;
    page.columns.forEach((column, ci) => {
      const w = (usable * rel[ci]) / relSum;
      const heightOf = (blocks: DeckBlock[]) => blocks.reduce((h, b) => h + (b.kind === 'image' ? 0 : measure(ctx, b, w) + GAP), 0);
      // Text that does not fit shrinks a little (to 75%) before anything is cut at the bottom.
      let col = column;
      const hasImage = column.some((b) => b.kind === 'image');
      for (let f = 0.95; !hasImage && f >= 0.75 && heightOf(col) > bottom - top; f -= 0.05) col = column.map((b) => scaleBlock(b, f));
      const fixed = heightOf(col);
      const nImages = col.filter((b) => b.kind === 'image').length;
      const imageH = nImages ? Math.max(40, (bottom - top - fixed) / nImages) : 0;
      let y = top;
      for (const b of col) {
        const room = b.kind === 'image' ? Math.min(imageH, bottom - y) : bottom - y;
        if (room <= 12) break;
        y += draw(ctx, b, x, y, w, room, images) + GAP;
      }
      x += w + GAP * 2;
    });
  });
  return canvas.toBuffer('application/pdf');
}
