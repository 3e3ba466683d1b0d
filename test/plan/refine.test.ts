import { describe, expect, it } from 'vitest';
import { featuresSweep } from '../../src/simulate/featuresSweep.js';
import { concatTables } from '../../src/simulate/concatTables.js';
import { buildMap } from '../../src/grid/buildMap.js';
import { findRidge } from '../../src/analysis/findRidge.js';
import { findHurts } from '../../src/analysis/findHurts.js';
import { buildCells } from '../../src/cells/buildCells.js';
import { parseSpec } from '../../src/plan/parseSpec.js';
import { proposeRefinements } from '../../src/plan/refine.js';
import { coverage } from '../../src/plan/coverage.js';
import { fitCostModel } from '../../src/plan/costModel.js';
import { planRuns } from '../../src/plan/planRuns.js';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import type { RowRecord } from '../../src/store/tableFromRows.js';
import type { RowTable } from '../../src/store/RowTable.js';

const n = 128;
const EPOCHS = 1_000_000;
const sim = (widths: number[]) => featuresSweep({ seeds: 4, widths, trainSizes: [n], labelNoise: [0.2], epochs: [EPOCHS], testSize: 600 });

/** The ridge point at the target epoch, from the map as `datlas map` builds it. */
function ridgePoint(table: RowTable) {
  const map = buildMap(table, { kind: 'model', at: { train_size: n, label_noise: 0.2 }, method: 'linear' });
  const row = findRidge(map, { boot: 400 }).rows.find((r) => r.y === EPOCHS)!;
  expect(row.peak).not.toBeNull();
  return row.peak!;
}

describe('refinement on a simulated random-features sweep', () => {
  // Coarse widths, a factor 4 apart; the random-features peak sits near N = n (Belkin, Hsu, Ma &
  // Mandal 2019; REFERENCES.md §4 and §7).
  const widths = [8, 32, 128, 512];
  const spec = parseSpec(`axes:\n  width: [${widths}]\n  train_size: [${n}]\n  label_noise: [0.2]\nseeds: 4\nepochs: ${EPOCHS}\n`, 'sweep.yaml');
  const table = sim(widths);

  it('proposes widths inside the ridge bracket, and re-simulating them narrows the ridge interval', () => {
    const before = ridgePoint(table);
    expect(before.cellX).toBe(128);
    const lo = widths.filter((w) => w <= before.low).at(-1)!;
    const hi = widths.find((w) => w >= before.high)!;
    const ref = proposeRefinements({ table, spec });
    const proposed = [...new Set(ref.candidates.filter((c) => c.reason === 'refine').map((c) => c.runs[0].width))].sort((a, b) => a - b);
    expect(proposed.length).toBeGreaterThan(0);
    for (const w of proposed) {
      expect(w).toBeGreaterThan(lo);
      expect(w).toBeLessThan(hi);
      expect(widths).not.toContain(w);
    }
    // Bisection in log space: geometric midpoints of the grid steps in the bracket.
    expect(proposed).toEqual([64, 256]);
    // Every proposal carries the spec's seeds and reason 'refine' in the plan.
    const plan = planRuns({
      spec,
      coverage: coverage(table, spec),
      model: fitCostModel({ runs: [], reference: { width: 8, train_size: n, epochs: EPOCHS } }),
      candidates: ref.candidates,
    });
    expect(plan.runs.filter((r) => r.reason === 'refine').map((r) => `${r.width}/${r.seed}`).sort()).toEqual(
      ['256/0', '256/1', '256/2', '256/3', '64/0', '64/1', '64/2', '64/3'],
    );

    const after = ridgePoint(concatTables([table, sim(proposed)]));
    expect(Math.log2(after.high / after.low)).toBeLessThan(Math.log2(before.high / before.low));
    expect(after.low).toBeLessThan(n * 1.25);
    expect(after.high).toBeGreaterThan(n / 1.25);
  });
});

