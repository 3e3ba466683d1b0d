/**
 * Gradient descent from zero on a least-squares loss with Hessian eigenvalue λ and step η
 * reaches, after t steps, the fraction g·λ of the least-squares solution along that
 * eigenvector, with g = (1 − (1 − ηλ)^t)/λ (REFERENCES §3).
 *
 * The naive formula loses every digit when ηλ is tiny (1 − ηλ rounds to 1) — exactly the
 * eigenvalues near the interpolation threshold that make the peak — so it is evaluated as
 * g = −expm1(t·log1p(−ηλ))/λ, with ηλ clipped to [0, 1] and g = ηt for λ <= 0 (REFERENCES §7).
 */
export function gdFilter(lambda: number, eta: number, t: number): number {
  if (!(lambda > 0)) return eta * t;
  const x = Math.min(eta * lambda, 1);
  return -Math.expm1(t * Math.log1p(-x)) / lambda;
}
