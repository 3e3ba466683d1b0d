import type { Cell } from '../cells/Cell.js';
import type { Metric } from '../store/RowTable.js';

export type MapKind = 'model' | 'sample' | 'epoch';
export type AxisScale = 'log2' | 'linear';
export type MethodName = 'linear' | 'thin-plate' | 'gp';

/** The x/y of each kind (DESIGN.md §2). */
export const MAP_AXES: Record<MapKind, { x: string; y: string }> = {
  model: { x: 'width', y: 'epochs' },
  sample: { x: 'train_size', y: 'width' },
  epoch: { x: 'epochs', y: 'train_size' },
};

export interface MapAxis {
  /** Axis name: width, epochs, train_size, label_noise. */
  name: string;
  scale: AxisScale;
  /** Distinct measured values, ascending, in data units. */
  values: number[];
  /** values.length + 1 cell edges in data units (geometric midpoints on log2 axes, arithmetic on linear). */
  edges: number[];
  /** The logs' own column behind the axis when it is not the axis's name (`p_over_n`): titles say so. */
  source?: string;
}

/** A measured cell placed on the map. */
export interface MapCell {
  x: number;
  y: number;
  cell: Cell;
}

/** Regular raster over the transformed plane; row-major: value[j * nx + i] is at (xs[i], ys[j]). */
export interface Raster {
  nx: number;
  ny: number;
  /** Raster coordinates in data units (evenly spaced in transformed space). */
  xs: number[];
  ys: number[];
  /** Interpolated metric; NaN outside the data. */
  value: Float64Array;
  /** Standard deviation of the field (gp only), else null. */
  sd: Float64Array | null;
  /** 0 = outside the data, 1 = interpolated, 2 = inside a measured cell. */
  origin: Uint8Array;
}

export const ORIGIN_OUTSIDE = 0;
export const ORIGIN_INTERPOLATED = 1;
export const ORIGIN_MEASURED = 2;

export interface SweepMap {
  kind: MapKind | 'custom';
  x: MapAxis;
  y: MapAxis;
  metric: Metric;
  /** The values held fixed (axes and condition). */
  fixed: Record<string, number | string>;
  /** Names in `fixed` whose value the tool chose (most data) rather than the user. */
  picked: string[];
  /** Picked names whose value tied on data with others: name → how many levels tied (the largest was taken). */
  pickedTies?: Record<string, number>;
  method: MethodName;
  /** Leave-one-out root-mean-square error of the method used and of every method tried. */
  loo: {
    method: MethodName;
    rmse: number;
    tried: Partial<Record<MethodName, number>>;
    /** Cells the RMSEs average over: those where every tried method could predict without the cell. */
    points?: number;
    /** Methods not tried or not usable, with the reason. */
    skipped?: Partial<Record<MethodName, string>>;
  };
  cells: MapCell[];
  /** Grid points (x value × y value) with no finite data. */
  missing: { x: number; y: number }[];
  /** Grid points where at least one seed diverged. */
  diverged: { x: number; y: number; count: number }[];
  raster: Raster;
  /** Things a reader should know (dropped cells, thinned epochs, heavy tails, fit details). */
  notes?: string[];
  /** The notes (also in `notes`) that describe the interpolator's fit, not the data: analyses of the cells leave them out. */
  fitNotes?: string[];
  /** Fitted parameters of the method used (e.g. Gaussian-process length-scales in normalised units). */
  fit?: Record<string, number>;
  /** The epochs every run was aligned to (when epochs is a map axis or fixed). */
  alignedEpochs?: number[];
}
