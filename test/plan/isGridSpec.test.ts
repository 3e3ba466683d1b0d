import { describe, expect, it } from 'vitest';
import { isGridSpec } from '../../src/plan/isGridSpec.js';
import { SPEC_EXAMPLE } from '../../src/plan/specExample.js';
import { SPEC_TEXT } from './fixtures.js';

describe('isGridSpec', () => {
  it('knows a grid spec (YAML or JSON) from a run log', () => {
    expect(isGridSpec(SPEC_TEXT)).toBe(true);
    expect(isGridSpec(SPEC_EXAMPLE)).toBe(true);
    expect(isGridSpec('{"axes": {"width": [4], "train_size": [10]}, "seeds": 2, "epochs": 5}')).toBe(true);
    // Logs: a CSV table, JSON Lines records, a JSON array of records, a run config.
    expect(isGridSpec('width,epoch,n,test_error\n8,1,100,0.5\n')).toBe(false);
    expect(isGridSpec('{"width": 8, "epoch": 1, "test_error": 0.5}\n{"width": 8, "epoch": 2, "test_error": 0.4}\n')).toBe(false);
    expect(isGridSpec('[{"width": 8, "epoch": 1, "test_error": 0.5}]')).toBe(false);
    expect(isGridSpec('model:\n  width: 64\nseed: 3\n')).toBe(false);
    expect(isGridSpec('axes: [1, 2]\n')).toBe(false);
    expect(isGridSpec('a: [\n')).toBe(false);
  });
});
