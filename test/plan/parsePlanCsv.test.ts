import { describe, expect, it } from 'vitest';
import { parsePlanCsv } from '../../src/plan/parsePlanCsv.js';
import { planCsv } from '../../src/plan/planCsv.js';
import type { PlanResult, PlannedRun } from '../../src/plan/Plan.js';
import { UserError } from '../../src/UserError.js';

const planned = (over: Partial<PlannedRun>): PlannedRun => ({
  condition: '', label_noise: 0.1, width: 91, train_size: 100, seed: 0, epochs: 1000, reason: 'refine', cost: 1.5,
  resume_from: null, run: 'w91-n100-ln0.1-s0', status: 'new', score: 1, why: 'bisects 64–128, "quoted", and a, comma', ...over,
});
const plan = (runs: PlannedRun[]): PlanResult => ({
  budget: null, cost: 0, runs, dropped: { runs: 0, cost: 0 }, notes: [],
  model: { a: 2, c: 1, units: 'relative', exponentFitted: false, runs: 0, aSe: null, spread: null },
});

describe('parsePlanCsv', () => {
  it('reads back exactly what plan --emit csv writes (RFC 4180 quoting, spreadsheet guard undone)', () => {
    const runs = [
      planned({}),
      planned({ condition: '=cmd|x', width: 181, seed: 1, run: '-lead', why: 'line\nbreak' }),
      planned({ reason: 'resume', resume_from: 250, run: 'rf-s0-n100-w64-q0.1', width: 64, epochs: 4000 }),
    ];
    const back = parsePlanCsv(planCsv(plan(runs)), 'p.csv');
    expect(back.map(({ line: _line, ...r }) => r)).toEqual(
      runs.map((r) => ({ run: r.run, condition: r.condition, width: r.width, train_size: r.train_size, label_noise: r.label_noise, seed: r.seed, epochs: r.epochs, resume_from: r.resume_from })),
    );
    // Line numbers count physical records from the header (line 1).
    expect(back.map((r) => r.line)).toEqual([2, 3, 4]);
  });

  it('needs the run columns only; label_noise, condition, run and resume_from have defaults', () => {
    const r = parsePlanCsv('width,train_size,seed,epochs\n8,100,3,10\n', 'min.csv');
    expect(r).toEqual([{ line: 2, run: '', condition: '', width: 8, train_size: 100, label_noise: 0, seed: 3, epochs: 10, resume_from: null }]);
  });

  it('names file, line and column of a bad cell, and refuses duplicates and missing columns', () => {
    const bad = (text: string) => {
      try {
        parsePlanCsv(text, 'next.csv');
      } catch (e) {
        expect(e).toBeInstanceOf(UserError);
        expect((e as UserError).exitCode).toBe(1);
        return (e as Error).message;
      }
      throw new Error('no error');
    };
    expect(bad('width,train_size,seed,epochs\n8,100,0,10\n8.5,100,1,10\n')).toBe("next.csv line 3, column width: '8.5' is not a whole number >= 1");
    expect(bad('width,train_size,seed,epochs,resume_from\n8,100,0,10,10\n')).toContain('line 2, column resume_from');
    expect(bad('width,train_size,seed,epochs,label_noise\n8,100,0,10,1.5\n')).toContain('column label_noise');
    expect(bad('width,seed,epochs\n8,0,10\n')).toContain("no 'train_size' column");
    expect(bad('width,train_size,seed,epochs\n8,100,0,10\n8,100,0,20\n')).toBe('next.csv line 3: the run width 8, n 100, noise 0, seed 0 is already listed on line 2');
    expect(bad('width,train_size,seed,epochs\n8,100,"0\n')).toContain('not valid CSV');
  });
});
