// Shapes that read wrong before: sibling curves keyed by split, per-epoch histories with a val_
// twin, settings keyed by number, a plan file among the logs (invented fixtures under
// test/fixtures/ingest/shapes). Exact rows and exact accounting,
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
  dir = mkdtempSync(join(tmpdir(), 'datlas-split-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

async function read(name: string, extra: Partial<IngestOptions> = {}) {
  const path = join(dir, name);
  cpSync(join(FIX, name), path, { recursive: true });
  const store = join(dir, 'store');
  const r = await ingestSources({ paths: [path], store, wait: 5, ...extra });
  expect(r.read).toBe(r.accepted + r.duplicates + r.rejected + r.pending + r.skipped);
  const rows = r.accepted > 0 ? tableToRows((await readStore(store)).table) : [];
  rows.sort((a, b) => a.width - b.width || a.epochs - b.epochs);
  return { r, rows };
}

type Row = Awaited<ReturnType<typeof read>>['rows'][number];
const pick = (rows: Row[], ...cols: (keyof Row)[]) =>
  rows.map((r) => cols.map((c) => (typeof r[c] === 'number' ? (Number.isNaN(r[c]) ? null : Number((r[c] as number).toFixed(6))) : r[c])));

describe('sibling curves keyed by split', () => {
  it('train/test blocks of one run join per epoch into one run with train and test metrics', async () => {
    const { r, rows } = await read('split-curves.json');
    // 3 epochs for width 8; width 16's test curve starts at epoch 2: 3 joined points, epoch 1 train only.
    expect([r.read, r.accepted, r.rejected, r.skipped]).toEqual([6, 6, 0, 0]);
    expect(pick(rows, 'width', 'epochs', 'train_error', 'test_error')).toEqual([
      [8, 1, 0.5, 0.6], [8, 2, 0.4, 0.5], [8, 3, 0.3, 0.45],
      [16, 1, 0.4, null], [16, 2, 0.3, 0.5], [16, 3, 0.2, 0.4],
    ]);
    expect(new Set(rows.map((x) => x.run)).size).toBe(2);
    expect(r.layouts[0].structure.join('\n')).toMatch(/curves 'train', 'test' at runs\[\] joined per epoch into one run \(in 2 records\)/);
  });

  it('train_*/test_* lists of one run stay one run, points numbered as epochs', async () => {
    const { r, rows } = await read('split-lists.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([6, 6, 0]);
    // accuracy → 1 − accuracy (DESIGN.md §4)
    expect(pick(rows, 'width', 'epochs', 'train_loss', 'test_loss', 'train_error', 'test_error')).toEqual([
      [4, 1, 1.2, 1.3, 0.6, 0.65], [4, 2, 0.9, 1.1, 0.4, 0.5], [4, 3, 0.7, 1.0, 0.3, 0.45],
      [8, 1, 1.0, 1.2, 0.5, 0.6], [8, 2, 0.6, 1.0, 0.3, 0.45], [8, 3, 0.4, 1.05, 0.2, 0.48],
    ]);
    expect(new Set(rows.map((x) => x.run)).size).toBe(2);
  });

});

describe('per-epoch history with val_ twins', () => {
  it('bare loss/accuracy are training metrics; val_loss/val_accuracy are the held-out (test) ones, with a note', async () => {
    const { r, rows } = await read('history-val.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([4, 4, 0]);
    expect(r.mapping).toMatchObject({ test_accuracy: 'val_accuracy', train_accuracy: 'accuracy', test_loss: 'val_loss', train_loss: 'loss' });
    expect(pick(rows, 'width', 'epochs', 'train_error', 'test_error', 'train_loss', 'test_loss')).toEqual([
      [8, 1, 0.5, 0.55, 1.0, 1.1], [8, 2, 0.4, 0.45, 0.8, 0.9], [16, 1, 0.45, 0.5, 0.9, 1.0], [16, 2, 0.35, 0.48, 0.7, 0.95],
    ]);
    expect(r.notes.join('\n')).toMatch(/'accuracy' read as train_accuracy \(beside it 'val_accuracy' is the held-out metric, taken as test\)/);
  });
});

describe('settings keyed by number', () => {
  it('a config lr_schedule and milestones are settings, not rows: named, none rejected', async () => {
    const { r, rows } = await read('config-schedule.json');
    expect([r.read, r.accepted, r.rejected, r.skipped]).toEqual([2, 2, 0, 0]);
    expect(pick(rows, 'width', 'train_size', 'seed', 'epochs', 'test_error')).toEqual([[8, 1000, 3, 1, 0.5], [8, 1000, 3, 2, 0.4]]);
    const s = r.layouts[0].structure.join('\n');
    expect(s).toMatch(/'config\.lr_schedule' \(10, 20\) is a setting keyed by number or a list of settings, not rows: not read/);
    expect(s).toMatch(/'config\.milestones' \(10, 20\) is a setting/);
  });
});

describe('a plan file among the logs', () => {
  it('is skipped whole with one note, not rejected row by row; the log beside it is read', async () => {
    const { r, rows } = await read('plan-beside');
    expect([r.read, r.accepted, r.rejected, r.skipped]).toEqual([2, 2, 0, 0]);
    expect(pick(rows, 'width', 'test_error')).toEqual([[8, 0.3], [16, 0.35]]);
    expect(r.skippedSources).toEqual([{ path: join(dir, 'plan-beside', 'next.csv'), reason: expect.stringMatching(/^this is a plan file \(2 proposed runs/) }]);
    expect(r.notes.filter((n) => /plan file/.test(n))).toHaveLength(1);
  });
});

describe('axes written other ways', () => {
  it('a width written with letters ("4x") reads as its number, with a note', async () => {
    const { r, rows } = await read('width-text.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([2, 2, 0]);
    expect(pick(rows, 'width', 'train_size', 'epochs', 'test_error')).toEqual([[4, 1000, 1, 0.5], [4, 1000, 2, 0.4]]);
    expect(r.notes.join('\n')).toMatch(/width in 'config\.width' written with letters \('4x' read as 4; 2 cells\)/);
  });

  it('one metric per file (Wall time, Step, Value) in run folders named w8_seed0: metric from the file name, width from the folder', async () => {
    const { r, rows } = await read('per-metric-files', { set: { train_size: '500' } });
    // 6 rows: w8's train_error rows complete its test_error rows (2 duplicates), w16 has test only.
    expect([r.read, r.accepted, r.duplicates, r.rejected]).toEqual([6, 4, 2, 0]);
    expect(pick(rows, 'width', 'seed', 'epochs', 'test_error', 'train_error')).toEqual([
      [8, 0, 1, 0.5, 0.3], [8, 0, 2, 0.4, 0.2], [16, 0, 1, 0.45, null], [16, 0, 2, 0.35, null],
    ]);
    const notes = r.notes.join('\n');
    expect(notes).toMatch(/column 'Value' read as train_error, named by the file 'train_error'/);
    expect(notes).toMatch(/width 16 read from the folder name 'w16_seed0'/);
  });
});

describe('splits in long form and in nested names', () => {
  it('rows told apart by a split column: one run, train_* and test_* joined per epoch (no condition per split)', async () => {
    const { r, rows } = await read('long-split.jsonl');
    // 4 lines: the two test lines complete the train lines of their epoch (duplicates, DESIGN.md §4).
    expect([r.read, r.accepted, r.duplicates, r.rejected]).toEqual([4, 2, 2, 0]);
    expect(pick(rows, 'epochs', 'train_error', 'test_error', 'train_loss', 'test_loss', 'condition')).toEqual([
      [1, 0.3, 0.5, 0.9, 1.2, ''], [2, 0.2, 0.45, 0.7, 1.1, ''],
    ]);
    expect(r.notes.join('\n')).toMatch(/rows of train, test told apart by column 'split'/);
  });

  it('metrics.train.acc and metrics.test.acc: the split one level up decides train or test', async () => {
    const { r, rows } = await read('split-metrics.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([2, 2, 0]);
    expect(r.mapping).toMatchObject({ test_accuracy: 'metrics.test.acc', train_accuracy: 'metrics.train.acc' });
    expect(pick(rows, 'width', 'train_error', 'test_error', 'train_loss', 'test_loss')).toEqual([[8, 0.1, 0.4, 0.1, 0.5], [16, 0.05, 0.35, 0.05, 0.4]]);
  });
});

describe('one metric spelt two ways in different records', () => {
  it('val_accuracy in one run and val_acc in another fill one column: no run loses its test accuracy', async () => {
    const { r, rows } = await read('history-mixed-names.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([4, 4, 0]);
    expect(r.mapping).toMatchObject({ test_accuracy: 'val_accuracy | val_acc', train_accuracy: 'accuracy | acc' });
    expect(pick(rows, 'width', 'epochs', 'train_error', 'test_error')).toEqual([[8, 1, 0.5, 0.55], [8, 2, 0.4, 0.45], [16, 1, 0.45, 0.5], [16, 2, 0.35, 0.48]]);
  });
});

describe('a curve keyed by epoch', () => {
  it('keys under history are the epochs (named by the curve key, with a note)', async () => {
    const { r, rows } = await read('epoch-keyed-history.json');
    expect([r.read, r.accepted, r.rejected]).toEqual([4, 4, 0]);
    expect(pick(rows, 'width', 'epochs', 'test_error')).toEqual([[8, 1, 0.5], [8, 2, 0.4], [16, 1, 0.45], [16, 2, 0.35]]);
    expect(r.layouts[0].structure.join('\n')).toMatch(/keys under '\[\]\.history' read as epoch \(named by 'history'/);
  });
});

describe('blocks of runs by split', () => {
  it('"train": [runs], "test": [runs]: each run once, its train and test metrics joined', async () => {
    const { r, rows } = await read('runs-by-split.json');
    // 4 records: each test record completes its train twin (2 duplicates).
    expect([r.read, r.accepted, r.duplicates, r.rejected]).toEqual([4, 2, 2, 0]);
    expect(pick(rows, 'width', 'epochs', 'train_error', 'test_error', 'condition')).toEqual([[4, 50, 0.1, 0.4, ''], [8, 50, 0.05, 0.35, '']]);
  });
});
