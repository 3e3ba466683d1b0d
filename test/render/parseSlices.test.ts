import { describe, expect, it } from 'vitest';
import { parseSlices } from '../../src/render/parseSlices.js';
import { pickSliceRows } from '../../src/render/slicesSpec.js';
import { UserError } from '../../src/UserError.js';
import { fixtureMap } from './mapFixture.js';

describe('--slices', () => {
  it('reads axis=v1,v2 or bare values of the map rows', () => {
    expect(parseSlices('epochs=100,1000,4e3', 'epochs')).toEqual([100, 1000, 4000]);
    expect(parseSlices('10, 20', 'epochs')).toEqual([10, 20]);
    expect(parseSlices(undefined, 'epochs')).toBeNull();
  });

  it('rejects another axis or non-numbers as usage errors (exit 2)', () => {
    for (const bad of ['width=8', 'epochs=a,b', 'epochs=']) {
      let err: unknown;
      try {
        parseSlices(bad, 'epochs');
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(UserError);
      expect((err as UserError).exitCode).toBe(2);
    }
  });

  it('snaps requested rows to the nearest measured row in log space', () => {
    const map = fixtureMap(); // epochs 2^(12j/7): 1, 3.28, 10.8, 35.3, 116, 380, 1248, 4096
    expect(pickSliceRows(map, [9, 5000, 4096])).toEqual([map.y.values[2], map.y.values[7]]);
    expect(pickSliceRows(map)).toHaveLength(4);
  });
});
