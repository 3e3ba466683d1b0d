/**
 * Worker-thread entry: runs featuresTask for each task message and posts the rows back.
 * Messages in: { index, options, task }. Out: { type: 'run' } per finished run,
 * { type: 'done', index, table } per task, { type: 'error', index, message } on failure.
 */
import { parentPort } from 'node:worker_threads';
import { featuresTask } from './featuresSweep.js';
import type { FeaturesTask, ResolvedFeaturesOptions } from './featuresSweep.js';

const port = parentPort;
if (!port) throw new Error('sweepWorker must run in a worker thread');
port.on('message', (msg: { index: number; options: ResolvedFeaturesOptions; task: FeaturesTask }) => {
  try {
    const table = featuresTask(msg.options, msg.task, () => port.postMessage({ type: 'run' }));
    port.postMessage({ type: 'done', index: msg.index, table });
  } catch (err) {
    port.postMessage({ type: 'error', index: msg.index, message: (err as Error)?.message ?? String(err) });
  }
});
