import type { Worker } from 'node:worker_threads';
import { startWorker, stopWorkers } from '../workers/startWorker.js';
import type { RowTable } from '../store/RowTable.js';
import { addEvalNoise } from './addEvalNoise.js';
import { concatTables } from './concatTables.js';
import { featuresTask, featuresTasks, resolveFeaturesOptions } from './featuresSweep.js';
import type { FeaturesSweepOptions, FeaturesTask, ResolvedFeaturesOptions } from './featuresSweep.js';

/**
 * featuresSweep across worker threads: the (seed, train size) tasks go to `workers` threads,
 * largest first, and the rows come back in the same order as the in-process sweep, so the
 * result is identical apart from the measured wall_seconds.
 */
export async function featuresSweepParallel(opts: FeaturesSweepOptions & { workers: number }): Promise<RowTable> {
  const r = resolveFeaturesOptions(opts);
  const t = concatTables(await featuresJobsParallel({ jobs: featuresTasks(r).map((task) => ({ options: r, task })), workers: opts.workers, onRun: opts.onRun }));
  return opts.evalNoise ? addEvalNoise(t, opts.evalNoise) : t;
}

/** One unit of simulation work: a (seed, train size) task under its own options. */
export interface FeaturesJob {
  options: ResolvedFeaturesOptions;
  task: FeaturesTask;
}

/**
 * Runs featuresTask for each job across `workers` threads, largest train size first; the tables
 * come back in job order (identical to running them in-process, apart from wall_seconds).
 */
export async function featuresJobsParallel(opts: { jobs: readonly FeaturesJob[]; workers: number; onRun?: () => void }): Promise<RowTable[]> {
  const { jobs } = opts;
  const workers = Math.max(1, Math.min(Math.floor(opts.workers), jobs.length));
  if (workers === 1) return jobs.map((j) => featuresTask(j.options, j.task, opts.onRun));

  const results: RowTable[] = new Array(jobs.length);
  // Largest train size first: the longest tasks start early and the tail stays short.
  const queue = jobs.map((j, i) => ({ j, i })).sort((a, b) => b.j.task.trainSize - a.j.task.trainSize || a.i - b.i);
  const pool = Array.from({ length: workers }, () => startWorker({ base: import.meta.url, name: 'sweepWorker' }));
  try {
    await new Promise<void>((resolve, reject) => {
      let finished = 0;
      let failed = false;
      const feed = (w: Worker) => {
        const next = queue.shift();
        if (next) w.postMessage({ index: next.i, options: next.j.options, task: next.j.task });
      };
      for (const w of pool) {
        w.on('message', (msg: { type: string; index: number; table?: RowTable; message?: string }) => {
          if (msg.type === 'run') opts.onRun?.();
          else if (msg.type === 'done') {
            results[msg.index] = msg.table!;
            if (++finished === jobs.length) resolve();
            else feed(w);
          } else if (msg.type === 'error' && !failed) {
            failed = true;
            reject(new Error(msg.message));
          }
        });
        w.on('error', (err) => {
          if (!failed) {
            failed = true;
            reject(err);
          }
        });
        w.on('exit', (code) => {
          if (code !== 0 && !failed && finished < jobs.length) {
            failed = true;
            reject(new Error(`simulation worker stopped with exit code ${code}`));
          }
        });
        feed(w);
      }
    });
  } finally {
    stopWorkers(pool);
  }
  return results;
}
