import { describe, expect, it } from 'vitest';
import { columnarBlock } from '../../../src/ingest/json/columnarBlock.js';
import { columnsTable, indexTable, splitTable, tableOrient } from '../../../src/ingest/json/tableShapes.js';
import { isRunCollection } from '../../../src/ingest/json/runCollection.js';

describe('columnarBlock', () => {
  it('the length most arrays share; arrays of other lengths left out', () => {
    expect(columnarBlock({ epoch: [1, 2, 3], test_error: [0.5, 0.4, 0.3], lr: [0.1, 0.01], width: 8 })).toEqual({ length: 3, names: ['epoch', 'test_error'] });
  });
  it('one array alone is no block', () => {
    expect(columnarBlock({ seeds: [1, 2, 3], width: 8 })).toBeNull();
  });
  it('arrays of records are not columns', () => {
    expect(columnarBlock({ a: [{ x: 1 }], b: [{ x: 2 }] })).toBeNull();
  });
});

// pandas DataFrame.to_json orients (pandas documentation, DataFrame.to_json).
describe('table orients', () => {
  const rows = [{ width: 4, test_error: 0.3 }, { width: 8, test_error: 0.2 }];
  it('split', () => {
    expect(splitTable({ columns: ['width', 'test_error'], index: [0, 1], data: [[4, 0.3], [8, 0.2]] })).toEqual({ columns: ['width', 'test_error'], index: [0, 1], data: [[4, 0.3], [8, 0.2]] });
    expect(splitTable({ columns: ['a'], data: [[1]], extra: 1 })).toBeNull();
  });
  it('columns', () => {
    expect(columnsTable({ width: { 0: 4, 1: 8 }, test_error: { 0: 0.3, 1: 0.2 } })).toEqual(rows);
    // Keys that are not a 0..n-1 index: a level of values, not a table.
    expect(columnsTable({ width: { 4: 1, 8: 2 }, test_error: { 4: 0.3, 8: 0.2 } })).toBeNull();
  });
  it('index', () => {
    expect(indexTable({ 0: rows[0], 1: rows[1] })).toEqual(rows);
    expect(indexTable({ 0.1: rows[0], 0.2: rows[1] })).toBeNull();
  });
  it('table', () => {
    expect(tableOrient({ schema: { fields: [{ name: 'width' }] }, data: rows })).toEqual(rows);
    expect(tableOrient({ data: rows })).toBeNull();
  });
});

describe('isRunCollection', () => {
  it('sibling objects sharing most keys', () => {
    expect(isRunCollection({ r1: { width: 8, epoch: [1] }, r2: { width: 16, epoch: [1] } })).toBe(true);
  });
  it('unrelated objects, or a single one, are not', () => {
    expect(isRunCollection({ config: { lr: 0.1 }, results: { epoch: [1], test_error: [0.2] } })).toBe(false);
    expect(isRunCollection({ r1: { width: 8 } })).toBe(false);
  });
});
