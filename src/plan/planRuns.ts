import { planText as msg } from '../messages.js';
import { runCost } from './costModel.js';
import type { CostModel } from './costModel.js';
import type { CoverageResult } from './coverage.js';
import type { PlannedRun, PlanResult } from './Plan.js';
import type { Candidate } from './refine.js';
import { runId } from './runId.js';
import type { SweepSpec } from './SweepSpec.js';

export interface PlanOptions {
  spec: SweepSpec;
  coverage: CoverageResult;
  model: CostModel;
  /** Refinement and extra-seed proposals (proposeRefinements); none by default. */
  candidates?: Candidate[];
  /** Cost cap in the model's units; null or undefined: no cap. */
  budget?: number | null;
  /**
   * Cap on the number of runs; null or undefined: no cap. With a run cap and no budget, launch
   * slots are what is scarce, so refinement ranks by value per run instead of value per cost.
   */
  maxRuns?: number | null;
  /** Whether partial runs can resume from their last epoch (the command template has {resume_from}); default true. */
  resume?: boolean;
  /** Re-launch diverged runs (default true; they count as missing results). */
  rerunDiverged?: boolean;
}

/**
 * The next runs (DESIGN.md §5): first the gaps of the coverage (missing runs, partial runs
 * resumed or restarted, diverged runs re-launched), cheapest first; then refinement and
 * extra-seed groups by value per cost (by value per run under a run cap alone). Walking that
 * order, a run (or a whole group) is kept when it still fits the budget and the run cap, else
 * dropped, so cheaper later items can use what is left; of a group of extra seeds, as many as fit.
 */
export function planRuns(opts: PlanOptions): PlanResult {
  const { spec, coverage, model, candidates = [], budget = null, maxRuns = null, resume = true, rerunDiverged = true } = opts;
  const perRun = maxRuns !== null && budget === null;
  const notes: string[] = [];
  const gaps: PlannedRun[] = [];
  for (const r of coverage.runs) {
    if (r.status === 'complete') continue;
    if (r.status === 'diverged' && !rerunDiverged) continue;
    const cfg = { condition: r.condition, label_noise: r.label_noise, width: r.width, train_size: r.train_size, seed: r.seed };
    const canResume = r.status === 'partial' && resume && r.epoch !== null && r.epoch > 0;
    const epochsToRun = canResume ? spec.epochs - r.epoch! : spec.epochs;
    const cost = runCost(model, { width: r.width, train_size: r.train_size, epochs: epochsToRun });
    gaps.push({
      ...cfg,
      epochs: spec.epochs,
      reason: canResume ? 'resume' : 'missing',
      cost,
      resume_from: canResume ? r.epoch : null,
      run: r.run ?? runId(cfg),
      status: r.status,
      score: 1 / cost,
      why: msg.whyGap(r.status, r.epoch, spec.epochs, canResume),
    });
  }
  gaps.sort((a, b) => a.cost - b.cost);
  const diverged = coverage.counts.diverged;
  if (diverged > 0) notes.push(rerunDiverged ? msg.noteDivergedRerun(diverged) : msg.noteDivergedSkipped(diverged));
  if (!resume && coverage.counts.partial > 0) notes.push(msg.noteNoResume(coverage.counts.partial));

  const groups = candidates.map((c) => {
    const runs: PlannedRun[] = c.runs.map((r) => {
      const epochs = r.epochs ?? spec.epochs;
      const from = r.resume_from ?? null;
      const cost = runCost(model, { width: r.width, train_size: r.train_size, epochs: epochs - (from ?? 0) });
      const cfg = { condition: r.condition, label_noise: r.label_noise, width: r.width, train_size: r.train_size, seed: r.seed };
      return { ...cfg, epochs, reason: c.reason, cost, resume_from: from, run: r.run ?? runId(cfg), status: 'new' as const, score: 0, why: c.why, sharpens: [c.sharpens, ...(c.also ?? [])].join(' ') };
    });
    const cost = runs.reduce((s, r) => s + r.cost, 0);
    const score = perRun ? c.value / runs.length : c.value / cost;
    for (const r of runs) r.score = score;
    return { runs, cost, score, divisible: c.reason === 'seeds' };
  });
  groups.sort((a, b) => b.score - a.score);

  const kept: PlannedRun[] = [];
  let total = 0;
  const dropped = { runs: 0, cost: 0 };
  const fits = (cost: number, runs = 1) => (budget === null || total + cost <= budget * (1 + 1e-12)) && (maxRuns === null || kept.length + runs <= maxRuns);
  for (const g of gaps) {
    if (fits(g.cost)) {
      kept.push(g);
      total += g.cost;
    } else {
      dropped.runs++;
      dropped.cost += g.cost;
    }
  }
  for (const g of groups) {
    if (fits(g.cost, g.runs.length)) {
      kept.push(...g.runs);
      total += g.cost;
      continue;
    }
    // Extra seeds add up one by one: as many of a seeds group as still fit (a new width or a
    // resumed cell stays whole).
    let taken = 0;
    if (g.divisible)
      for (const r of g.runs) {
        if (!fits(r.cost, 1)) break;
        kept.push(r);
        total += r.cost;
        taken++;
      }
    for (const r of g.runs.slice(taken)) {
      dropped.runs++;
      dropped.cost += r.cost;
    }
  }
  return { budget, maxRuns, cost: total, model, runs: kept, dropped, notes };
}
