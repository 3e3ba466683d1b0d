import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, readFileSync, rmSync, utimesSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import { readStore } from '../../src/store/readStore.js';
import { parseRejected } from '../../src/store/rejectedCsv.js';
import { tableToRows } from '../../src/store/tableFromRows.js';

const FIXTURE = fileURLToPath(new URL('../fixtures/ingest/messy', import.meta.url));
let dir = '';
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-messy-'));
  cpSync(FIXTURE, join(dir, 'messy'), { recursive: true });
  // b.jsonl is the newer source: it wins the conflict (DESIGN.md §4).
  utimesSync(join(dir, 'messy/a.csv'), new Date(1_700_000_000_000), new Date(1_700_000_000_000));
  utimesSync(join(dir, 'messy/b.jsonl'), new Date(1_700_000_100_000), new Date(1_700_000_100_000));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

// DESIGN.md §4 and §6: read == accepted + duplicates + rejected + pending; every row in one place.
describe('accounting on a deliberately messy sweep', () => {
  it('puts every row read in exactly one place', async () => {
    const store = join(dir, 'store');
    const src = join(dir, 'messy');
    const r = await ingestSources({ paths: [src], store });
    expect(r.read).toBe(r.accepted + r.duplicates + r.rejected + r.pending);
    // a.csv: 9 complete data rows + 1 pending; b.jsonl: 4 lines (see test/fixtures/ingest/messy/NOTES.md).
    expect({ read: r.read, accepted: r.accepted, duplicates: r.duplicates, rejected: r.rejected, pending: r.pending, conflicts: r.conflicts })
      .toEqual({ read: 14, accepted: 6, duplicates: 2, rejected: 5, pending: 1, conflicts: 1 });

    const { table, manifest } = await readStore(store);
    const rows = tableToRows(table);
    const a = join(src, 'a.csv');
    const b = join(src, 'b.jsonl');
    const at = (s: string) => rows.filter((x) => x.source === s).map((x) => x.source_line);
    expect(at(a)).toEqual([2, 3, 6, 9]);
    expect(at(b)).toEqual([1, 4]);
    // The conflict winner: b.jsonl line 1, test accuracy 0.3 under a nested key → test error 0.7.
    const r3 = rows.find((x) => x.run === 'r3' && x.epochs === 1)!;
    expect(r3.source).toBe(b);
    expect(r3.test_error).toBeCloseTo(0.7, 12);
    // NaN and Infinity test errors: kept as diverged.
    expect(rows.find((x) => x.run === 'r2')!.status).toBe('diverged');
    expect(rows.find((x) => x.run === 'r4')!.status).toBe('diverged');
    expect(rows.find((x) => x.run === 'r4')!.label_noise).toBe(0);

    const rejected = parseRejected(readFileSync(join(store, 'rejected.csv'), 'utf8'));
    const where = rejected.map((x) => `${x.source === a ? 'a' : 'b'}:${x.line}:${x.field}:${x.reason.split(':')[0]}`).sort();
    expect(where).toEqual([
      'a:10:train_err:expected 8 fields (as in the header), got 7',
      'a:5:test_err:not a number',
      'a:7:width:width must be > 0, got -4',
      'a:8:run:conflict',
      'b:3::not valid JSON',
    ].sort());
    // Per-source counts in the manifest add up too.
    for (const s of Object.values(manifest.sources)) expect(s.read).toBe(s.accepted + s.duplicates + s.rejected + s.pending);
    expect(manifest.sources[a]).toMatchObject({ read: 10, accepted: 4, duplicates: 1, rejected: 4, pending: 1 });
    expect(manifest.sources[b]).toMatchObject({ read: 4, accepted: 2, duplicates: 1, rejected: 1, pending: 0 });
  });

  it('the older source loses when it arrives later', async () => {
    const store = join(dir, 'store');
    await ingestSources({ paths: [join(dir, 'messy/b.jsonl')], store });
    const r = await ingestSources({ paths: [join(dir, 'messy/a.csv')], store });
    expect(r.read).toBe(r.accepted + r.duplicates + r.rejected + r.pending);
    expect(r.conflicts).toBe(1);
    const rows = tableToRows((await readStore(store)).table);
    expect(rows.find((x) => x.run === 'r3' && x.epochs === 1)!.test_error).toBeCloseTo(0.7, 12);
  });

  it('--strict leaves the store untouched when any row is rejected', async () => {
    const store = join(dir, 'store');
    const r = await ingestSources({ paths: [join(dir, 'messy')], store, strict: true });
    expect(r.strictFailed).toBe(true);
    await expect(readStore(store)).rejects.toThrow(/no store at/);
  });
});
