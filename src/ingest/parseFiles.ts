import { availableParallelism } from 'node:os';
import { startWorker, stopWorkers } from '../workers/startWorker.js';
import { readSourceFile, unpackTable } from './readSourceFile.js';
import type { FileJob, FileOutcome } from './readSourceFile.js';
import type { PackedOutcome } from './parseWorker.js';
import type { RowTable } from '../store/RowTable.js';

export interface ParseFilesOptions {
  /** Worker threads; default: one per core (at most 4) when the work is big enough. */
  workers?: number;
  /** Below this many bytes in total the files are read on this thread (workers cost ~50 ms to start). */
  minBytesForWorkers?: number;
  /** Called once per finished file. */
  onFile?: () => void;
}

/**
 * Reads and normalises files, on worker threads when there is enough work: each worker takes
 * batches of files from a shared queue, so large and small files balance across cores.
 * Results come back in job order.
 */
export async function parseFiles(jobs: FileJob[], sizes: number[], opts: ParseFilesOptions = {}): Promise<FileOutcome[]> {
  const total = sizes.reduce((a, b) => a + b, 0);
  const { minBytesForWorkers = 16 * 1024 * 1024, onFile } = opts;
  const workers = Math.min(opts.workers ?? Math.min(4, availableParallelism()), jobs.length);
  if (workers <= 1 || total < minBytesForWorkers) {
    return jobs.map((j) => {
      const o = readSourceFile(j);
      onFile?.();
      return o;
    });
  }
  const pool = Array.from({ length: workers }, () => startWorker({ base: import.meta.url, name: 'parseWorker' }));
  const results = new Array<FileOutcome>(jobs.length);
  // Batches of about 4 MB or 64 files keep messages few without starving a worker at the end.
  const batches: number[][] = [];
  let cur: number[] = [];
  let bytes = 0;
  const target = Math.max(256 * 1024, Math.min(4 * 1024 * 1024, total / (workers * 8)));
  jobs.forEach((_, i) => {
    cur.push(i);
    bytes += sizes[i];
    if (bytes >= target || cur.length >= 64) {
      batches.push(cur);
      cur = [];
      bytes = 0;
    }
  });
  if (cur.length) batches.push(cur);
  let next = 0;
  try {
    await Promise.all(
      pool.map(
        (w) =>
          new Promise<void>((resolve, reject) => {
            let current: number[] = [];
            const send = () => {
              if (next >= batches.length) {
                resolve();
                return;
              }
              current = batches[next++];
              w.postMessage({ id: 0, jobs: current.map((i) => jobs[i]) });
            };
            w.on('message', (msg: { outs: PackedOutcome[] }) => {
              msg.outs.forEach((o, k) => {
                // In place: the message's objects are ours, and spreading a deserialised object
                // costs ~25 µs (the manifest step spent 50 ms on 2,000 of them).
                if (o.kind === 'parsed') (o.norm as unknown as { table: RowTable }).table = unpackTable(o.norm!.table);
                results[current[k]] = o as FileOutcome;
                onFile?.();
              });
              send();
            });
            w.on('error', reject);
            send();
          }),
      ),
    );
  } finally {
    stopWorkers(pool);
  }
  return results;
}
