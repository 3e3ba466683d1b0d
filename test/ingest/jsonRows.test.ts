// Every shape of result file a research script writes (invented fixtures under
// test/fixtures/ingest/shapes): exact rows and exact accounting,
// read == accepted + duplicates + rejected + pending + skipped (DESIGN.md §4).
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ingestSources } from '../../src/ingest/ingestSources.js';
import type { IngestOptions } from '../../src/ingest/ingestSources.js';
import { readStore } from '../../src/store/readStore.js';
import { tableToRows } from '../../src/store/tableFromRows.js';

const FIX = join(import.meta.dirname, '../fixtures/ingest/shapes');
let dir = '';
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'datlas-shapes-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

async function read(name: string, extra: Partial<IngestOptions> = {}) {
  // A copy: the run-folder fixture's seeds come from the folder names, not the temp path.
  const path = join(dir, name);
  cpSync(join(FIX, name), path, { recursive: true });
  const store = join(dir, 'store');
  const r = await ingestSources({ paths: [path], store, wait: 5, ...extra });
  expect(r.read).toBe(r.accepted + r.duplicates + r.rejected + r.pending + r.skipped);
  const rows = r.accepted > 0 ? tableToRows((await readStore(store)).table) : [];
  const key = (x: (typeof rows)[number]) => [x.condition, x.label_noise, x.seed, x.width, x.train_size, x.epochs] as const;
  rows.sort((a, b) => {
    const ka = key(a);
    const kb = key(b);
    for (let i = 0; i < ka.length; i++) if (ka[i] !== kb[i]) return ka[i] < kb[i] ? -1 : 1;
    return 0;
  });
  return { r, rows };
}

const pick = (rows: Awaited<ReturnType<typeof read>>['rows'], ...cols: ('width' | 'train_size' | 'label_noise' | 'seed' | 'epochs' | 'test_error' | 'train_error' | 'test_loss' | 'train_loss' | 'condition' | 'status')[]) =>
  rows.map((r) => cols.map((c) => (typeof r[c] === 'number' ? Number((r[c] as number).toFixed(6)) : r[c])));

