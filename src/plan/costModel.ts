import type { StoreRun } from './storeRuns.js';

/** Cost of a run: c · width^a · train_size · epochs (DESIGN.md §5). */
export interface CostModel {
  a: number;
  c: number;
  /** 'seconds' when c was fitted from logged wall time, else 'relative' (1 = one run of `reference`). */
  units: 'seconds' | 'relative';
  /** Whether `a` came from the data (needs runs at two or more widths). */
  exponentFitted: boolean;
  /** Runs with wall time used in the fit. */
  runs: number;
  /** Standard error of `a` (null when not fitted or too few runs). */
  aSe: number | null;
  /** Residual standard deviation of log cost (natural log); exp(spread) is the typical factor a run's cost is off by. */
  spread: number | null;
}

export interface CostConfig {
  width: number;
  train_size: number;
  epochs: number;
}

/** Cost of one run of `epochs` epochs under a model. */
export function runCost(model: CostModel, cfg: CostConfig): number {
  return model.c * Math.pow(cfg.width, model.a) * cfg.train_size * cfg.epochs;
}

/**
 * Fits the cost model from the runs' last logged cumulative wall time by least squares in log
 * space: log(wall / (n · epochs)) = log c + a · log width. Without wall time, a = defaultExponent
 * (2: compute of a convolutional layer grows with the square of its channel count, common
 * practice) and costs are relative, 1 being one run of `reference`.
 */
export function fitCostModel(opts: { runs: readonly StoreRun[]; reference: CostConfig; defaultExponent?: number }): CostModel {
  const { runs, reference, defaultExponent = 2 } = opts;
  const xs: number[] = [];
  const ys: number[] = [];
  for (const r of runs) {
    if (!(r.wallSeconds > 0 && r.wallEpoch > 0 && r.width > 0 && r.train_size > 0)) continue;
    xs.push(Math.log(r.width));
    ys.push(Math.log(r.wallSeconds) - Math.log(r.train_size * r.wallEpoch));
  }
  const m = xs.length;
  if (m === 0) {
    const a = defaultExponent;
    const c = 1 / (Math.pow(reference.width, a) * reference.train_size * reference.epochs);
    return { a, c, units: 'relative', exponentFitted: false, runs: 0, aSe: null, spread: null };
  }
  const mx = xs.reduce((s, v) => s + v, 0) / m;
  const my = ys.reduce((s, v) => s + v, 0) / m;
  let sxx = 0, sxy = 0;
  for (let i = 0; i < m; i++) {
    sxx += (xs[i] - mx) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
  }
  // Two distinct widths at least (sxx > 0 relative to the spread of log widths) to fit a.
  const exponentFitted = m >= 3 && sxx > 1e-12 * m;
  const a = exponentFitted ? sxy / sxx : defaultExponent;
  const logC = my - a * mx;
  let ssr = 0;
  for (let i = 0; i < m; i++) ssr += (ys[i] - logC - a * xs[i]) ** 2;
  const dof = m - (exponentFitted ? 2 : 1);
  const spread = dof > 0 ? Math.sqrt(ssr / dof) : null;
  const aSe = exponentFitted && spread !== null ? spread / Math.sqrt(sxx) : null;
  return { a, c: Math.exp(logC), units: 'seconds', exponentFitted, runs: m, aSe, spread };
}
