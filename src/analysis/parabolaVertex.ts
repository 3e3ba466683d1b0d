/**
 * The x of the vertex of the parabola through three points (x0 < x1 < x2), clipped to [x0, x2].
 * Falls back to x1 when the three points are not strictly concave (no interior maximum).
 */
export function parabolaVertex(x0: number, y0: number, x1: number, y1: number, x2: number, y2: number): number {
  const denom = (x0 - x1) * (x0 - x2) * (x1 - x2);
  const a = (x2 * (y1 - y0) + x1 * (y0 - y2) + x0 * (y2 - y1)) / denom;
  const b = (x2 * x2 * (y0 - y1) + x1 * x1 * (y2 - y0) + x0 * x0 * (y1 - y2)) / denom;
  if (!(a < 0) || !Number.isFinite(a) || !Number.isFinite(b)) return x1;
  const v = -b / (2 * a);
  return Math.min(x2, Math.max(x0, v));
}
