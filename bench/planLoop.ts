/**
 * The closed planning loop of bench:plan, in process: coarse start → rounds of plan (the same
 * functions `datlas plan` runs: coverage, cost model, proposeRefinements, planRuns) → plan CSV
 * written and read back (planCsv, parsePlanCsv) → simulate --plan (planSweep) → the rows added to
 * the store table; and the baselines it is compared with. A measurement helper, not a test.
 */
import { findRidge } from '../src/analysis/findRidge.js';
import type { Peak } from '../src/analysis/Ridge.js';
import { buildMap } from '../src/grid/buildMap.js';
import { fitCostModel } from '../src/plan/costModel.js';
import { coverage } from '../src/plan/coverage.js';
import { parsePlanCsv } from '../src/plan/parsePlanCsv.js';
import type { PlanCsvRun } from '../src/plan/parsePlanCsv.js';
import { parseSpec } from '../src/plan/parseSpec.js';
import { planCsv } from '../src/plan/planCsv.js';
import { planRuns } from '../src/plan/planRuns.js';
import { proposeRefinements } from '../src/plan/refine.js';
import type { SliceStatus } from '../src/plan/refine.js';
import { storeRuns } from '../src/plan/storeRuns.js';
import { mulberry32 } from '../src/random/mulberry32.js';
import { concatTables } from '../src/simulate/concatTables.js';
import { planSweep } from '../src/simulate/planSweep.js';
import { presets } from '../src/simulate/presets.js';
import type { RowTable } from '../src/store/RowTable.js';

export interface Scenario {
  name: string;
  trainSizes: number[];
  labelNoise: number;
  /** Smallest width; the span is 4 octaves (coarse: 5 widths an octave apart, dense: 17 a quarter octave apart). */
  base: number;
  epochs: number;
}

export const EPOCHS = 1_000_000;
const preset = { ...presets.quick(), measureTime: false };

export const coarseWidths = (s: Scenario) => [0, 1, 2, 3, 4].map((k) => s.base * 2 ** k);
export const denseWidths = (s: Scenario) => Array.from({ length: 17 }, (_, k) => Math.round(s.base * 2 ** (k / 4)));

/** Runs of a full grid: every width × train size × seed. */
export function gridRuns(s: Scenario, widths: readonly number[], seeds: readonly number[]): PlanCsvRun[] {
  const out: PlanCsvRun[] = [];
  for (const n of s.trainSizes)
    for (const w of widths)
      for (const seed of seeds) out.push({ line: 0, run: '', condition: '', width: w, train_size: n, label_noise: s.labelNoise, seed, epochs: s.epochs, resume_from: null });
  return out;
}

export const simulate = (runs: readonly PlanCsvRun[]): RowTable => planSweep({ runs, preset });

/** The model-wise ridge point at the target epoch, as `datlas ridge --kind model --at train_size=N,label_noise=Q` finds it. */
export function ridgeAt(table: RowTable, s: Scenario, n: number): Peak | null {
  const map = buildMap(table, { kind: 'model', at: { train_size: n, label_noise: s.labelNoise }, method: 'linear' });
  // boot only sizes the interval, not the estimate or its significance: 200 rounds keep the bench short.
  return findRidge(map, { boot: 200 }).rows.find((r) => r.y === s.epochs)?.peak ?? null;
}

/** Compute of GD on random features: n·N multiply-adds per epoch per run, summed (width · train_size · epochs). */
export function compute(table: RowTable): number {
  const last = new Map<string, number>();
  for (let i = 0; i < table.length; i++) {
    const k = table.run[i];
    last.set(k, Math.max(last.get(k) ?? 0, table.width[i] * table.train_size[i] * table.epochs[i]));
  }
  let sum = 0;
  for (const v of last.values()) sum += v;
  return sum;
}

export const runCount = (t: RowTable) => new Set(t.run).size;

/** Worst |log2(estimate / reference)| over the train sizes; Infinity where the estimate has no peak. */
export function worstError(table: RowTable, s: Scenario, reference: Map<number, Peak | null>): number {
  let worst = 0;
  for (const n of s.trainSizes) {
    const ref = reference.get(n);
    if (!ref) continue;
    const p = ridgeAt(table, s, n);
    worst = Math.max(worst, p ? Math.abs(Math.log2(p.x / ref.x)) : Infinity);
  }
  return worst;
}

