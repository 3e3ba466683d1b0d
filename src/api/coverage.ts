import { coverage as coverageOf } from '../plan/coverage.js';
import type { CoverageResult, CoverageRun, ExtraRun } from '../plan/coverage.js';
import type { SweepSpec } from '../plan/SweepSpec.js';
import { rowsOf } from './rowsOf.js';
import type { RowsInput } from './rowsOf.js';
import { specOf } from './specOf.js';
import type { SpecInput } from './specOf.js';

/** `datlas coverage --json` (DESIGN.md §6). */
export interface CoverageJson {
  spec: string;
  epochs: number;
  counts: CoverageResult['counts'];
  runs: (Pick<CoverageRun, 'condition' | 'width' | 'train_size' | 'label_noise' | 'seed' | 'status' | 'epoch' | 'run'>)[];
  extra: ExtraRun[];
  superseded: number;
}

/** The coverage as JSON (shared by the CLI's --json and the library). */
export function coverageJson(cov: CoverageResult, spec: SweepSpec): CoverageJson {
  return {
    spec: spec.file,
    epochs: spec.epochs,
    counts: cov.counts,
    runs: cov.runs.map((r) => ({
      condition: r.condition,
      width: r.width,
      train_size: r.train_size,
      label_noise: r.label_noise,
      seed: r.seed,
      status: r.status,
      epoch: r.epoch,
      run: r.run,
    })),
    extra: cov.extra,
    superseded: cov.superseded,
  };
}

/** Per planned run and seed: complete, partial (stopped before the target epochs), missing or diverged, as `datlas coverage --json`. */
export function coverage(rows: RowsInput, spec: SpecInput): CoverageJson {
  const s = specOf(spec);
  return coverageJson(coverageOf(rowsOf(rows), s), s);
}
