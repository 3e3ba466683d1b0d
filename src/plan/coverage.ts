import type { RowTable } from '../store/RowTable.js';
import { sameValue, specRuns } from './SweepSpec.js';
import type { SpecRun, SweepSpec } from './SweepSpec.js';
import { storeRuns } from './storeRuns.js';
import type { StoreRun } from './storeRuns.js';

export const COVERAGE_STATUS = ['complete', 'partial', 'missing', 'diverged'] as const;
export type CoverageStatus = (typeof COVERAGE_STATUS)[number];

/** A planned run and what the store holds for it. */
export interface CoverageRun extends SpecRun {
  status: CoverageStatus;
  /** Last logged epoch of the matching store run; null when missing. */
  epoch: number | null;
  /** Run id of the matching store run; null when missing. */
  run: string | null;
  /** The store run itself (for cost and resume); null when missing. */
  stored: StoreRun | null;
}

/** A store run that matches no planned run (its configuration as the store summary has it). */
export interface ExtraRun extends Pick<StoreRun, 'run' | 'condition' | 'label_noise' | 'width' | 'train_size' | 'seed'> {
  epoch: number;
  status: Exclude<CoverageStatus, 'missing'>;
  /** Which part of the configuration is outside the spec. */
  outside: string[];
}

export interface CoverageResult {
  epochs: number;
  counts: Record<CoverageStatus, number>;
  runs: CoverageRun[];
  extra: ExtraRun[];
  /** Store runs that matched a planned run already matched by a better run (re-launches). */
  superseded: number;
}

function runStatus(r: StoreRun, target: number): Exclude<CoverageStatus, 'missing'> {
  if (r.diverged) return 'diverged';
  // Logged epochs are often printed with few digits: a hair under the target still counts.
  return r.lastEpoch >= target * (1 - 1e-9) ? 'complete' : 'partial';
}

const RANK: Record<CoverageStatus, number> = { complete: 3, partial: 2, diverged: 1, missing: 0 };

function indexOf(values: readonly number[], v: number): number {
  for (let i = 0; i < values.length; i++) if (sameValue(values[i], v)) return i;
  return -1;
}

/**
 * Coverage of a spec by a store (DESIGN.md §5): per planned run (configuration and seed)
 * complete, partial (last logged epoch before the target), missing or diverged; store runs
 * outside the spec are listed as extra. When several store runs match one planned run the
 * best counts (complete, then the furthest partial, then diverged).
 */
export function coverage(table: RowTable, spec: SweepSpec): CoverageResult {
  const planned = specRuns(spec);
  const { width, train_size, label_noise } = spec.axes;
  const nW = width.length, nN = train_size.length, nL = label_noise.length, nS = spec.seeds.length;
  // specRuns order: condition, noise, train size, width, seed.
  const slot = (c: number, l: number, n: number, w: number, s: number) => ((((c * nL + l) * nN + n) * nW + w) * nS + s);
  const best: (StoreRun | null)[] = new Array(planned.length).fill(null);
  const extra: ExtraRun[] = [];
  let superseded = 0;
  for (const r of storeRuns(table)) {
    const idx = {
      condition: spec.conditions.indexOf(r.condition),
      label_noise: indexOf(label_noise, r.label_noise),
      train_size: indexOf(train_size, r.train_size),
      width: indexOf(width, r.width),
      seed: spec.seeds.indexOf(r.seed),
    };
    const outside = Object.entries(idx)
      .filter(([, i]) => i < 0)
      .map(([k]) => k);
    const status = runStatus(r, spec.epochs);
    if (outside.length > 0) {
      extra.push({
        run: r.run,
        condition: r.condition,
        label_noise: r.label_noise,
        width: r.width,
        train_size: r.train_size,
        seed: r.seed,
        epoch: r.lastEpoch,
        status,
        outside,
      });
      continue;
    }
    const k = slot(idx.condition, idx.label_noise, idx.train_size, idx.width, idx.seed);
    const prev = best[k];
    if (prev) {
      superseded++;
      const ps = runStatus(prev, spec.epochs);
      const better = RANK[status] > RANK[ps] || (RANK[status] === RANK[ps] && r.lastEpoch > prev.lastEpoch);
      if (!better) continue;
    }
    best[k] = r;
  }
  const counts: Record<CoverageStatus, number> = { complete: 0, partial: 0, missing: 0, diverged: 0 };
  const runs: CoverageRun[] = planned.map((p, k) => {
    const r = best[k];
    const status: CoverageStatus = r ? runStatus(r, spec.epochs) : 'missing';
    counts[status]++;
    return { ...p, status, epoch: r ? r.lastEpoch : null, run: r ? r.run : null, stored: r };
  });
  return { epochs: spec.epochs, counts, runs, extra, superseded };
}
