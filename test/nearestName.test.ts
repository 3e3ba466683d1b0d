import { describe, expect, it } from 'vitest';
import { editDistance, nearestName } from '../src/nearestName.js';

describe('editDistance (optimal string alignment)', () => {
  it('counts insertions, deletions, substitutions and adjacent swaps', () => {
    // Levenshtein's textbook pair: kitten → sitting is 3 edits (common practice).
    expect(editDistance('kitten', 'sitting')).toBe(3);
    expect(editDistance('', 'abc')).toBe(3);
    expect(editDistance('seeds', 'seeds')).toBe(0);
    // One swap of neighbours is one edit (Damerau 1964).
    expect(editDistance('sedes', 'seeds')).toBe(1);
    expect(editDistance('widht', 'width')).toBe(1);
    // Optimal string alignment edits no substring twice: CA → ABC is 3, not 2 (from memory).
    expect(editDistance('ca', 'abc')).toBe(3);
  });
});

describe('nearestName', () => {
  it('suggests a known name within a third of its letters, else nothing', () => {
    const flags = ['kind', 'store', 'budget', 'png-scale', 'axis-scale'];
    expect(nearestName('kidn', flags)).toBe('kind');
    expect(nearestName('stor', flags)).toBe('store');
    expect(nearestName('png-sacle', flags)).toBe('png-scale');
    expect(nearestName('zzzzzz', flags)).toBeNull();
    expect(nearestName('x', [])).toBeNull();
  });
});
