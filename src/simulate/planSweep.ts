import type { PlanCsvRun } from '../plan/parsePlanCsv.js';
import type { RowTable } from '../store/RowTable.js';
import { selectRows } from '../store/selectRows.js';
import { concatTables } from './concatTables.js';
import { epochGrid } from './epochGrid.js';
import { featuresTask, resolveFeaturesOptions } from './featuresSweep.js';
import type { FeaturesSweepOptions } from './featuresSweep.js';
import type { FeaturesJob } from './parallelSweep.js';

/** The simulator's own id for a run, the one `simulate` gives it (featuresTask). */
export function simulatedRunId(prefix: string, r: Pick<PlanCsvRun, 'seed' | 'train_size' | 'width' | 'label_noise'>): string {
  return `${prefix}-s${r.seed}-n${r.train_size}-w${r.width}-q${r.label_noise}`;
}

/**
 * The simulation work behind a plan: one job per (seed, train size, target epochs), holding
 * every width and noise level planned there. The simulator draws each stream sequentially
 * (widths, train sizes and noise flips are nested within a seed, featuresSweep), so a run
 * computed inside a job is the run `simulate` would have produced in any sweep holding it.
 */
export function planJobs(opts: { runs: readonly PlanCsvRun[]; preset: FeaturesSweepOptions }): FeaturesJob[] {
  const { runs, preset } = opts;
  const groups = new Map<string, PlanCsvRun[]>();
  for (const r of runs) {
    const k = `${r.seed}\u0000${r.train_size}\u0000${r.epochs}`;
    const list = groups.get(k);
    if (list) list.push(r);
    else groups.set(k, [r]);
  }
  return [...groups.values()].map((g) => {
    const { seed, train_size, epochs } = g[0];
    const options = resolveFeaturesOptions({
      ...preset,
      seeds: [seed],
      trainSizes: [train_size],
      widths: [...new Set(g.map((r) => r.width))],
      labelNoise: [...new Set(g.map((r) => r.label_noise))],
      // The preset's log-spaced epochs up to the planned target (always logged itself).
      epochs: epochGrid({ max: epochs, perDecade: preset.epochsPerDecade ?? 6 }),
    });
    return { options, task: { seed, trainSize: train_size } };
  });
}

/**
 * Keeps, from the jobs' tables, exactly the planned runs: each (width, noise) planned in its
 * job, renamed to the plan's run id (the simulator's id when the plan leaves it empty), with
 * the planned condition, and for a resumed run only the epochs after `resume_from` — the
 * continuation of its logged curve, which the closed-form trajectory gives exactly.
 */
export function planRows(opts: { runs: readonly PlanCsvRun[]; jobs: readonly FeaturesJob[]; tables: readonly RowTable[] }): RowTable {
  const { runs, jobs, tables } = opts;
  const want = new Map<string, PlanCsvRun>();
  for (const r of runs) want.set(`${r.seed}\u0000${r.train_size}\u0000${r.epochs}\u0000${r.width}\u0000${r.label_noise}`, r);
  const pieces: RowTable[] = [];
  tables.forEach((t, j) => {
    const epochs = jobs[j].options.epochs.at(-1)!;
    const keep: number[] = [];
    const planned: PlanCsvRun[] = [];
    for (let i = 0; i < t.length; i++) {
      const r = want.get(`${t.seed[i]}\u0000${t.train_size[i]}\u0000${epochs}\u0000${t.width[i]}\u0000${t.label_noise[i]}`);
      if (!r || (r.resume_from !== null && !(t.epochs[i] > r.resume_from))) continue;
      keep.push(i);
      planned.push(r);
    }
    const s = selectRows(t, keep);
    const prefix = jobs[j].options.runPrefix;
    planned.forEach((r, k) => {
      s.run[k] = r.run !== '' ? r.run : simulatedRunId(prefix, r);
      s.condition[k] = r.condition;
    });
    pieces.push(s);
  });
  return concatTables(pieces);
}

/** In-process simulation of a plan (tests, bench); the CLI runs the same jobs across worker threads. */
export function planSweep(opts: { runs: readonly PlanCsvRun[]; preset: FeaturesSweepOptions }): RowTable {
  const jobs = planJobs(opts);
  return planRows({ runs: opts.runs, jobs, tables: jobs.map((j) => featuresTask(j.options, j.task)) });
}
