// A script using the library as a user would: imported by the package name, so the types come
// from the declarations tsc wrote to dist/ through package.json "exports". test/api/types.test.ts
// type-checks it; each @ts-expect-error below must be an error, so the types are not `any`.
import { buildMap, coverage, describe, findHurts, findRidge, ingest, openStore, planRuns, renderMap, simulate, UserError } from 'descent-atlas';
import type { DescribeResult, IngestSummary, MapObject, RidgeJson, Store } from 'descent-atlas';
import type { ColumnTable } from 'arquero';

export async function pipeline(): Promise<number> {
  const counts: IngestSummary = await ingest(['runs/'], { store: 'st', set: { label_noise: 0.2 }, keys: ['seed', 'label_noise'], quiet: true });
  const n: number = counts.read - counts.accepted - counts.duplicates - counts.rejected - counts.pending - counts.skipped;
  const store: Store = await openStore('st');
  const table: ColumnTable = store.toArquero();
  const wide = table.filter((d: { width: number }) => d.width > 64);
  const d: DescribeResult = await describe(store);
  const widths: number[] = d.axes.width;
  const map: MapObject = await buildMap(wide, { kind: 'model', at: { label_noise: 0.2 }, method: 'linear', metric: 'test_error' });
  const ridge: RidgeJson = findRidge(map);
  const peaks = ridge.rows.map((r) => (r.peak ? r.peak.x - r.peak.low : null));
  const hurts = findHurts(store, { at: { width: 64 } });
  const onsets: number[] = hurts.segments.map((s) => s.onset);
  const cov = coverage(table, { axes: { width: [4, 8], train_size: [1000] }, seeds: 3, epochs: 100 });
  const missing: number = cov.counts.missing;
  const plan = planRuns(store, { spec: 'sweep.yaml', budget: '48h' });
  const reasons: string[] = plan.runs.map((r) => r.reason);
  const { files } = await renderMap(map, { out: 'maps', formats: ['png', 'svg'] });
  const sim = await simulate({ preset: 'quick', out: 'sim', shape: 'jsonl' });
  const origin: Uint8Array = map.raster.origin;
  const codes: Record<string, string> = map.raster.originCodes;

  // @ts-expect-error ingest takes paths first, options second
  await ingest({ store: 'st' });
  // @ts-expect-error a map kind is model, sample or epoch
  await buildMap(store, { kind: 'width' });
  // @ts-expect-error a peak's x is a number
  const bad: string = ridge.rows[0].peak!.x;
  // @ts-expect-error the row count is a number
  const rows: string = store.rows;
  // @ts-expect-error rows are a store, an arquero table or a RowTable
  findHurts('st');

  try {
    await openStore('missing');
  } catch (err) {
    if (err instanceof UserError) return err.exitCode;
  }
  return n + widths.length + peaks.length + onsets.length + missing + reasons.length + files.length + sim.rows + origin.length + Object.keys(codes).length + bad.length + rows.length;
}
