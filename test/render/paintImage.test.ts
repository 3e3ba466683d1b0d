import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { encodePng, pngDataUrl } from '../../src/render/encodePng.js';
import { colorLut } from '../../src/render/colorLut.js';
import { COLOR_SCHEMES } from '../../src/render/colorSchemes.js';
import { MISSING_RGB, paintCells, paintRaster } from '../../src/render/paintImage.js';
import { axisTicks } from '../../src/render/axisText.js';
import { fixtureMap } from './mapFixture.js';

describe('encodePng', () => {
  it('round-trips through an independent PNG decoder (pngjs)', () => {
    const w = 7;
    const h = 5;
    const px = new Uint8Array(w * h * 4);
    for (let i = 0; i < px.length; i++) px[i] = (i * 37 + (i >> 3)) & 0xff;
    const png = PNG.sync.read(encodePng(px, w, h));
    expect([png.width, png.height]).toEqual([w, h]);
    expect([...png.data]).toEqual([...px]);
    expect(pngDataUrl(px, w, h)).toMatch(/^data:image\/png;base64,iVBORw0KGgo/);
  });

  it('rows repeating the row above (Up filter, ISO/IEC 15948 §9.2) decode to the same pixels', () => {
    const w = 9;
    const h = 12;
    const px = new Uint8Array(w * h * 4);
    // Bands of 1–4 identical rows, a view into a larger buffer (as paintCells' callers may pass).
    const bandOf = (y: number) => (y < 3 ? 0 : y < 4 ? 1 : y < 8 ? 2 : y < 10 ? 3 : 4);
    for (let y = 0; y < h; y++) for (let x = 0; x < w * 4; x++) px[y * w * 4 + x] = (bandOf(y) * 53 + x * 11) & 0xff;
    const big = new Uint8Array(px.length + 16);
    big.set(px, 8);
    const view = big.subarray(8, 8 + px.length);
    const png = PNG.sync.read(encodePng(view, w, h));
    expect([...png.data]).toEqual([...px]);
  });
});

describe('colour schemes', () => {
  it('offers only perceptually uniform sequential schemes, and viridis has its published end points', () => {
    expect(COLOR_SCHEMES).not.toContain('rainbow');
    expect(COLOR_SCHEMES).not.toContain('turbo');
    const lut = colorLut('viridis');
    // viridis runs from #440154 to #fde725 (matplotlib's _cm_listed.py, from memory).
    expect([...lut.subarray(0, 3)]).toEqual([0x44, 0x01, 0x54]);
    expect([...lut.subarray(255 * 3)]).toEqual([0xfd, 0xe7, 0x25]);
  });
});

describe('paintCells / paintRaster', () => {
  const map = fixtureMap({ missing: [[2, 3]], rasterN: 30 });
  const lut = colorLut('viridis');
  const domain: [number, number] = [0.1, 0.5];
  const W = 200;
  const H = 160;
  /** Pixel at the centre of grid point (i, j) in an image spanning the axis edges. */
  const at = (px: Uint8Array, i: number, j: number) => {
    const t = (v: number, e: number[]) => (Math.log2(v) - Math.log2(e[0])) / (Math.log2(e[e.length - 1]) - Math.log2(e[0]));
    const x = Math.floor(t(map.x.values[i], map.x.edges) * W);
    const y = Math.floor((1 - t(map.y.values[j], map.y.edges)) * H);
    const o = (y * W + x) * 4;
    return [...px.subarray(o, o + 4)];
  };
  const expected = (v: number) => {
    const k = Math.round(Math.min(1, Math.max(0, (v - domain[0]) / (domain[1] - domain[0]))) * 255) * 3;
    return [lut[k], lut[k + 1], lut[k + 2], 255];
  };

  it('paints each cell in its own colour at its true extent, missing cells grey', () => {
    const px = paintCells(map, { width: W, height: H, domain, lut });
    for (const c of map.cells.slice(0, 20)) {
      const i = map.x.values.indexOf(c.x);
      const j = map.y.values.indexOf(c.y);
      expect(at(px, i, j)).toEqual(expected(c.cell.stats.mean));
    }
    expect(at(px, 2, 3)).toEqual([...MISSING_RGB, 255]);
  });

  it('hatches interpolated areas and leaves outside the data transparent', () => {
    const px = paintRaster(map, { width: W, height: H, domain, lut, hatchPeriod: 9 });
    // Bottom-left corner is outside the fixture's data: fully transparent.
    expect(px[((H - 1) * W) * 4 + 3]).toBe(0);
    // Around the missing cell (2, 3) some pixels are lightened stripes: lighter than any viridis
    // colour at that value would be, i.e. the pixel row holds two distinct colour groups.
    const row = Math.floor(H * (1 - (Math.log2(map.y.values[3]) - Math.log2(map.y.edges[0])) / (Math.log2(map.y.edges.at(-1)!) - Math.log2(map.y.edges[0]))));
    const x0 = Math.ceil(W * (Math.log2(map.x.edges[2]) - Math.log2(map.x.edges[0])) / (Math.log2(map.x.edges.at(-1)!) - Math.log2(map.x.edges[0])));
    const bright = [];
    for (let x = x0 + 2; x < x0 + 18; x++) bright.push(px[(row * W + x) * 4 + 1]);
    expect(Math.max(...bright) - Math.min(...bright)).toBeGreaterThan(40);
  });
});

describe('axisTicks', () => {
  it('uses powers of two for width and the sweep values for train size', () => {
    const w = fixtureMap().x;
    expect(axisTicks(w)).toEqual([2, 4, 8, 16, 32, 64, 128, 256, 512, 1024, 2048].filter((_, i) => i % 2 === 0));
    const n = fixtureMap({ xName: 'train_size', xValues: [1000, 2000, 4000, 8000, 16000] }).x;
    expect(axisTicks(n)).toEqual([1000, 2000, 4000, 8000, 16000]);
  });
});
