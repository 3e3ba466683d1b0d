import { describe, expect, it } from 'vitest';
import { findRidge } from '../../src/analysis/findRidge.js';
import type { Peak } from '../../src/analysis/Ridge.js';
import { buildMap } from '../../src/grid/buildMap.js';
import { composePlan } from '../../src/plan/composePlan.js';
import { parsePlanCsv } from '../../src/plan/parsePlanCsv.js';
import type { PlanCsvRun } from '../../src/plan/parsePlanCsv.js';
import { parseSpec } from '../../src/plan/parseSpec.js';
import { planCsv } from '../../src/plan/planCsv.js';
import { concatTables } from '../../src/simulate/concatTables.js';
import { planSweep } from '../../src/simulate/planSweep.js';
import { presets } from '../../src/simulate/presets.js';
import type { RowTable } from '../../src/store/RowTable.js';

/**
 * The acceptance loop of test/cli/planLoop.test.ts (coarse 5 widths × n 100, 200 × 2 seeds, two
 * rounds of 7 planned runs, against a dense 17-width 3-seed grid), in process through the
 * functions `datlas plan` and `simulate --plan` run, over fresh draws of the simulator: seed
 * ids offset by 0, 10, …, 90. Judged are the train sizes where the dense grid itself finds a
 * significant peak: 6 pairs among offsets 0, 10, 30, 50, 70 (measured; at 20, 40, 60, 80, 90 the
 * dense grid's peaks are inside seed noise at both sizes, nothing to compare with). A judged pair
 * passes when the planned design has a significant peak within 0.25 octave of the dense one.
 * Measured with this planner: 5 of 6 pass after two rounds (offset 50, n 100 is still inside seed
 * noise: its left flank is nearly flat, so the base needs more seeds; located after four rounds).
 * Before seeds at the peak and both neighbours were valued in round 1: 4 of 6.
 */
const EPOCHS = 1_000_000;
const WIDTHS = [32, 64, 128, 256, 512];
const DENSE = Array.from({ length: 17 }, (_, k) => Math.round(32 * 2 ** (k / 4)));
const SIZES = [100, 200];
const NOISE = 0.1;
const preset = { ...presets.quick(), measureTime: false };

const grid = (widths: number[], seeds: number[]): PlanCsvRun[] =>
  SIZES.flatMap((n) => widths.flatMap((w) => seeds.map((seed) => ({ line: 0, run: '', condition: '', width: w, train_size: n, label_noise: NOISE, seed, epochs: EPOCHS, resume_from: null }))));
const ridgeAt = (t: RowTable, n: number): Peak | null =>
  findRidge(buildMap(t, { kind: 'model', at: { train_size: n, label_noise: NOISE }, method: 'linear' }), { boot: 200 }).rows.find((r) => r.y === EPOCHS)?.peak ?? null;

function loop(offset: number) {
  const seeds = [offset, offset + 1];
  const spec = parseSpec(`axes:\n  width: [${WIDTHS}]\n  train_size: [${SIZES}]\n  label_noise: [${NOISE}]\nseeds: [${seeds}]\nepochs: ${EPOCHS}\n`, 'grid.yaml');
  let table = planSweep({ runs: grid(WIDTHS, seeds), preset });
  for (let round = 0; round < 2; round++) {
    const { plan } = composePlan({ table, spec, maxRuns: 7 });
    expect(plan.runs).toHaveLength(7);
    table = concatTables([table, planSweep({ runs: parsePlanCsv(planCsv(plan), 'plan.csv'), preset })]);
  }
  return table;
}

describe('closed-loop planning over fresh simulator draws', () => {
  it('two rounds of 7 runs place the ridge within 0.25 octave of the dense grid at 5 of the 6 judged train sizes over five seed-id offsets', () => {
    const judged: Record<number, number[]> = { 0: [100, 200], 10: [200], 30: [200], 50: [100], 70: [100] };
    const misses: string[] = [];
    for (const [o, sizes] of Object.entries(judged)) {
      const offset = Number(o);
      const dense = planSweep({ runs: grid(DENSE, [offset, offset + 1, offset + 2]), preset });
      const table = loop(offset);
      for (const n of sizes) {
        const ref = ridgeAt(dense, n);
        expect(ref, `dense grid, offset ${offset}, n ${n}`).not.toBeNull();
        const ours = ridgeAt(table, n);
        if (!ours || Math.abs(Math.log2(ours.x / ref!.x)) > 0.25) misses.push(`offset ${offset}, n ${n}: planned ${ours?.x ?? 'none'}, dense ${ref!.x}`);
      }
    }
    // 5 of the 6 judged pairs, as measured (see above); a regression to the old 4 of 6 fails.
    expect(misses.length, misses.join('\n')).toBeLessThanOrEqual(1);
  }, 600_000);
});
