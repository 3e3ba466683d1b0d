import { describe, expect, it } from 'vitest';
import type { HurtsResult } from '../../src/analysis/Hurts.js';
import { hurtsSubtitle, hurtsTable } from '../../src/report/reportTables.js';

// Invented result: two rises in two of 50 slices, judged after the Benjamini–Hochberg correction.
const seg = (width: number, p: number, pAdjusted: number) => ({
  fixed: { width, epochs: 1000, label_noise: 0.1, condition: '' },
  onset: 32,
  peak: 64,
  recovery: null,
  rise: 0.1,
  p,
  pAdjusted,
  test: 'welch' as const,
});
const result: HurtsResult = {
  metric: 'test_error',
  fixed: { epochs: 1000 },
  segments: [seg(64, 0.0004, 0.01), seg(128, 0.001, 0.025)],
  alpha: 0.05,
  slices: 50,
  correction: 'benjamini-hochberg',
  slicesWithRise: 2,
};

describe('hurtsSubtitle', () => {
  it('says how many slices hold a rise and that they were corrected across the slices scanned', () => {
    // Benjamini & Hochberg 1995: the false discovery rate is controlled across the m tests.
    expect(hurtsSubtitle(result)).toBe(
      '2 of 50 train-size slices show a rise, after correction (Benjamini–Hochberg across the 50 slices scanned, FDR 0.05) at epochs 1000; worst rise first',
    );
  });
  it('says when each slice was tested alone', () => {
    expect(hurtsSubtitle({ ...result, correction: 'none' })).toMatch(/^2 of 50 train-size slices show a rise, each tested alone at α = 0\.05 \(no correction across slices\)/);
  });
  it('counts distinct slices when an older result lacks slicesWithRise', () => {
    const { slicesWithRise: _, ...old } = result;
    expect(hurtsSubtitle({ ...old, segments: [...result.segments, { ...seg(64, 0.01, 0.04), onset: 128, peak: 256 }] })).toMatch(/^2 of 50 /);
  });
});

describe('hurtsTable', () => {
  it('shows the adjusted p beside the raw p', () => {
    const t = hurtsTable([result]);
    expect(t.columns).toEqual(['width', 'onset n', 'peak n', 'recovery n', 'rise', 'p', 'adjusted p', 'test']);
    expect(t.rows[0].slice(-3)).toEqual(['4e-4', '0.01', 'welch']);
  });
});
