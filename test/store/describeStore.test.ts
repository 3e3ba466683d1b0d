import { describe, expect, it } from 'vitest';
import { describeStore, reasonKind } from '../../src/store/describeStore.js';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import { emptyManifest } from '../../src/store/Manifest.js';
import { formatCondition, parseCondition } from '../../src/store/conditionText.js';
import { axisSource } from '../../src/ingest/axisSource.js';

const row = (run: string, condition: string, width: number, epochs: number, seed: number) => ({
  run, condition, source: 'a.csv', source_line: 1, status: 'ok' as const, seed, width, epochs, train_size: 1000, label_noise: 0.1,
  test_error: 0.3, train_error: NaN, test_loss: NaN, train_loss: NaN, wall_seconds: NaN, extra: {},
});

describe('describeStore', () => {
  it('rows, runs, axes, seeds, conditions with run counts, metrics, column sources, rejections by reason', () => {
    const table = tableFromRows([row('a', 'opt=adam', 4, 1, 0), row('a', 'opt=adam', 4, 2, 0), row('b', 'opt=adam', 8, 1, 1), row('c', 'opt=sgd', 8, 1, 0)]);
    const m = emptyManifest();
    m.sources['/x/a.csv'] = { path: 'a.csv', size: 1, mtime: 1, sha256: '', format: 'csv', mapping: { width: 'Hidden Neurons', epochs: 'epoch' }, ingestedAt: '', read: 4, accepted: 4, duplicates: 0, rejected: 2, pending: 0 };
    const d = describeStore(table, m, [{ source: 'a.csv', line: 3, field: 'w', reason: "not a number: 'x'" }, { source: 'a.csv', line: 4, field: 'w', reason: "not a number: 'y'" }]);
    expect(d).toMatchObject({
      rows: 4, runs: 3, columns: { width: 'Hidden Neurons', epochs: 'epoch' },
      axes: { width: [4, 8], train_size: [1000], label_noise: [0.1], epochs: { min: 1, max: 2, distinct: 2 } },
      seeds: [0, 1], conditions: [{ condition: 'opt=adam', runs: 2 }, { condition: 'opt=sgd', runs: 1 }], metrics: ['test_error'],
      rejected: { "not a number: '…'": 2 },
    });
    expect(reasonKind('width must be > 0, got -3')).toBe('width must be > N, got N');
  });
});

describe('condition text', () => {
  it('format sorts by key; parse reads it back', () => {
    const c = formatCondition([['wd', '0.01'], ['opt', 'adam']]);
    expect(c).toBe('opt=adam,wd=0.01');
    expect([...parseCondition(c)]).toEqual([['opt', 'adam'], ['wd', '0.01']]);
    expect(parseCondition('')).toEqual(new Map());
  });
});

describe('axisSource', () => {
  it('names the column behind an axis when all sources agree and it is not the axis name', () => {
    const m = emptyManifest();
    const e = (mapping: Record<string, string>) => ({ path: '', size: 0, mtime: 0, sha256: '', format: 'csv', mapping, ingestedAt: '', read: 0, accepted: 0, duplicates: 0, rejected: 0, pending: 0 });
    m.sources.a = e({ width: 'p_over_n' });
    m.sources.b = e({ width: 'p_over_n' });
    expect(axisSource(m, 'width')).toBe('p_over_n');
    m.sources.c = e({ width: 'config width' });
    expect(axisSource(m, 'width')).toBeUndefined();
  });
});