describe('refinement when the grid misses the peak', () => {
  it('bisects the step holding the interpolation threshold, where the peak then appears', () => {
    // n = 64 with widths a factor 4 apart: no measured width sits at the peak (N ≈ n).
    const m = 64;
    const widths = [8, 32, 128, 512];
    const simAt = (ws: number[]) => featuresSweep({ seeds: 4, widths: ws, trainSizes: [m], labelNoise: [0.2], epochs: [EPOCHS], testSize: 600 });
    const spec = parseSpec(`axes:\n  width: [${widths}]\n  train_size: [${m}]\n  label_noise: [0.2]\nseeds: 4\nepochs: ${EPOCHS}\n`, 's.yaml');
    const table = simAt(widths);
    const ref = proposeRefinements({ table, spec });
    expect(ref.peaks).toEqual([]);
    const proposed = [...new Set(ref.candidates.filter((c) => c.reason === 'refine').map((c) => c.runs[0].width))];
    // Random features interpolate at N ≈ n (Belkin, Hsu, Ma & Mandal 2019): the threshold lies in 32–128.
    expect(proposed).toEqual([64]);
    const after = proposeRefinements({ table: concatTables([table, simAt(proposed)]), spec });
    const sig = after.peaks.filter((p) => p.significant);
    expect(sig).toHaveLength(1);
    expect(sig[0].peak.cellX).toBe(64);
  });
});

describe('extra seeds where a peak is borderline', () => {
  // Means along width with a small peak at 32; seeds spread ±d around the mean.
  const W = [4, 8, 16, 32, 64, 128, 256];
  const mean = [0.3, 0.28, 0.3, 0.34, 0.3, 0.26, 0.24];
  const make = (d: number) => {
    const rows: Partial<RowRecord>[] = [];
    W.forEach((w, i) => {
      for (let s = 0; s < 4; s++)
        rows.push({ run: `w${w}-s${s}`, seed: s, width: w, train_size: 1000, label_noise: 0.1, epochs: 100, test_error: mean[i] + (s % 2 ? -d : d) * (i % 2 ? -1 : 1), train_error: 0 });
    });
    return tableFromRows(rows);
  };
  const spec = parseSpec('axes:\n  width: [4, 8, 16, 32, 64, 128, 256]\n  train_size: [1000]\n  label_noise: [0.1]\nseeds: 4\nepochs: 100\n', 's.yaml');

  it('asks for fresh seeds at the peak cell and its neighbours only when the prominence is near the minimum', () => {
    for (const d of [0.001, 0.03, 0.2]) {
      const ref = proposeRefinements({ table: make(d), spec, boot: 200 });
      const seeds = ref.candidates.filter((c) => c.reason === 'seeds');
      const near = ref.peaks.filter((p) => p.peak.prominenceSe >= 2 / 1.5 && p.peak.prominenceSe < 3);
      if (near.length === 0) {
        expect(seeds).toEqual([]);
        continue;
      }
      // Seed ids continue after the ones used (0–3); cells: the peak (32) and its key base, the
      // higher flanking minimum (8, left; the right one at 256 is lower), where z is made.
      const border = seeds.filter((c) => c.sharpens === 'model-significance');
      expect(border.map((c) => c.runs[0].width).sort((a, b) => a - b)).toEqual([8, 32]);
      for (const c of seeds) expect(c.runs.map((r) => r.seed)).toEqual(Array.from({ length: c.runs.length }, (_, i) => 4 + i));
    }
    // The borderline case must actually occur in this sweep of spreads.
    const mid = proposeRefinements({ table: make(0.03), spec, boot: 200 });
    expect(mid.candidates.some((c) => c.reason === 'seeds')).toBe(true);
    // A clear peak (tiny spread) needs no seeds; pure noise (huge spread) shows no peak.
    expect(proposeRefinements({ table: make(0.001), spec, boot: 200 }).candidates.filter((c) => c.reason === 'seeds')).toEqual([]);
  });
});

