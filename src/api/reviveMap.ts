import type { SeedStats } from '../cells/Cell.js';
import type { SweepMap } from '../grid/SweepMap.js';
import { apiText } from '../messages.js';
import { UserError } from '../UserError.js';

const nan = (v: unknown): number => (v === null || v === undefined ? NaN : (v as number));

function stats(s: SeedStats | null): SeedStats | null {
  if (!s) return s;
  return { ...s, mean: nan(s.mean), median: nan(s.median), sd: nan(s.sd), se: nan(s.se) };
}

/**
 * A map for the analyses: one from buildMap passes through; one read back from a map file
 * (JSON: typed arrays as arrays, NaN as null) gets its NaNs and typed arrays back.
 */
export function reviveMap(input: unknown): SweepMap {
  const m = input as Partial<SweepMap> | null;
  if (!m || typeof m !== 'object' || !Array.isArray(m.cells) || !m.x || !m.y || !m.raster) throw new UserError(apiText.notAMap(m === null ? 'null' : typeof m));
  if (m.raster.value instanceof Float64Array) return m as SweepMap;
  const r = m.raster;
  return {
    ...(m as SweepMap),
    loo: { ...m.loo!, rmse: nan(m.loo!.rmse) },
    cells: m.cells.map((c) => ({
      ...c,
      cell: {
        ...c.cell,
        stats: stats(c.cell.stats)!,
        train: stats(c.cell.train),
        values: c.cell.values.map(nan),
        trainValues: c.cell.trainValues.map(nan),
      },
    })),
    raster: {
      ...r,
      value: Float64Array.from(r.value as unknown as unknown[], nan),
      sd: r.sd ? Float64Array.from(r.sd as unknown as unknown[], nan) : null,
      origin: Uint8Array.from(r.origin as unknown as number[]),
    },
  };
}
