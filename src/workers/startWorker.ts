import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { dirname, join } from 'node:path';
import type { Worker } from 'node:worker_threads';

/**
 * Starts a worker thread on the module `name` (without extension) beside the caller, whose
 * `import.meta.url` is `base`. From the compiled dist/ (or the bundle, where workers are entries
 * beside the chunks) it loads `<name>.js` directly; from the TypeScript sources (tsx) a small
 * bootstrap registers tsx inside the worker first, since loader hooks of the main thread do not
 * reach worker threads on Node 20. node:worker_threads itself is loaded here, on first use, so
 * commands that never start a worker never pay for it.
 */
export function startWorker(opts: { base: string; name: string }): Worker {
  const { base, name } = opts;
  const requireHere = createRequire(base);
  const { Worker: WorkerThread } = requireHere('node:worker_threads') as typeof import('node:worker_threads');
  if (!base.endsWith('.ts')) return new WorkerThread(new URL(`./${name}.js`, base));
  // The ESM build of tsx's API (its CommonJS build cannot register hooks from a worker).
  const tsxApi = pathToFileURL(join(dirname(requireHere.resolve('tsx/package.json')), 'dist/esm/api/index.mjs')).href;
  const entry = new URL(`./${name}.ts`, base).href;
  const boot = `import(${JSON.stringify(tsxApi)}).then((m) => { m.register(); return import(${JSON.stringify(entry)}); });`;
  return new WorkerThread(boot, { eval: true });
}

/**
 * Stops workers whose results are in hand without waiting for them to go: a worker's teardown
 * (freeing its heap) took ~50 ms after the 1M-row ingest, time the caller need not spend idle.
 * They are unref'd, so the process may exit meanwhile.
 */
export function stopWorkers(pool: readonly Worker[]): void {
  for (const w of pool) {
    w.unref();
    void w.terminate();
  }
}
