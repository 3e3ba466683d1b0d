import type { Worker } from 'node:worker_threads';
import { startWorker, stopWorkers } from '../workers/startWorker.js';
import type { RowTable } from '../store/RowTable.js';
import { addEvalNoise } from './addEvalNoise.js';
import { concatTables } from './concatTables.js';
import { featuresTask, featuresTasks, resolveFeaturesOptions } from './featuresSweep.js';
import type { FeaturesSweepOptions } from './featuresSweep.js';

/**
 * featuresSweep across worker threads: the (seed, train size) tasks go to `workers` threads,
 * largest first, and the rows come back in the same order as the in-process sweep, so the
 * result is identical apart from the measured wall_seconds.
 */
export async function featuresSweepParallel(opts: FeaturesSweepOptions & { workers: number }): Promise<RowTable> {
  const r = resolveFeaturesOptions(opts);
  const tasks = featuresTasks(r);
  const workers = Math.max(1, Math.min(Math.floor(opts.workers), tasks.length));
  const noisy = (t: RowTable) => (opts.evalNoise ? addEvalNoise(t, opts.evalNoise) : t);
  if (workers === 1) return noisy(concatTables(tasks.map((t) => featuresTask(r, t, opts.onRun))));

  const results: RowTable[] = new Array(tasks.length);
  // Largest train size first: the longest tasks start early and the tail stays short.
  const queue = tasks.map((t, i) => ({ t, i })).sort((a, b) => b.t.trainSize - a.t.trainSize || a.i - b.i);
  const pool = Array.from({ length: workers }, () => startWorker({ base: import.meta.url, name: 'sweepWorker' }));
  try {
    await new Promise<void>((resolve, reject) => {
      let finished = 0;
      let failed = false;
      const feed = (w: Worker) => {
        const next = queue.shift();
        if (next) w.postMessage({ index: next.i, options: r, task: next.t });
      };
      for (const w of pool) {
        w.on('message', (msg: { type: string; index: number; table?: RowTable; message?: string }) => {
          if (msg.type === 'run') opts.onRun?.();
          else if (msg.type === 'done') {
            results[msg.index] = msg.table!;
            if (++finished === tasks.length) resolve();
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
          if (code !== 0 && !failed && finished < tasks.length) {
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
  return noisy(concatTables(results));
}
