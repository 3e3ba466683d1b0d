import type { AxisScale } from '../grid/SweepMap.js';

/** Forward and inverse maps between data units and the transformed axis the analysis works in. */
export interface AxisTransform {
  to: (v: number) => number;
  from: (u: number) => number;
}

/** log2 for geometric axes, identity for linear ones (MapAxis.scale). */
export function axisTransform(scale: AxisScale): AxisTransform {
  return scale === 'log2' ? { to: Math.log2, from: (u) => 2 ** u } : { to: (v) => v, from: (u) => u };
}
