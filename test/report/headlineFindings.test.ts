import { describe, expect, it } from 'vitest';
import type { HurtsResult } from '../../src/analysis/Hurts.js';
import { headlineFindings, variantCautions } from '../../src/report/headlineFindings.js';
import { reportModelFixture } from './fixtures.js';

describe('headlineFindings', () => {
  it('says where the model-wise peak is relative to the train size and how it moves with epochs', () => {
    const model = reportModelFixture();
    const f = headlineFindings({ maps: model.maps, hurts: null, coverage: null, plan: null });
    // The fixture's ridge: peak at width 64 for epochs 100 and 1000, none at 10; train size 64.
    expect(f[0]).toBe(
      'Model-wise: at epochs 1000 (train_size 64 · label_noise 0.2) test error peaks at width 64 (interval 48–80), 1 × the train size; ' +
        'train error first reaches ε at width 40 (the interpolation threshold).',
    );
    expect(f[1]).toBe('The peak appears at epochs 100 (no significant peak earlier) and stays at width 64 through epochs 1000.');
    // Both noise variants carry the same ridge heights: "varies" (neither grows nor shrinks).
    expect(f[2]).toContain('noise 0.1: 0.3 at width 64; noise 0.2: 0.3 at width 64');
    expect(f[3]).toBe('1 of 18 grid points of the model-wise map have no data (crossed on the map).');
  });

  it('a threshold at the sweep\'s edge is quoted as a bound, never as a located threshold', () => {
    const model = reportModelFixture();
    const v = model.maps[0].variants[model.maps[0].main];
    for (const r of v.ridge!.rows) if (r.threshold !== null) Object.assign(r, { threshold: 8, thresholdAtEdge: true });
    const f = headlineFindings({ maps: model.maps, hurts: null, coverage: null, plan: null });
    expect(f[0]).toContain('train error first reaches ε at width ≤ 8 (at the edge)');
    expect(f.join(' ')).not.toContain('The interpolation threshold moves');
  });

  it('reports the worst hurts segment with its size relative to the width and counts the other slices', () => {
    const seg = (width: number, rise: number, recovery: number | null) => ({
      fixed: { width, epochs: 1000, label_noise: 0.2, condition: '' },
      onset: 16,
      peak: 64,
      recovery,
      rise,
      p: 0.001,
      test: 'welch' as const,
    });
    const hurts: HurtsResult = { metric: 'test_error', fixed: { epochs: 1000 }, segments: [seg(64, 0.12, 256), seg(32, 0.05, null)], slices: 6, alpha: 0.05 };
    const f = headlineFindings({ maps: [], hurts, coverage: null, plan: null });
    expect(f).toEqual([
      'More data hurts at width 64 · epochs 1000 · label_noise 0.2: test error rises by 0.12 from train size 16 to 64 (1 × the width) (p = 0.001), ' +
        'and falls back to the onset level at 256; 1 more slice shows a significant rise.',
    ]);
  });

  it('says "k of m slices, after correction" when the hurts result was corrected across slices', () => {
    const seg = { fixed: { width: 64, epochs: 1000, label_noise: 0.2, condition: '' }, onset: 16, peak: 64, recovery: 256, rise: 0.12, p: 0.001, pAdjusted: 0.004, test: 'welch' as const };
    const hurts: HurtsResult = { metric: 'test_error', fixed: { epochs: 1000 }, segments: [seg], slices: 6, alpha: 0.05, correction: 'benjamini-hochberg', slicesWithRise: 1 };
    const f = headlineFindings({ maps: [], hurts, coverage: null, plan: null });
    expect(f[0]).toMatch(/^More data hurts in 1 of 6 train-size slices, after Benjamini–Hochberg correction\. Worst at width 64/);
    expect(f[0]).toContain('(adjusted p = 0.004)');
  });

  it('states coverage gaps and the plan when a spec is given', () => {
    const f = headlineFindings({
      maps: [],
      hurts: null,
      coverage: { counts: { complete: 10, partial: 2, missing: 3, diverged: 1 }, gaps: [] },
      plan: { budget: null, cost: 12.5, units: 'relative', runs: [{ config: {}, seed: 0, epochs: 10, reason: 'missing', cost: 1, why: 'not in the store' }, { config: {}, seed: 1, epochs: 10, reason: 'refine', cost: 1, why: 'ridge interval wide' }] },
    });
    expect(f).toEqual([
      'Still missing against the spec: 3 of 16 planned runs have no data, 2 stopped before the target epochs, 1 diverged (10 complete).',
      'Next: the plan proposes 2 runs costing 12.5 relative units: 1 missing, 1 refine.',
    ]);
  });

  it('flags peaks inside seed noise and intervals from curve noise', () => {
    const model = reportModelFixture();
    const v = structuredClone(model.maps[0].variants[1]);
    v.ridge!.rows[1].peak!.prominenceSe = 1.2;
    v.ridge!.rows[2].noiseFrom = 'curve';
    const c = variantCautions(v, 'model');
    expect(c).toEqual([
      'model-wise map (label_noise 0.2 · train_size 64): the peak at epochs 100 is inside seed noise (prominence under 2 standard errors); do not read it as a peak.',
      "model-wise map (label_noise 0.2 · train_size 64): one seed per cell, so the peak interval at epochs 1000 comes from the curve's own noise, not from seeds.",
    ]);
  });

  it('says when a peak rests on one seed and a smoothed curve', () => {
    const v = structuredClone(reportModelFixture().maps[0].variants[1]);
    v.ridge!.rows[2].noiseFrom = 'curve';
    v.ridge!.rows[2].model = 'smoothed-curve';
    expect(variantCautions(v, 'epoch')).toEqual([
      'epoch-wise map (label_noise 0.2 · train_size 64): the peak at epochs 1000 rests on one value per point (one seed, or a mean without seed spread) and a smoothed curve; its interval is a bootstrap along the curve, not over seeds.',
    ]);
  });

  it('says so when no row has a peak instead of inventing one', () => {
    const model = reportModelFixture();
    for (const v of model.maps[0].variants) for (const r of v.ridge!.rows) r.peak = null;
    const f = headlineFindings({ maps: model.maps, hurts: null, coverage: null, plan: null });
    expect(f[0]).toBe('Model-wise: no significant double-descent peak at any epoch (train_size 64 · label_noise 0.2).');
    expect(f.join(' ')).not.toMatch(/peaks at width|Label noise/);
  });
});
