import type { SpecRun } from './SweepSpec.js';

/** A run id for a new run: readable, file-name safe (condition, width, train size, noise, seed). */
export function runId(r: SpecRun): string {
  const cond = r.condition.replace(/[^A-Za-z0-9._-]+/g, '_').replace(/^[-_]+|[-_]+$/g, '');
  return [cond, `w${r.width}`, `n${r.train_size}`, `ln${r.label_noise}`, `s${r.seed}`].filter((p) => p !== '').join('-');
}
