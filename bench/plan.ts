/**
 * npm run bench:plan: does closed-loop planning save runs? (a measurement, not a test; BENCHMARKS.md)
 *
 * For each simulator scenario and restart (seed ids offset, a fresh draw of every data set and
 * feature matrix), from a coarse start (5 widths an octave apart × the train sizes × 2 seeds):
 * rounds of plan --max-runs 7 → simulate --plan → ingest (bench/planLoop.ts, the commands'
 * own functions), against
 *   (a) the dense grid (17 widths a quarter octave apart × 3 seeds), whose ridge is the reference,
 *   (b) the same number of runs spread evenly in log width (2 seeds a width),
 *   (c) the same number of runs at log-uniform random widths (2 seeds a width).
 * Reports runs and compute (Σ width · train_size · epochs, the multiply-adds of GD on random
 * features) needed to place the model-wise ridge within 0.25 octave of the dense grid's at every
 * train size, and the error at equal runs (the planner's count after two rounds). Then the speed
 * figure: one planning round (`datlas plan`) on a store of 1,000 runs.
 *
 *   npm run bench:plan                   3 scenarios × 3 restarts, then the 1,000-run timing
 *   npm run bench:plan -- --restarts 2   fewer restarts
 *   npm run bench:plan -- --only timing  the timing alone (or --only loop)
 *
 * Results: bench/out/plan-results.json.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Peak } from '../src/analysis/Ridge.js';
import {
  compute, denseWidths, EPOCHS, evenDesign, gridRuns, plannedLoop, randomDesign, ridgeAt, runCount, simulate, worstError,
} from './planLoop.js';
import type { Scenario } from './planLoop.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const argv = process.argv.slice(2);
const value = (f: string) => {
  const i = argv.indexOf(f);
  return i >= 0 ? argv[i + 1] : undefined;
};
const restarts = Number(value('--restarts') ?? 3);
const only = value('--only');
const TOL = 0.25;
const MAX_RUNS = 7;
const ROUNDS = 5;

const scenarios: Scenario[] = [
  { name: 'A  n 100, 200 · noise 0.1 · widths 32–512 (the acceptance loop)', trainSizes: [100, 200], labelNoise: 0.1, base: 32, epochs: EPOCHS },
  { name: 'B  n 100, 200 · noise 0.2 · widths 32–512', trainSizes: [100, 200], labelNoise: 0.2, base: 32, epochs: EPOCHS },
  { name: 'C  n 60, 120, 240 · noise 0.1 · widths 24–384', trainSizes: [60, 120, 240], labelNoise: 0.1, base: 24, epochs: EPOCHS },
];

const fmtE = (e: number) => (Number.isFinite(e) ? e.toFixed(2) : 'miss');
const fmtC = (c: number) => (Number.isFinite(c) ? `${(c / 1e12).toFixed(2)}e12` : '–');
const median = (v: number[]) => {
  const s = v.filter(Number.isFinite).sort((a, b) => a - b);
  return s.length ? (s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2) : NaN;
};
const load = () => loadavg().map((v) => v.toFixed(2)).join(' ');

interface Outcome {
  scenario: string;
  restart: number;
  referenceMissing: number[];
  dense: { runs: number; compute: number };
  planned: { rounds: { runs: number; compute: number; error: number; done: boolean }[]; locateRuns: number | null; locateCompute: number | null; stopped: boolean };
  equalRuns: number;
  errorAtEqual: { planned: number; even: number; random: number };
  even: { locateRuns: number | null; locateCompute: number | null };
  random: { locateRuns: number | null; locateCompute: number | null };
}

function baselineLocate(s: Scenario, seeds: number[], reference: Map<number, Peak | null>, design: (perSize: number) => ReturnType<typeof simulate>) {
  // Smallest design (2 seeds a width, 3 to 17 widths per train size) that places every ridge point within TOL.
  for (const k of [3, 4, 5, 6, 8, 10, 12, 14, 17]) {
    const t = design(k * seeds.length);
    if (worstError(t, s, reference) <= TOL) return { locateRuns: runCount(t), locateCompute: compute(t) };
  }
  return { locateRuns: null, locateCompute: null };
}

function runLoop(): Outcome[] {
  const outcomes: Outcome[] = [];
  for (const s of scenarios) {
    process.stdout.write(`\n${s.name}\n`);
    process.stdout.write(`${'restart'.padEnd(9)}${'reference'.padEnd(16)}${'planned: runs:error per round'.padEnd(52)}${'located at'.padEnd(12)}${'even: err'.padEnd(11)}${'located'.padEnd(10)}${'random: err'.padEnd(13)}${'located'.padEnd(10)}dense\n`);
    for (let r = 0; r < restarts; r++) {
      const o = 10 * r;
      const seeds = [o, o + 1];
      const dense = simulate(gridRuns(s, denseWidths(s), [o, o + 1, o + 2]));
      const reference = new Map(s.trainSizes.map((n) => [n, ridgeAt(dense, s, n)] as const));
      const referenceMissing = s.trainSizes.filter((n) => !reference.get(n));
      const loop = plannedLoop({ s, seeds, maxRuns: MAX_RUNS, rounds: ROUNDS, reference });
      const rounds = loop.rounds.map((x) => ({ runs: x.runs, compute: x.compute, error: x.error, done: x.done }));
      const hit = rounds.find((x) => x.error <= TOL);
      const atTwo = rounds[Math.min(2, rounds.length - 1)];
      const perSize = Math.floor(atTwo.runs / s.trainSizes.length);
      const even = evenDesign(s, perSize, seeds);
      const rand = randomDesign(s, perSize, seeds, 1000 + r);
      const out: Outcome = {
        scenario: s.name,
        restart: r,
        referenceMissing,
        dense: { runs: runCount(dense), compute: compute(dense) },
        planned: { rounds, locateRuns: hit?.runs ?? null, locateCompute: hit?.compute ?? null, stopped: loop.rounds.some((x) => x.done) },
        equalRuns: atTwo.runs,
        errorAtEqual: { planned: atTwo.error, even: worstError(even, s, reference), random: worstError(rand, s, reference) },
        even: baselineLocate(s, seeds, reference, (k) => evenDesign(s, k, seeds)),
        random: baselineLocate(s, seeds, reference, (k) => randomDesign(s, k, seeds, 1000 + r)),
      };
      outcomes.push(out);
      const refText = referenceMissing.length ? `none at n ${referenceMissing.join(',')}` : 'all';
      const trail = rounds.map((x) => `${x.runs}:${fmtE(x.error)}`).join(' ');
      process.stdout.write(
        `${String(r).padEnd(9)}${refText.padEnd(16)}${trail.padEnd(52)}${String(out.planned.locateRuns ?? 'not').padEnd(12)}` +
          `${fmtE(out.errorAtEqual.even).padEnd(11)}${String(out.even.locateRuns ?? 'not').padEnd(10)}${fmtE(out.errorAtEqual.random).padEnd(13)}${String(out.random.locateRuns ?? 'not').padEnd(10)}${out.dense.runs}\n`,
      );
    }
  }
  // Summary per scenario: medians over restarts with a reference at every train size.
  process.stdout.write(`\nsummary (medians over restarts; runs / compute to place every ridge point within ${TOL} octave of the dense grid's; error at the planner's 2-round count)\n`);
  for (const s of scenarios) {
    const os = outcomes.filter((x) => x.scenario === s.name);
    // Judged at the train sizes where the dense grid itself finds a peak (none: nothing to judge).
    const ok = os.filter((x) => x.referenceMissing.length < s.trainSizes.length);
    const line = (what: string, runs: (number | null)[], comp: (number | null)[]) => {
      const hits = runs.filter((v) => v !== null).length;
      return `  ${what.padEnd(9)} located ${hits}/${runs.length}, runs ${median(runs.map((v) => v ?? NaN))}, compute ${fmtC(median(comp.map((v) => v ?? NaN)))}`;
    };
    process.stdout.write(`${s.name}: the dense grid finds a peak at ${os.map((x) => s.trainSizes.length - x.referenceMissing.length).join(', ')} of ${s.trainSizes.length} train sizes in the ${os.length} restarts\n`);
    if (!ok.length) continue;
    process.stdout.write(`  dense     runs ${ok[0].dense.runs}, compute ${fmtC(median(ok.map((x) => x.dense.compute)))}\n`);
    process.stdout.write(`${line('planned', ok.map((x) => x.planned.locateRuns), ok.map((x) => x.planned.locateCompute))}\n`);
    process.stdout.write(`${line('even', ok.map((x) => x.even.locateRuns), ok.map((x) => x.even.locateCompute))}\n`);
    process.stdout.write(`${line('random', ok.map((x) => x.random.locateRuns), ok.map((x) => x.random.locateCompute))}\n`);
    process.stdout.write(
      `  at ${median(ok.map((x) => x.equalRuns))} runs (planned: 2 rounds): worst error planned ${ok.map((x) => fmtE(x.errorAtEqual.planned)).join(' ')} · even ${ok.map((x) => fmtE(x.errorAtEqual.even)).join(' ')} · random ${ok.map((x) => fmtE(x.errorAtEqual.random)).join(' ')} octave\n`,
    );
  }
  return outcomes;
}

/** One planning round (`datlas plan`) on a store of 1,000 runs: the CLI as a child process, median of 3. */
function runTiming(): Record<string, number> {
  const work = join(root, 'bench/work/plan1000');
  execFileSync(process.execPath, [join(root, 'scripts/build.mjs')], { cwd: root, stdio: 'inherit' });
  const cli = join(root, 'bench/datlas-dist.mjs');
  const store = join(work, 'store');
  const spec = join(work, 'grid.yaml');
  // 20 widths × 5 train sizes × 2 noise levels × 5 seeds = 1,000 runs, 37 logged epochs each.
  const widths = Array.from({ length: 20 }, (_, k) => Math.round(16 * 2 ** (k / 4)));
  const sizes = [50, 100, 150, 200, 300];
  if (!existsSync(join(store, 'manifest.json'))) {
    rmSync(work, { recursive: true, force: true });
    mkdirSync(work, { recursive: true });
    execFileSync(process.execPath, [cli, 'simulate', '--preset', 'quick', '--widths', widths.join(','), '--train-sizes', sizes.join(','), '--label-noise', '0.1,0.2', '--seeds', '5', '--shape', 'csv', '--out', join(work, 'logs'), '--quiet'], { stdio: 'inherit' });
    execFileSync(process.execPath, [cli, 'ingest', join(work, 'logs'), '--store', store, '--quiet']);
    writeFileSync(spec, `axes:\n  width: [${widths}]\n  train_size: [${sizes}]\n  label_noise: [0.1, 0.2]\nseeds: 5\nepochs: ${EPOCHS}\n`);
  }
  const times: number[] = [];
  let runs = 0;
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    const out = execFileSync(process.execPath, [cli, 'plan', '--store', store, '--spec', spec, '--max-runs', '7', '--json', '--quiet'], { encoding: 'utf8' });
    times.push((performance.now() - t0) / 1000);
    runs = (JSON.parse(out) as { runs: unknown[] }).runs.length;
  }
  const med = median(times);
  process.stdout.write(`\nplanning round on a 1,000-run store (37,000 rows): datlas plan --max-runs 7 --json, median of 3: ${med.toFixed(2)} s (runs ${times.map((t) => t.toFixed(2)).join(', ')} s; ${runs} runs proposed; load ${load()})\n`);
  return { seconds: med, proposed: runs };
}

process.stdout.write(`bench:plan on ${cpus().length} cores, load ${load()}\n`);
const started = performance.now();
const results: Record<string, unknown> = { load: loadavg() };
if (only !== 'timing') results.loop = runLoop();
if (only !== 'loop') results.timing = runTiming();
results.seconds = (performance.now() - started) / 1000;
mkdirSync(join(root, 'bench/out'), { recursive: true });
writeFileSync(join(root, 'bench/out/plan-results.json'), JSON.stringify(results, null, 2));
process.stdout.write(`\n${((performance.now() - started) / 1000).toFixed(0)} s in all; load at the end ${load()}; results in bench/out/plan-results.json\n`);
