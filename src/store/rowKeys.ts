import type { RowTable } from './RowTable.js';
import { textReader } from './RowTable.js';

/**
 * The identities of rows, in one place. A row is one run at one logged epoch; a run is one
 * configuration (condition, label_noise, width, train_size) and one seed under one id; a cell is
 * one configuration at one epoch (its seeds' values are the cell's). Keys are strings joined by
 * NUL, which no id or condition holds (ingest escapes control characters).
 */
const SEP = '\u0000';

/** What a configuration is made of. */
export interface ConfigFields {
  condition: string;
  label_noise: number;
  width: number;
  train_size: number;
}

/** A configuration's key: a cell without its epoch. */
export function configKey(c: ConfigFields): string {
  return `${c.condition}${SEP}${c.label_noise}${SEP}${c.width}${SEP}${c.train_size}`;
}

/** A cell's key: its configuration at one epoch. */
export function cellKey(c: ConfigFields & { epochs: number }): string {
  return `${configKey(c)}${SEP}${c.epochs}`;
}

/** Readers of a table's run and condition text (through its dictionary codes when it has them). */
export interface RowText {
  run(i: number): string;
  condition(i: number): string;
}

export function rowText(table: RowTable): RowText {
  return { run: textReader(table, 'run'), condition: textReader(table, 'condition') };
}

/** Row i's configuration key. */
export function rowConfigKey(table: RowTable, text: RowText, i: number): string {
  return `${text.condition(i)}${SEP}${table.label_noise[i]}${SEP}${table.width[i]}${SEP}${table.train_size[i]}`;
}

/**
 * Row i's run key: its id, configuration and seed. An id reused across configurations or seeds
 * names several runs; an empty id is told apart by configuration and seed alone.
 */
export function runKey(table: RowTable, text: RowText, i: number): string {
  return `${text.run(i)}${SEP}${rowConfigKey(table, text, i)}${SEP}${table.seed[i]}`;
}

/** Whether rows i and j belong to the same run (the fields of runKey, compared without building it). */
export function sameRun(table: RowTable, text: RowText, i: number, j: number): boolean {
  return (
    Object.is(table.width[i], table.width[j]) &&
    Object.is(table.train_size[i], table.train_size[j]) &&
    Object.is(table.seed[i], table.seed[j]) &&
    Object.is(table.label_noise[i], table.label_noise[j]) &&
    text.run(i) === text.run(j) &&
    text.condition(i) === text.condition(j)
  );
}

/**
 * Calls `fn(runKey, row)` for each row of `rows` (all rows when null), in order. A run's rows are
 * nearly always contiguous, so its key string is built once per stretch of one run, not per row.
 */
export function eachRunKey(table: RowTable, rows: ArrayLike<number> | null, fn: (key: string, i: number) => void): void {
  const text = rowText(table);
  const n = rows ? rows.length : table.length;
  let key = '';
  let prev = -1;
  for (let r = 0; r < n; r++) {
    const i = rows ? rows[r] : r;
    if (prev < 0 || !sameRun(table, text, i, prev)) key = runKey(table, text, i);
    prev = i;
    fn(key, i);
  }
}
