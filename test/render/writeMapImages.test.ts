import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { writeMapImages } from '../../src/render/writeMapImages.js';
import { heatmapSpec } from '../../src/render/heatmapSpec.js';
import { fixtureMap, fixtureRidge } from './mapFixture.js';

const dir = mkdtempSync(join(tmpdir(), 'datlas-render-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('writeMapImages', () => {
  const map = fixtureMap({ missing: [[2, 3]], diverged: [[4, 6]] });
  const ridge = fixtureRidge(map, { noPeak: [4] });

  it('writes every format with its vega-lite spec beside it', async () => {
    const paths = await writeMapImages({ map, ridge, outDir: dir, formats: ['png', 'svg', 'pdf'], slices: [10, 1000] });
    const names = paths.map((p) => p.slice(dir.length + 1)).sort();
    expect(names).toEqual([
      'map-model-slices.pdf', 'map-model-slices.png', 'map-model-slices.svg', 'map-model-slices.vl.json',
      'map-model.pdf', 'map-model.png', 'map-model.svg', 'map-model.vl.json',
    ]);
    // The spec beside the image is the spec that drew it.
    expect(JSON.parse(readFileSync(join(dir, 'map-model.vl.json'), 'utf8'))).toEqual(JSON.parse(JSON.stringify(heatmapSpec(map, ridge))));
    // PNG at 2× by default: the IHDR width (bytes 16–19, ISO/IEC 15948 §11.2.2) is twice the SVG width.
    const png = readFileSync(join(dir, 'map-model.png'));
    const svgWidth = Number(/width="(\d+)"/.exec(readFileSync(join(dir, 'map-model.svg'), 'utf8'))![1]);
    expect(png.readUInt32BE(16)).toBe(2 * svgWidth);
    // Selectable PDF text: glyphs drawn from an embedded font, not outlines (ISO 32000-1 §9).
    const pdf = readFileSync(join(dir, 'map-model.pdf')).toString('latin1');
    expect(pdf.startsWith('%PDF-')).toBe(true);
    expect(pdf).toMatch(/\/FontFile2|\/FontFile3|\/Type\s*\/Font/);
  });

  it('honours name, scale and the raster option', async () => {
    const paths = await writeMapImages({ map, ridge, outDir: dir, formats: ['png'], scale: 1, name: 'r', raster: true, withSlices: false });
    expect(paths.map((p) => p.slice(dir.length + 1))).toEqual(['r.png', 'r.vl.json']);
    const spec = readFileSync(join(dir, 'r.vl.json'), 'utf8');
    expect(spec).toContain('"type":"image"');
    expect(spec).not.toContain('"name":"cells"');
  });
});
