import { describe, expect, it } from 'vitest';
import { keyMeaning, keyNumber, levelNameOfParent } from '../../../src/ingest/json/keyLevel.js';

describe('keyMeaning', () => {
  it('numbers are values, thousands separators allowed', () => {
    expect(keyMeaning('0.2')).toEqual({ kind: 'value', value: 0.2 });
    expect(keyMeaning('7')).toEqual({ kind: 'value', value: 7 });
    expect(keyMeaning('1e-3')).toEqual({ kind: 'value', value: 0.001 });
    expect(keyNumber('4,146')).toBe(4146);
    expect(keyNumber('1_000')).toBe(1000);
    expect(keyNumber('4,14')).toBeNull();
  });

  it('name=value pairs inside a key become pairs', () => {
    expect(keyMeaning('w=4 (p=4,146, p/n=1.04)')).toEqual({ kind: 'pairs', pairs: [['w', 4], ['p', 4146], ['p/n', 1.04]] });
    expect(keyMeaning('lr:0.1')).toEqual({ kind: 'pairs', pairs: [['lr', 0.1]] });
  });

  it('an axis name joined to its value is a pair; other names name a run', () => {
    expect(keyMeaning('seed_7')).toEqual({ kind: 'pairs', pairs: [['seed', 7]] });
    expect(keyMeaning('width64')).toEqual({ kind: 'pairs', pairs: [['width', 64]] });
    expect(keyMeaning('r1')).toEqual({ kind: 'name' });
    expect(keyMeaning('history')).toEqual({ kind: 'name' });
  });
});

describe('levelNameOfParent', () => {
  it('a parent key naming an axis names its child level', () => {
    expect(levelNameOfParent('per_seed')).toBe('seed');
    expect(levelNameOfParent('by_noise')).toBe('noise');
    expect(levelNameOfParent('noise_levels')).toBe('noise');
    expect(levelNameOfParent('widths')).toBe('width');
    expect(levelNameOfParent('seeds')).toBe('seed');
  });

  it('other keys name nothing', () => {
    expect(levelNameOfParent('results')).toBeNull();
    expect(levelNameOfParent('aggregated')).toBeNull();
    expect(levelNameOfParent(null)).toBeNull();
  });
});

describe('several axes joined in one key', () => {
  it('n4000_w8 and width8_seed0 are pairs; r1 and lr_0.1 name runs', () => {
    expect(keyMeaning('n4000_w8')).toEqual({ kind: 'pairs', pairs: [['n', 4000], ['w', 8]] });
    expect(keyMeaning('width8_seed0')).toEqual({ kind: 'pairs', pairs: [['width', 8], ['seed', 0]] });
    expect(keyMeaning('run_1')).toEqual({ kind: 'name' });
  });
});
