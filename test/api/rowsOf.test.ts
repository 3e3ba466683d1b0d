import * as aq from 'arquero';
import { describe, expect, it } from 'vitest';
import { fromArquero, rowsOf } from '../../src/api/rowsOf.js';
import { tableFromRows } from '../../src/store/tableFromRows.js';
import { UserError } from '../../src/UserError.js';

// arquero → RowTable at the library boundary. Invented rows (fixtures only).
const base = () =>
  aq.table({
    run: ['a', 'a', 'b', 'b', 'c'],
    seed: Float64Array.from([0, 0, 1, 1, 2]),
    width: Float64Array.from([4, 4, 8, 8, 16]),
    epochs: Float64Array.from([1, 2, 1, 2, 1]),
    train_size: Float64Array.from([100, 100, 100, 100, 100]),
    test_error: [0.5, 0.4, null, 0.3, 0.2],
    status: ['ok', 'ok', 'diverged', 'ok', 'ok'],
  });

describe('fromArquero', () => {
  it('keeps the active rows in the table order (filter, orderby), numbers as Float64Array with NaN for null', () => {
    const t = base().filter((d: { width: number }) => d.width >= 8).orderby(aq.desc('epochs'));
    const r = fromArquero(t);
    expect(r.length).toBe(3);
    // desc(epochs) is stable over the filtered rows b/2, b/1, c/1: b@2 first, then b@1 and c@1 in row order.
    expect(r.run).toEqual(['b', 'b', 'c']);
    expect(Array.from(r.epochs)).toEqual([2, 1, 1]);
    expect(r.test_error).toBeInstanceOf(Float64Array);
    expect(Array.from(r.test_error)).toEqual([0.3, NaN, 0.2]);
    expect(r.status).toEqual(['ok', 'diverged', 'ok']);
  });

  it('fills the columns the table lacks with the store defaults (label_noise 0, condition "", NaN metrics)', () => {
    const r = fromArquero(base());
    expect(Array.from(r.label_noise)).toEqual([0, 0, 0, 0, 0]);
    expect(r.condition).toEqual(['', '', '', '', '']);
    expect(Number.isNaN(r.train_error[0])).toBe(true);
  });

  it('shares an unfiltered Float64Array column instead of copying it; a filtered one is a new array', () => {
    const t = base();
    expect(fromArquero(t).width).toBe(t.column('width'));
    expect(fromArquero(t.filter((d: { seed: number }) => d.seed > 0)).width).not.toBe(t.column('width'));
  });

  it('keeps derived numeric columns as extras', () => {
    const t = base().derive({ log_width: (d: { width: number }) => Math.log2(d.width) });
    expect(Array.from(fromArquero(t).extra.log_width)).toEqual([2, 2, 3, 3, 4]);
  });

  it('names the canonical columns a table lacks', () => {
    expect(() => fromArquero(base().select('run', 'seed', 'width'))).toThrow(/lacks the columns epochs, train_size/);
    expect(() => fromArquero(base().select('run', 'seed', 'width'))).toThrow(UserError);
  });
});

describe('rowsOf', () => {
  it('passes a RowTable through and refuses what holds no rows', () => {
    const t = tableFromRows([{ run: 'r', width: 4, epochs: 1, train_size: 10, test_error: 0.5 }]);
    expect(rowsOf(t)).toBe(t);
    expect(() => rowsOf({} as never)).toThrow(UserError);
    expect(() => rowsOf('store' as never)).toThrow(/expected rows/);
  });
});