export interface Round {
  runs: number;
  compute: number;
  error: number;
  proposed: number;
  done: boolean;
  slices: SliceStatus[];
}

/** Rounds of plan --max-runs → simulate --plan → ingest from a coarse start with `seeds`. */
export function plannedLoop(opts: { s: Scenario; seeds: number[]; maxRuns: number; rounds: number; reference: Map<number, Peak | null>; resolution?: number }): { table: RowTable; rounds: Round[] } {
  const { s, seeds, maxRuns, rounds, reference, resolution = 0.25 } = opts;
  const widths = coarseWidths(s);
  const spec = parseSpec(
    `axes:\n  width: [${widths}]\n  train_size: [${s.trainSizes}]\n  label_noise: [${s.labelNoise}]\nseeds: [${seeds}]\nepochs: ${s.epochs}\n`,
    'grid.yaml',
  );
  let table = simulate(gridRuns(s, widths, seeds));
  const out: Round[] = [{ runs: runCount(table), compute: compute(table), error: worstError(table, s, reference), proposed: 0, done: false, slices: [] }];
  for (let r = 0; r < rounds; r++) {
    const ref = proposeRefinements({ table, spec, resolution });
    const model = fitCostModel({ runs: storeRuns(table), reference: { width: widths[0], train_size: s.trainSizes[0], epochs: s.epochs } });
    const plan = planRuns({ spec, coverage: coverage(table, spec), model, candidates: ref.candidates, maxRuns });
    out[out.length - 1].slices = ref.slices;
    out[out.length - 1].done = ref.done;
    out[out.length - 1].proposed = plan.runs.length;
    if (plan.runs.length === 0) break;
    // The plan CSV as `plan --emit csv` writes it, read back as `simulate --plan` reads it.
    const runs = parsePlanCsv(planCsv(plan), 'plan.csv');
    table = concatTables([table, simulate(runs)]);
    out.push({ runs: runCount(table), compute: compute(table), error: worstError(table, s, reference), proposed: 0, done: false, slices: [] });
  }
  return { table, rounds: out };
}

/** `total` runs per train size: widths at `seedsPerWidth` seeds (the remainder as one more seed on the middle widths). */
function spread(s: Scenario, widthsFor: (k: number) => number[], totalPerSize: number, seeds: number[]): PlanCsvRun[] {
  const per = seeds.length;
  const k = Math.max(1, Math.floor(totalPerSize / per));
  const widths = widthsFor(k);
  const runs = gridRuns(s, widths, seeds);
  const rest = totalPerSize - widths.length * per;
  const mid = [...widths].sort((a, b) => Math.abs(Math.log2(a / (s.base * 4))) - Math.abs(Math.log2(b / (s.base * 4))));
  for (const n of s.trainSizes)
    for (let j = 0; j < rest; j++)
      runs.push({ line: 0, run: '', condition: '', width: mid[j % mid.length], train_size: n, label_noise: s.labelNoise, seed: Math.max(...seeds) + 1 + Math.floor(j / mid.length), epochs: s.epochs, resume_from: null });
  return runs;
}

/** Evenly spread in log width over the 4-octave span, distinct integers. */
export function evenWidths(s: Scenario, k: number): number[] {
  const out = new Set<number>();
  for (let j = 0; j < k; j++) out.add(Math.round(s.base * 2 ** (k === 1 ? 2 : (4 * j) / (k - 1))));
  return [...out].sort((a, b) => a - b);
}

/** Log-uniform random widths over the span (distinct integers), from a seeded stream. */
export function randomWidths(s: Scenario, k: number, seed: number): number[] {
  const rng = mulberry32(seed);
  const out = new Set<number>();
  let guard = 0;
  while (out.size < k && guard++ < 10_000) out.add(Math.round(s.base * 2 ** (4 * rng())));
  return [...out].sort((a, b) => a - b);
}

export function evenDesign(s: Scenario, runsPerSize: number, seeds: number[]): RowTable {
  return simulate(spread(s, (k) => evenWidths(s, k), runsPerSize, seeds));
}

export function randomDesign(s: Scenario, runsPerSize: number, seeds: number[], rngSeed: number): RowTable {
  return simulate(spread(s, (k) => randomWidths(s, k, rngSeed), runsPerSize, seeds));
}
