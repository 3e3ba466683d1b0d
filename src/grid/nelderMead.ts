export interface NelderMeadOptions {
  /** Initial simplex step per coordinate. */
  step?: number;
  maxEvals?: number;
  /** Stop when the spread of function values in the simplex falls below this. */
  tol?: number;
}

/**
 * Minimises f by the Nelder–Mead simplex method (standard coefficients: reflection 1,
 * expansion 2, contraction ½, shrink ½). Derivative-free, fine for a handful of parameters.
 */
export function nelderMead(f: (x: number[]) => number, x0: number[], opts: NelderMeadOptions = {}): { x: number[]; f: number; evals: number } {
  const { step = 0.5, maxEvals = 200, tol = 1e-6 } = opts;
  const d = x0.length;
  let evals = 0;
  const fv = (x: number[]) => {
    evals++;
    const v = f(x);
    return Number.isFinite(v) ? v : Infinity;
  };
  let simplex = [x0, ...x0.map((_, k) => x0.map((v, j) => (j === k ? v + step : v)))].map((x) => ({ x, f: fv(x) }));
  const comb = (a: number[], b: number[], t: number) => a.map((v, k) => v + t * (b[k] - v));
  while (evals < maxEvals) {
    simplex.sort((a, b) => a.f - b.f);
    const best = simplex[0];
    const worst = simplex[d];
    if (Math.abs(worst.f - best.f) < tol) break;
    const centroid = x0.map((_, k) => simplex.slice(0, d).reduce((s, p) => s + p.x[k], 0) / d);
    const xr = comb(centroid, worst.x, -1);
    const fr = fv(xr);
    if (fr < best.f) {
      const xe = comb(centroid, worst.x, -2);
      const fe = fv(xe);
      simplex[d] = fe < fr ? { x: xe, f: fe } : { x: xr, f: fr };
    } else if (fr < simplex[d - 1].f) {
      simplex[d] = { x: xr, f: fr };
    } else {
      const outside = fr < worst.f;
      const xc = comb(centroid, outside ? xr : worst.x, 0.5);
      const fc = fv(xc);
      if (fc < (outside ? fr : worst.f)) simplex[d] = { x: xc, f: fc };
      else simplex = simplex.map((p, k) => (k === 0 ? p : { x: comb(best.x, p.x, 0.5), f: fv(comb(best.x, p.x, 0.5)) }));
    }
  }
  simplex.sort((a, b) => a.f - b.f);
  return { x: simplex[0].x, f: simplex[0].f, evals };
}