describe('extra seeds where a hurts segment is borderline', () => {
  // Along train size at width 64: error rises from n 200 to 400 (by 0.04), then falls.
  const N = [100, 200, 400, 800, 1600];
  const mean = [0.3, 0.28, 0.32, 0.25, 0.2];
  const spec = parseSpec('axes:\n  width: [64]\n  train_size: [100, 200, 400, 800, 1600]\n  label_noise: [0.1]\nseeds: 4\nepochs: 100\n', 's.yaml');
  const make = (d: number) => {
    const rows: Partial<RowRecord>[] = [];
    N.forEach((n, i) => {
      for (let s = 0; s < 4; s++)
        rows.push({ run: `n${n}-s${s}`, seed: s, width: 64, train_size: n, label_noise: 0.1, epochs: 100, test_error: mean[i] + (s % 2 ? -d : d) * (i % 2 ? -1 : 1), train_error: 0 });
    });
    return tableFromRows(rows);
  };

  it('asks for seeds at the onset and peak sizes when p is near alpha, none when the rise is clear', () => {
    const borderline = make(0.02);
    const h = findHurts(buildCells(borderline), { alpha: 0.2, boot: 200 });
    expect(h.segments).toHaveLength(1);
    // The Welch p of this spread sits within a factor 4 of alpha = 0.05.
    expect(h.segments[0].p).toBeGreaterThan(0.05 / 4);
    expect(h.segments[0].p).toBeLessThan(0.05 * 4);
    const seeds = proposeRefinements({ table: borderline, spec, boot: 200 }).candidates.filter((c) => c.reason === 'seeds');
    expect(seeds.map((c) => c.runs[0].train_size).sort((a, b) => a - b)).toEqual([200, 400]);
    for (const c of seeds) {
      expect(c.runs[0].seed).toBe(4);
      expect(c.runs.every((r) => r.width === 64)).toBe(true);
    }
    // A clear rise needs no seeds; its onset and recovery steps (an octave each) are bisected instead.
    const clear = proposeRefinements({ table: make(0.002), spec, boot: 200 }).candidates;
    expect(clear.filter((c) => c.reason === 'seeds')).toEqual([]);
    const named = (c: (typeof clear)[number]) => [c.sharpens, ...(c.also ?? [])];
    const steps = clear.filter((c) => named(c).some((x) => x === 'hurts-onset' || x === 'hurts-recovery'));
    // Onset 200 (the rise starts in 200–400); recovery where error falls back to 0.28: inside
    // 400–800. The same two sizes bisect the steps beside the sample-wise peak (400).
    expect(steps.map((c) => [named(c), c.runs[0].train_size])).toEqual([[['sample-peak', 'hurts-onset'], 283], [['sample-peak', 'hurts-recovery'], 566]]);
    for (const c of steps) expect(c.runs.map((r) => [r.width, r.seed])).toEqual([0, 1, 2, 3].map((s) => [64, s]));
  });
});

