import { describe, expect, it } from 'vitest';
import { axisTitle } from '../../src/render/axisText.js';

describe('axisTitle', () => {
  it('names the source column when the axis was read from another one', () => {
    expect(axisTitle({ name: 'width', scale: 'log2', source: 'p_over_n' })).toBe('width (p_over_n, log scale)');
    expect(axisTitle({ name: 'width', scale: 'linear', source: 'D' })).toBe('width (D)');
  });
  it('otherwise the unit', () => {
    expect(axisTitle({ name: 'width', scale: 'log2' })).toBe('width (model size, log scale)');
    expect(axisTitle({ name: 'train_size', scale: 'linear' })).toBe('train size (samples)');
  });
});
