import { describe, expect, it } from 'vitest';
import { compileSpec } from '../../src/render/renderSpec.js';
import { coverageCells, coverageSpec } from '../../src/render/coverageSpec.js';
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

  it('compiles without vega-lite warnings, one column per noise level', async () => {
    const vl = coverageSpec({ coverage: cov, spec }) as { facet: { column: { field: string } } };
    expect(vl.facet.column.field).toBe('label_noise');
    expect((await compileSpec(vl as never)).warnings).toEqual([]);
  });
});
