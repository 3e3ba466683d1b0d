import { emptyTable, NUMERIC_COLUMNS } from './RowTable.js';
import type { RowTable, RunStatus } from './RowTable.js';

/** A row as a plain object: handy for tests, fixtures and small generated sweeps. */
export interface RowRecord {
  run: string;
  condition: string;
  source: string;
  source_line: number;
  status: RunStatus;
  seed: number;
  width: number;
  epochs: number;
  train_size: number;
  label_noise: number;
  test_error: number;
  train_error: number;
  test_loss: number;
  train_loss: number;
  wall_seconds: number;
  extra: Record<string, number>;
}

/** Builds a RowTable from row objects; absent fields take the emptyTable defaults. */
export function tableFromRows(rows: readonly Partial<RowRecord>[]): RowTable {
  const extraNames = [...new Set(rows.flatMap((r) => Object.keys(r.extra ?? {})))];
  const t = emptyTable(rows.length, extraNames);
  rows.forEach((r, i) => {
    if (r.run !== undefined) t.run[i] = r.run;
    if (r.condition !== undefined) t.condition[i] = r.condition;
    if (r.source !== undefined) t.source[i] = r.source;
    if (r.source_line !== undefined) t.source_line[i] = r.source_line;
    if (r.status !== undefined) t.status[i] = r.status;
    for (const c of NUMERIC_COLUMNS) {
      const v = r[c];
      if (v !== undefined) t[c][i] = v;
    }
    for (const [k, v] of Object.entries(r.extra ?? {})) t.extra[k][i] = v;
  });
  return t;
}

/** The rows of a table as objects (the inverse of tableFromRows). */
export function tableToRows(t: RowTable): RowRecord[] {
  const out: RowRecord[] = [];
  for (let i = 0; i < t.length; i++) {
    const extra: Record<string, number> = {};
    for (const [k, col] of Object.entries(t.extra)) extra[k] = col[i];
    out.push({
      run: t.run[i],
      condition: t.condition[i],
      source: t.source[i],
      source_line: t.source_line[i],
      status: t.status[i],
      seed: t.seed[i],
      width: t.width[i],
      epochs: t.epochs[i],
      train_size: t.train_size[i],
      label_noise: t.label_noise[i],
      test_error: t.test_error[i],
      train_error: t.train_error[i],
      test_loss: t.test_loss[i],
      train_loss: t.train_loss[i],
      wall_seconds: t.wall_seconds[i],
      extra,
    });
  }
  return out;
}
