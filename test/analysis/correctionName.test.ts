import { describe, expect, it } from 'vitest';
import { correctionName } from '../../src/analysis/correctionName.js';
import { findRidge } from '../../src/analysis/findRidge.js';
import { UserError } from '../../src/UserError.js';
import { makeCell, makeMap, testRng } from './makeCell.js';

describe('correctionName', () => {
  it('reads benjamini-hochberg and its short form bh as one name', () => {
    expect(correctionName('benjamini-hochberg')).toBe('benjamini-hochberg');
    expect(correctionName('bh')).toBe('benjamini-hochberg');
    expect(correctionName('BH')).toBe('benjamini-hochberg');
    expect(correctionName('none')).toBe('none');
  });
  it('rejects anything else with a usage error naming the flag and the choices', () => {
    let err: unknown;
    try {
      correctionName('holm');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(UserError);
    expect((err as UserError).message).toBe("--correction expects benjamini-hochberg (bh for short) or none, got 'holm'");
  });
  it('findRidge takes either spelling and reports the one name', () => {
    const xs = Array.from({ length: 9 }, (_, i) => 2 ** (2 + i / 2));
    const r = testRng(11);
    const rows = [10, 100].map((y) => ({ y, cells: xs.map((x) => makeCell({ width: x }, [0, 1, 2].map(() => 0.3 + 0.1 * Math.exp(-((Math.log2(x) - 4) ** 2)) + 0.01 * r.z()))) }));
    const map = makeMap({ xs, rows });
    const a = findRidge(map, { boot: 50, nullRounds: 100, correction: 'bh' });
    const b = findRidge(map, { boot: 50, nullRounds: 100, correction: 'benjamini-hochberg' });
    expect(a.correction).toBe('benjamini-hochberg');
    expect(a).toEqual(b);
  });
});
