import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import pixelmatch from 'pixelmatch';
import { PNG } from 'pngjs';
import { describe, expect, it } from 'vitest';
import type { TopLevelSpec } from 'vega-lite';
import { heatmapSpec } from '../../src/render/heatmapSpec.js';
import { slicesSpec } from '../../src/render/slicesSpec.js';
import { renderSpec } from '../../src/render/renderSpec.js';
import { fixtureMap, fixtureRidge } from './mapFixture.js';

const GOLDEN = fileURLToPath(new URL('../fixtures/render/', import.meta.url));
const DIFF = fileURLToPath(new URL('./__diff__/', import.meta.url));
/** Share of pixels allowed to differ (font hinting and anti-aliasing vary between machines). */
const TOLERANCE = 0.005;

/**
 * Renders at 1× and compares with the committed golden PNG. On a mismatch the actual image and
 * a diff image are written to test/render/__diff__/ (gitignored). UPDATE_GOLDEN=1 rewrites goldens.
 */
async function compareGolden(name: string, spec: TopLevelSpec): Promise<void> {
  const actual = (await renderSpec(spec, { format: 'png', scale: 1 })) as Buffer;
  const goldenPath = `${GOLDEN}${name}.png`;
  if (process.env.UPDATE_GOLDEN === '1' || !existsSync(goldenPath)) {
    if (process.env.UPDATE_GOLDEN !== '1') throw new Error(`no golden ${goldenPath}: run with UPDATE_GOLDEN=1 and look at it`);
    mkdirSync(GOLDEN, { recursive: true });
    writeFileSync(goldenPath, actual);
    return;
  }
  const a = PNG.sync.read(actual);
  const g = PNG.sync.read(readFileSync(goldenPath));
  let differing = Infinity;
  let diff: ReturnType<typeof PNG.sync.read> | null = null;
  if (a.width === g.width && a.height === g.height) {
    diff = new PNG({ width: a.width, height: a.height });
    differing = pixelmatch(a.data, g.data, diff.data, a.width, a.height, { threshold: 0.1 });
  }
  const share = differing / (g.width * g.height);
  if (share > TOLERANCE) {
    mkdirSync(DIFF, { recursive: true });
    writeFileSync(`${DIFF}${name}.actual.png`, actual);
    if (diff) writeFileSync(`${DIFF}${name}.diff.png`, PNG.sync.write(diff));
  }
  expect({ name, size: [a.width, a.height], share: share <= TOLERANCE ? 'ok' : share }).toEqual({ name, size: [g.width, g.height], share: 'ok' });
}

describe('golden images', () => {
  const map = fixtureMap({ missing: [[2, 3], [7, 5], [8, 5]], diverged: [[4, 6], [7, 5]] });
  const ridge = fixtureRidge(map, { noPeak: [0, 4], weak: [6] });

  it('heatmap of cells with ridge, threshold, missing and diverged marks', async () => {
    await compareGolden('heatmap-cells', heatmapSpec(map, ridge));
  });

  it('interpolated raster with hatched interpolated areas', async () => {
    await compareGolden('heatmap-raster', heatmapSpec(map, ridge, { raster: true }));
  });

  it('slices with seed bands, train error and peaks', async () => {
    await compareGolden('slices', slicesSpec(map, ridge, { rows: [1, 40, 4000] }));
  });
});
