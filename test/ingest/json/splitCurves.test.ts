// Sibling curves keyed by split joined per epoch (invented data; common practice: train/val/test splits).
import { describe, expect, it } from 'vitest';
import { joinSplitCurves, splitPrefix } from '../../../src/ingest/json/splitCurves.js';

describe('joinSplitCurves', () => {
  it('joins columnar train/test blocks per epoch, sorted by epoch, each metric prefixed by its split', () => {
    const j = joinSplitCurves({ width: 8, train: { epoch: [2, 1], error: [0.4, 0.5] }, test: { epoch: [1], error: [0.6] } });
    expect(j?.keys).toEqual(['train', 'test']);
    expect(j?.points).toEqual([{ epoch: 1, train_error: 0.5, test_error: 0.6 }, { epoch: 2, train_error: 0.4 }]);
  });

  it('joins by index when a split has no epoch key; names that already say their split keep it', () => {
    expect(joinSplitCurves({ train: [{ train_loss: 0.5 }], val: [{ loss: 0.7 }] })?.points).toEqual([{ train_loss: 0.5, val_loss: 0.7 }]);
  });

  it('records naming an axis are runs, not a curve; an object without split keys is left alone', () => {
    expect(joinSplitCurves({ train: [{ width: 4, error: 0.1 }], test: [{ width: 4, error: 0.3 }] })).toBeNull();
    expect(joinSplitCurves({ history: { epoch: [1], error: [0.3] } })).toBeNull();
  });

  it('splitPrefix: validation words are held-out (val), training words train', () => {
    expect(['Validation', 'valid', 'eval', 'dev', 'training', 'TEST'].map(splitPrefix)).toEqual(['val', 'val', 'val', 'val', 'train', 'test']);
    expect(splitPrefix('history')).toBeUndefined();
  });
});