describe('nested JSON documents: every block read, each row with its own branch', () => {
  it('keys that are values (one block per label-noise level): both blocks, the key kept (lost-block and lost-value defects)', async () => {
    const { r, rows } = await read('noise-keyed.json', { keys: ['label_noise'] });
    expect([r.read, r.accepted, r.rejected, r.skipped]).toEqual([4, 4, 0, 0]);
    expect(pick(rows, 'label_noise', 'width', 'test_error')).toEqual([[0, 4, 0.3], [0, 8, 0.25], [0.2, 4, 0.4], [0.2, 8, 0.45]]);
    expect(new Set(rows.map((x) => x.condition))).toEqual(new Set(['']));
  });

  it('value keys without --keys become a column key1 that splits conditions, and a note suggests --keys', async () => {
    const { r, rows } = await read('noise-keyed.json');
    expect(r.accepted).toBe(4);
    expect(rows.map((x) => x.condition)).toEqual(['key1=0', 'key1=0', 'key1=0.2', 'key1=0.2']);
    expect(r.layouts[0].structure.join('\n')).toMatch(/values \(0\.0, 0\.2\), kept as column key1; name them with --keys/);
  });

  it('seeds → noise levels under per_seed; the aggregated means are counted as skipped, the seeds list named', async () => {
    const { r, rows } = await read('per-seed.json', { keys: ['seed', 'label_noise'] });
    expect([r.read, r.accepted, r.rejected, r.skipped]).toEqual([12, 8, 0, 4]);
    // accuracy → 1 − accuracy (DESIGN.md §4)
    expect(pick(rows, 'label_noise', 'seed', 'width', 'train_size', 'epochs', 'test_error')).toEqual([
      [0.1, 7, 4, 4000, 100, 0.39], [0.1, 7, 8, 4000, 100, 0.45], [0.1, 8, 4, 4000, 100, 0.4], [0.1, 8, 8, 4000, 100, 0.43],
      [0.3, 7, 4, 4000, 100, 0.5], [0.3, 7, 8, 4000, 100, 0.58], [0.3, 8, 4, 4000, 100, 0.48], [0.3, 8, 8, 4000, 100, 0.6],
    ]);
    const s = r.layouts[0].structure.join('\n');
    expect(s).toMatch(/4 records under 'aggregated' skipped/);
    expect(s).toMatch(/array 'seeds' \(2 values\) not read/);
  });

  it('without --keys the per_seed parent names the seed level', async () => {
    const { r, rows } = await read('per-seed.json');
    expect(r.accepted).toBe(8);
    expect([...new Set(rows.map((x) => x.seed))]).toEqual([7, 8]);
    expect(r.layouts[0].structure.join('\n')).toMatch(/keys under 'per_seed' read as seed \(named by 'per_seed'/);
  });

  it('name=value keys with thousands separators become columns; each run keeps its own width (wrong-width defect)', async () => {
    const { r, rows } = await read('pairs-keyed.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([6, 6, 0]);
    expect(pick(rows, 'width', 'epochs', 'test_error', 'label_noise', 'train_size')).toEqual([
      [4, 1, 0.5, 0.1, 4000], [4, 10, 0.4, 0.1, 4000], [4, 100, 0.45, 0.1, 4000], [8, 1, 0.5, 0.1, 4000], [8, 10, 0.35, 0.1, 4000], [8, 100, 0.3, 0.1, 4000],
    ]);
    expect(rows.map((x) => x.extra.p)).toEqual([4146, 4146, 4146, 8290, 8290, 8290]);
    expect(rows.map((x) => x.extra['p/n'])).toEqual([1.04, 1.04, 1.04, 2.07, 2.07, 2.07]);
    // p/n is derived from the axes: never a condition.
    expect(new Set(rows.map((x) => x.condition))).toEqual(new Set(['']));
  });

  it('a setting in name=value keys (lr=0.1) splits conditions: the two runs never share a cell', async () => {
    const { r, rows } = await read('lr-keyed.json');
    expect([r.read, r.accepted, r.duplicates, r.rejected]).toEqual([2, 2, 0, 0]);
    expect(pick(rows, 'condition', 'test_error')).toEqual([['lr=0.01', 0.35], ['lr=0.1', 0.3]]);
  });

  it('per-run objects of equal-length arrays: every run, its own width and seed, not a sibling\'s', async () => {
    const { r, rows } = await read('per-run.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([9, 9, 0]);
    expect(pick(rows, 'seed', 'width', 'epochs', 'test_error')).toEqual([
      [0, 8, 0, 0.9], [0, 8, 5, 0.5], [0, 8, 10, 0.4], [0, 16, 0, 0.9], [0, 16, 5, 0.45], [0, 16, 10, 0.3], [1, 8, 0, 0.9], [1, 8, 5, 0.52], [1, 8, 10, 0.41],
    ]);
    expect(new Set(rows.map((x) => x.run)).size).toBe(3);
  });

  it('a record\'s own curve with NaN between evaluations: evaluated points kept, all-NaN points rejected with a reason', async () => {
    const { r, rows } = await read('record-curves.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([10, 7, 3]);
    expect(r.rejects.every((x) => /every metric NaN or empty/.test(x.reason))).toBe(true);
    // percent accuracy → error fraction: 1 − 30.5/100 = 0.695
    expect(pick(rows.filter((x) => x.width === 4), 'epochs', 'test_error', 'train_error', 'status')).toEqual([
      [0, NaN, 0.9, 'ok'], [100, 0.695, 0.5, 'ok'], [200, NaN, 0.3, 'ok'], [300, 0.619, 0.1, 'ok'], [400, NaN, 0.01, 'ok'],
    ]);
    expect(pick(rows.filter((x) => x.width === 8), 'epochs', 'test_error', 'label_noise')).toEqual([[100, 0.67, 0.15], [300, 0.59, 0.15]]);
    // The run-level outcome is kept as an extra column, not a condition.
    expect(rows[0].extra.final_test_acc).toBe(61.2);
    expect(rows.every((x) => x.condition === '')).toBe(true);
  });

  it('a list of per-run dicts, each with a nested config and a history list', async () => {
    const { r, rows } = await read('runs-list.json');
    expect([r.read, r.accepted]).toEqual([6, 6]);
    expect(pick(rows, 'condition', 'width', 'epochs', 'test_loss')).toEqual([
      ['optimizer=adam', 4, 1, 2], ['optimizer=adam', 4, 2, 1.5], ['optimizer=adam', 8, 1, 1.8], ['optimizer=adam', 8, 2, 1.2], ['optimizer=adam', 8, 3, 1.1], ['optimizer=sgd', 8, 1, 1.9],
    ]);
  });

  it('a dict keyed by seed then width (--keys names the second level)', async () => {
    const { r, rows } = await read('seed-width.json', { keys: ['seed', 'width'] });
    expect([r.read, r.accepted]).toEqual([8, 8]);
    expect(pick(rows, 'seed', 'width', 'epochs', 'test_error')).toEqual([
      [0, 4, 1, 0.5], [0, 4, 2, 0.4], [0, 8, 1, 0.45], [0, 8, 2, 0.35], [1, 4, 1, 0.52], [1, 4, 2, 0.41], [1, 8, 1, 0.44], [1, 8, 2, 0.36],
    ]);
  });

  it('per-width lists of metrics without an epoch key: points numbered 1..n as epochs (not the config\'s planned total)', async () => {
    const { r, rows } = await read('per-width-lists.json', { keys: ['width'] });
    expect([r.read, r.accepted, r.rejected]).toEqual([6, 6, 0]);
    expect(pick(rows, 'width', 'epochs', 'test_loss', 'test_error', 'label_noise')).toEqual([
      [16, 1, 1, 0.5, 0.2], [16, 2, 0.8, 0.4, 0.2], [16, 3, 0.9, 0.45, 0.2], [64, 1, 0.9, 0.45, 0.2], [64, 2, 0.7, 0.35, 0.2], [64, 3, 0.6, 0.3, 0.2],
    ]);
    expect(r.layouts[0].structure.join('\n')).toMatch(/2 curves at results\.\* without an epoch or step key: points numbered/);
  });

  it('a block of equal-length lists naming an axis is a table of runs, not a curve: no epochs invented', async () => {
    const { jsonRows } = await import('../../src/ingest/jsonRows.js');
    const raw = jsonRows({ width: [4, 8], test_error: [0.3, 0.2] });
    expect(raw.names).toEqual(['width', 'test_error']);
  });

  it('a metric per seed then width as plain numbers: one row per key; train and test halves merge into one row', async () => {
    const { r, rows } = await read('final-by-seed-width.json', { keys: ['seed', 'width'], set: { train_size: '500', epochs: '100' } });
    // 8 values read: 4 rows kept, the 4 halves that completed them counted as duplicates (DESIGN.md §4).
    expect([r.read, r.accepted, r.duplicates, r.rejected]).toEqual([8, 4, 4, 0]);
    expect(pick(rows, 'seed', 'width', 'test_error', 'train_error')).toEqual([[0, 4, 0.3, 0.1], [0, 8, 0.25, 0], [1, 4, 0.32, 0.12], [1, 8, 0.24, 0.01]]);
  });

  it('Python NaN / Infinity tokens: Infinity marks the run diverged, an all-NaN point is rejected', async () => {
    const { r, rows } = await read('nonfinite.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([4, 3, 1]);
    expect(pick(rows, 'epochs', 'test_loss', 'status')).toEqual([[1, 1.5, 'ok'], [2, 9, 'ok'], [3, NaN, 'diverged']]);
  });

  it('results.json with metrics-per-epoch lists; a list of another length is named, not read', async () => {
    const { r, rows } = await read('results-lists.json');
    expect([r.read, r.accepted]).toEqual([3, 3]);
    expect(pick(rows, 'epochs', 'test_error', 'train_error', 'test_loss')).toEqual([[10, 0.6, 0.5, 1.6], [20, 0.5, 0.2, 1.4], [30, 0.45, 0.01, 1.5]]);
    expect(r.layouts[0].structure.join('\n')).toMatch(/array 'lr_schedule' \(2 values\) not read/);
  });

  it('records without a curve: final_* is the value at their epochs, best_* is never used', async () => {
    const { r, rows } = await read('final-only.json');
    expect(r.accepted).toBe(2);
    expect(pick(rows, 'width', 'epochs', 'test_error')).toEqual([[4, 4000, 0.39], [8, 4000, 0.45]]);
    expect(rows[0].extra.best_test_acc).toBe(0.66);
    expect(r.notes.join('\n')).toMatch(/'final_test_acc' read as test_accuracy/);
  });

  it('best_* mapped by hand is read, with a caution about early stopping', async () => {
    const { r, rows } = await read('final-only.json', { map: { test_accuracy: 'best_test_acc' } });
    expect(pick(rows, 'width', 'test_error')).toEqual([[4, 0.34], [8, 0.36]]);
    expect(r.notes.join('\n')).toMatch(/early-stopped minimum hides epoch-wise double descent/);
  });
});

describe('summaries and rows without names', () => {
  it('records whose metrics are all means or spreads over seeds are skipped and named', async () => {
    const { r, rows } = await read('summary-rows.json');
    expect([r.read, r.accepted, r.rejected, r.skipped]).toEqual([4, 2, 0, 2]);
    expect(pick(rows, 'width', 'test_error')).toEqual([[4, 0.3], [8, 0.2]]);
    expect(r.layouts[0].structure.join('\n')).toMatch(/2 records under 'by_width' skipped: metrics are all means or spreads over seeds/);
  });

  it('pandas orient="values" (lists without column names): every row counted and rejected with the reason', async () => {
    const { r } = await read('pandas-values.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([2, 0, 2]);
    expect(r.rejects[0].reason).toMatch(/without column names/);
  });
});

describe('pandas writers', () => {
  const expected = [[4, 500, 20, 0.31], [8, 500, 20, 0.36], [16, 500, 20, 0.22]];
  for (const name of ['pandas-records.json', 'pandas-columns.json', 'pandas-index.json', 'pandas-split.json', 'pandas-table.json', 'pandas-index.csv']) {
    it(`${name}: three rows, nothing else`, async () => {
      const { r, rows } = await read(name);
      expect([r.read, r.accepted, r.rejected, r.skipped]).toEqual([3, 3, 0, 0]);
      expect(pick(rows, 'width', 'train_size', 'epochs', 'test_error')).toEqual(expected);
      expect(rows.every((x) => x.condition === '')).toBe(true);
    });
  }
});

describe('JSON Lines and run folders', () => {
  it('JSON Lines rows with their own history list expand; the row\'s config.width is read', async () => {
    const { r, rows } = await read('curves.jsonl');
    expect([r.read, r.accepted]).toEqual([4, 4]);
    expect(pick(rows, 'width', 'epochs', 'test_error')).toEqual([[4, 1, 0.5], [4, 2, 0.4], [8, 1, 0.45], [8, 2, 0.3]]);
    expect(rows.map((x) => x.source_line)).toEqual([1, 1, 2, 2]);
  });

  it('a JSON Lines row\'s nested config.width is its width (no longer rejected as missing)', async () => {
    const { r, rows } = await read('nested-config.jsonl');
    expect([r.read, r.accepted, r.rejected]).toEqual([2, 2, 0]);
    expect(pick(rows, 'width', 'train_size')).toEqual([[4, 1000], [8, 1000]]);
    expect(r.mapping.width).toBe('config.width');
  });

  it('run folders: the metrics file\'s scalars (best_*, final_*, effective_rank, wallclock_sec, epochs_run, a status text) never split conditions; one condition per distinct setting', async () => {
    const { r, rows } = await read('run-folders');
    expect([r.read, r.accepted, r.rejected]).toEqual([8, 8, 0]);
    expect(new Set(rows.map((x) => x.condition))).toEqual(new Set(['lr=0.05,optimizer=sgd']));
    expect(r.layouts[0].conditions).toEqual({ 'lr=0.05,optimizer=sgd': 4 });
    expect(pick(rows, 'seed', 'width', 'epochs', 'test_error')).toEqual([
      [0, 4, 1, 0.5], [0, 4, 2, 0.36], [0, 8, 1, 0.5], [0, 8, 2, 0.32], [1, 4, 1, 0.5], [1, 4, 2, 0.35], [1, 8, 1, 0.5], [1, 8, 2, 0.31],
    ]);
    // A text outcome (status_text) and a flag (stopped_early) are not conditions either.
    expect(Object.keys(rows[0].extra).sort()).toEqual(['best_epoch', 'best_test_acc', 'effective_rank', 'epochs_run', 'final_train_acc', 'wallclock_sec']);
    expect(rows.find((x) => x.width === 8 && x.seed === 1)!.extra.effective_rank).toBe(25);
  });
});

describe('columns matched by words; params is its own column', () => {
  it('Hidden Neurons is width, Parameters is params (never width when a width exists)', async () => {
    const { r, rows } = await read('hidden-neurons.csv');
    expect(r.mapping.width).toBe('Hidden Neurons');
    expect(r.mapping.params).toBe('Parameters');
    expect(pick(rows, 'width')).toEqual([[4], [8], [16]]);
    expect(rows.map((x) => x.extra.params)).toEqual([3190, 6370, 12730]);
  });

  it('with no width column, params serves as the model-size axis, with a note', async () => {
    const { r, rows } = await read('params-only.csv');
    expect(r.accepted).toBe(3);
    expect(pick(rows, 'width', 'test_error')).toEqual([[1000, 0.3], [2000, 0.4], [4000, 0.2]]);
    expect(rows.map((x) => x.extra.params)).toEqual([1000, 2000, 4000]);
    expect(r.notes.join('\n')).toMatch(/no width column; parameter count 'n_params' serves as the model-size axis/);
  });

  it('a ratio p_over_n serves as width through --map', async () => {
    const { r, rows } = await read('p-over-n.csv', { map: { width: 'p_over_n' } });
    expect(r.accepted).toBe(3);
    expect(pick(rows, 'width', 'test_loss')).toEqual([[0.5, 0.8], [1, 3.2], [2, 0.6]]);
  });

  it('--condition names a numeric column that then splits the sweep', async () => {
    const { rows } = await read('pandas-table.json', { condition: ['index'] });
    expect(rows.map((x) => x.condition)).toEqual(['index=0', 'index=1', 'index=2']);
  });
});
