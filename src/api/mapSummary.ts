import type { SweepMap } from '../grid/SweepMap.js';

/** What `datlas map --json` prints (docs/schemas/map-summary.schema.json): the map's axes, choices, fit and counts, and the files written. */
export interface MapSummary {
  map: SweepMap['kind'];
  x: { name: string; scale: SweepMap['x']['scale']; values: number[] };
  y: { name: string; scale: SweepMap['y']['scale']; values: number[] };
  metric: SweepMap['metric'];
  fixed: SweepMap['fixed'];
  picked: string[];
  method: SweepMap['method'];
  loo: SweepMap['loo'];
  cells: { measured: number; missing: number; diverged: number };
  /** Seeds per measured cell. */
  seeds: { min: number; median: number; max: number } | null;
  /** Rows of the ridge, and how many hold a peak; null when the ridge was not located. */
  ridge: { total: number; withPeak: number } | null;
  notes: string[];
  files: string[];
}

/** The summary of a map and the files written from it (shared by `datlas map --json` and scripts). */
export function mapSummary(map: SweepMap, ridgeRows: { total: number; withPeak: number } | null, files: string[]): MapSummary {
  const measured = map.cells.filter((c) => c.cell.stats.n > 0).map((c) => c.cell.stats.n).sort((a, b) => a - b);
  return {
    map: map.kind,
    x: { name: map.x.name, scale: map.x.scale, values: map.x.values },
    y: { name: map.y.name, scale: map.y.scale, values: map.y.values },
    metric: map.metric,
    fixed: map.fixed,
    picked: map.picked,
    method: map.method,
    loo: map.loo,
    cells: { measured: measured.length, missing: map.missing.length, diverged: map.diverged.length },
    seeds: measured.length ? { min: measured[0], median: measured[Math.floor(measured.length / 2)], max: measured[measured.length - 1] } : null,
    ridge: ridgeRows,
    notes: map.notes ?? [],
    files,
  };
}
