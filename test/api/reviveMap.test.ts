import { describe, expect, it } from 'vitest';
import { buildMap } from '../../src/api/buildMap.js';
import { findRidge } from '../../src/api/findRidge.js';
import { reviveMap } from '../../src/api/reviveMap.js';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import type { RowRecord } from '../../src/store/tableFromRows.js';
import { UserError } from '../../src/UserError.js';

// Invented single-seed sweep (fixture): a bump in test error at width 32 over a falling curve,
// so cells have one seed (sd, se null in the file) and the ridge takes its noise from the curve.
function sweep(): Partial<RowRecord>[] {
  const rows: Partial<RowRecord>[] = [];
  for (let k = 0; k < 11; k++) {
    const w = 2 ** (2 + k / 2);
    const u = Math.log2(w);
    for (const e of [10, 100, 1000]) {
      const wiggle = 0.004 * Math.sin(7 * k + e);
      const te = 0.5 - 0.03 * u + (e / 1000) * 0.15 * Math.exp(-((u - 5) ** 2)) + wiggle;
      rows.push({ run: `w${w}`, seed: 0, width: w, epochs: e, train_size: 500, test_error: te, train_error: Math.max(0, 0.3 - 0.05 * u) });
    }
  }
  return rows;
}

describe('a map read back from its file', () => {
  it('gives the same ridge as the map itself, one-seed cells (null sd in the file) included', async () => {
    const map = await buildMap(tableFromRows(sweep()), { kind: 'model', method: 'linear', ridge: false });
    const file = JSON.parse(JSON.stringify(map)) as { cells: { cell: { stats: { sd: unknown } } }[] };
    expect(file.cells[0].cell.stats.sd).toBeNull();
    const again = reviveMap(file);
    expect(Number.isNaN(again.cells[0].cell.stats.sd)).toBe(true);
    expect(again.raster.value).toBeInstanceOf(Float64Array);
    expect(findRidge(file)).toEqual(findRidge(map));
  });

  it('refuses what is not a map', () => {
    expect(() => reviveMap({ rows: [] })).toThrow(UserError);
    expect(() => findRidge(null as never)).toThrow(/expected a map/);
  });
});
