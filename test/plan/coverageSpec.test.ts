import { describe, expect, it } from 'vitest';
import { compileSpec } from '../../src/render/renderSpec.js';
import { coverageCells, coverageLayout, coverageSpec } from '../../src/render/coverageSpec.js';
import { renderSpec } from '../../src/render/renderSpec.js';
import { parseSpec } from '../../src/plan/parseSpec.js';
import { coverage } from '../../src/plan/coverage.js';
import { spec, storeFor } from './fixtures.js';

const run = (width: number, train_size: number, label_noise: number, seed: number) => ({ condition: 'adam', width, train_size, label_noise, seed });

describe('coverage chart', () => {
  const cov = coverage(storeFor(spec, { removed: [run(8, 1000, 0, 0)], truncated: [{ run: run(8, 1000, 0, 1), at: 10 }], diverged: [run(16, 4000, 0.2, 2)] }), spec);

  it('counts seeds per width × train-size cell', () => {
    const cells = coverageCells(cov);
    expect(cells).toHaveLength(6 * 2 * 2);
    expect(cells.find((c) => c.width === 8 && c.train_size === 1000 && c.label_noise === 0)).toMatchObject({ planned: 3, complete: 1, missing: 1, partial: 1, label: '1/3 1p' });
    expect(cells.find((c) => c.width === 16 && c.train_size === 4000 && c.label_noise === 0.2)).toMatchObject({ complete: 2, diverged: 1, label: '2/3 1d' });
    expect(cells.reduce((s, c) => s + c.complete, 0)).toBe(cov.counts.complete);
  });

  it('compiles without vega-lite warnings, one panel per noise level (side by side while they fit)', async () => {
    const vl = coverageSpec({ coverage: cov, spec }) as { facet: { field: string }; columns: number };
    expect(vl.facet.field).toBe('label_noise');
    expect(vl.columns).toBe(2);
    expect((await compileSpec(vl as never)).warnings).toEqual([]);
  });

  it('keeps a slide\'s shape: wide grids wrap their noise panels onto rows, very wide ones drop cell labels', async () => {
    // The demo's grid: 25 widths × 5 train sizes × 2 noise levels.
    const demo = coverageLayout({ widths: 25, sizes: 5, panels: 2, conditions: false });
    expect(demo).toMatchObject({ columns: 1, labels: true });
    const big = coverageLayout({ widths: 50, sizes: 5, panels: 2, conditions: false });
    expect(big.labels).toBe(false);
    expect(big.cell * 50).toBeLessThanOrEqual(1100);
    expect(coverageLayout({ widths: 6, sizes: 2, panels: 3, conditions: false }).columns).toBe(3);
    // Rendered, the demo-like grid is no wider than about twice its height (a 16:9 slide holds it without squeezing).
    const wide = parseSpec('axes:\n  width: {from: 4, to: 4096, count: 25}\n  train_size: [64, 128, 256, 512, 1024]\n  label_noise: [0.1, 0.2]\nseeds: 3\nepochs: 100\n', 'grid.yaml');
    const png = (await renderSpec(coverageSpec({ coverage: coverage(storeFor(wide), wide), spec: wide }), { format: 'png', scale: 1 })) as Buffer;
    const { PNG } = await import('pngjs');
    const img = PNG.sync.read(png);
    expect(img.width / img.height).toBeLessThan(2.2);
  });
});