describe('refinement along train size and epochs', () => {
  it('bisects the train-size steps beside a sample-wise peak', () => {
    const N = [100, 200, 400, 800, 1600];
    const mean = [0.3, 0.31, 0.4, 0.3, 0.25];
    const rows: Partial<RowRecord>[] = [];
    N.forEach((n, i) => {
      for (let s = 0; s < 3; s++) rows.push({ run: `n${n}-s${s}`, seed: s, width: 300, train_size: n, label_noise: 0, epochs: 50, test_error: mean[i] + (s - 1) * 0.002, train_error: 0 });
    });
    const spec = parseSpec('axes:\n  width: [300]\n  train_size: [100, 200, 400, 800, 1600]\nseeds: 3\nepochs: 50\n', 's.yaml');
    const ref = proposeRefinements({ table: tableFromRows(rows), spec, boot: 200 });
    const sample = ref.slices.find((x) => x.kind === 'sample')!;
    expect(sample.peak!.cellX).toBe(400);
    expect(sample.status).toBe('refining');
    const sizes = ref.candidates.filter((c) => c.sharpens === 'sample-peak' && c.reason === 'refine').map((c) => c.runs[0].train_size);
    // Geometric midpoints of 200–400 and 400–800 (bisection in log size).
    expect(sizes.sort((a, b) => a - b)).toEqual([283, 566]);
  });

  it('resumes the runs of a cell whose error still rises over the last decade, to 4× the target', () => {
    // Error falls to epoch 100, then rises steadily to the target 10,000: the epoch-wise peak is later.
    const E = [1, 3, 10, 30, 100, 300, 1000, 3000, 10000];
    const curve = [0.5, 0.4, 0.3, 0.25, 0.2, 0.24, 0.28, 0.32, 0.36];
    const rows: Partial<RowRecord>[] = [];
    for (const w of [50, 100])
      E.forEach((e, i) => {
        for (let s = 0; s < 3; s++)
          rows.push({ run: `w${w}-s${s}`, seed: s, width: w, train_size: 200, label_noise: 0.2, epochs: e, test_error: (w === 50 ? curve[i] : Math.max(0.2, curve[i] - 0.3 * (i >= 4 ? 1 : 0))) + (s - 1) * 0.003, train_error: 0 });
      });
    const spec = parseSpec('axes:\n  width: [50, 100]\n  train_size: [200]\n  label_noise: [0.2]\nseeds: 3\nepochs: 10000\n', 's.yaml');
    const resumes = proposeRefinements({ table: tableFromRows(rows), spec, boot: 100 }).candidates.filter((c) => c.reason === 'resume');
    expect(resumes).toHaveLength(1);
    expect(resumes[0].sharpens).toBe('epoch-peak');
    expect(resumes[0].runs).toEqual([0, 1, 2].map((s) => ({ condition: '', label_noise: 0.2, width: 50, train_size: 200, seed: s, epochs: 40000, resume_from: 10000, run: `w50-s${s}` })));
    // In the plan: reason resume, the store's run id, and the cost of the remaining epochs only.
    const model = fitCostModel({ runs: [], reference: { width: 50, train_size: 200, epochs: 10000 } });
    const plan = planRuns({ spec, coverage: coverage(tableFromRows(rows), spec), model, candidates: resumes });
    expect(plan.runs.map((r) => [r.reason, r.run, r.resume_from, r.epochs])).toEqual([0, 1, 2].map((s) => ['resume', `w50-s${s}`, 10000, 40000]));
    expect(plan.runs[0].cost).toBeCloseTo(3, 9);
  });
});

describe('the stop rule', () => {
  // A sharp peak at width 128 on a quarter-octave grid, 4 tight seeds: located at 0.25 octave.
  const W = Array.from({ length: 17 }, (_, k) => Math.round(32 * 2 ** (k / 4)));
  const rows: Partial<RowRecord>[] = [];
  W.forEach((w) => {
    const m = 0.45 - 0.25 * Math.abs(Math.log2(w / 128));
    for (let s = 0; s < 4; s++) rows.push({ run: `w${w}-s${s}`, seed: s, width: w, train_size: 128, label_noise: 0.1, epochs: 100, test_error: m + (s - 1.5) * 0.002, train_error: 0 });
  });
  const table = tableFromRows(rows);
  const spec = parseSpec(`axes:\n  width: [${W}]\n  train_size: [128]\n  label_noise: [0.1]\nseeds: 4\nepochs: 100\n`, 's.yaml');

  it('says done and proposes nothing when every ridge point is located within the resolution', () => {
    const ref = proposeRefinements({ table, spec, boot: 200, resolution: 0.25 });
    expect(ref.slices).toHaveLength(1);
    expect(ref.slices[0]).toMatchObject({ kind: 'model', status: 'located' });
    expect(ref.slices[0].octaves!).toBeLessThanOrEqual(0.25 * 1.1);
    expect(ref.candidates).toEqual([]);
    expect(ref.done).toBe(true);
  });

  it('a finer resolution asks for more: the quarter-octave steps beside the peak are bisected', () => {
    const ref = proposeRefinements({ table, spec, boot: 200, resolution: 0.125 });
    expect(ref.done).toBe(false);
    const widths = ref.candidates.filter((c) => c.reason === 'refine').map((c) => c.runs[0].width).sort((a, b) => a - b);
    expect(widths).toEqual([Math.round(Math.sqrt(108 * 128)), Math.round(Math.sqrt(128 * 152))]);
  });
});
