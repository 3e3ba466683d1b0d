import type { RidgeResult } from '../analysis/Ridge.js';
import type { SweepMap } from '../grid/SweepMap.js';

/** `datlas ridge --json`: the ridge (DESIGN.md §6) plus the values the tool picked and the map's notes. */
export type RidgeJson = RidgeResult & { picked: string[]; notes: string[] };

/**
 * The ridge with the map's picked values and its notes about the data (shared by the CLI's --json
 * and the library's findRidge). The ridge reads the measured cells only, so notes on the
 * interpolator's fit are left out: the ridge is the same whichever method drew the map.
 */
export function ridgeJson(r: RidgeResult, map: Pick<SweepMap, 'picked' | 'notes' | 'fitNotes'>): RidgeJson {
  const fit = new Set(map.fitNotes ?? []);
  return { ...r, picked: map.picked, notes: (map.notes ?? []).filter((n) => !fit.has(n)) };
}
