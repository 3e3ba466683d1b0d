import { describe, expect, it } from 'vitest';
import { groupLayouts, mergedMapping } from '../../src/ingest/groupLayouts.js';
import { jsonRows } from '../../src/ingest/jsonRows.js';

const layout = (width: string, curve: number, conditions: Record<string, number>) => ({
  mapping: { width, epochs: 'epoch' }, passedOver: {}, structure: [`curve 'history' at (top) expanded: 1 record → ${curve} rows`], conditions,
});

describe('groupLayouts', () => {
  it('sources read alike are one layout (counts in notes aside), their runs per condition summed', () => {
    const g = groupLayouts([
      { source: 'a/results.json', layout: layout('config width', 300, { 'lr=0.1': 1 }) },
      { source: 'b/results.json', layout: layout('config width', 250, { 'lr=0.1': 1 }) },
      { source: 'c.csv', layout: layout('Hidden Neurons', 10, { '': 3 }) },
    ]);
    expect(g.map((x) => [x.sources, x.example, x.conditions])).toEqual([[2, 'a/results.json', { 'lr=0.1': 2 }], [1, 'c.csv', { '': 3 }]]);
    expect(mergedMapping(g)).toEqual({ width: 'config width | Hidden Neurons', epochs: 'epoch' });
  });
});

describe('--keys beyond the document', () => {
  it('names left over are reported', () => {
    const raw = jsonRows({ '0.1': [{ width: 4, epoch: 1, test_error: 0.2 }] }, { keys: ['label_noise', 'seed'] });
    expect(raw.jsonLayout?.unusedKeys).toEqual(['seed']);
    expect(raw.names).toContain('label_noise');
  });
});
