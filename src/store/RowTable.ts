/**
 * The canonical in-memory table of a sweep: one row = one run at one logged epoch.
 * Columnar (typed arrays) so a million rows cost a few tens of MB and no per-row objects.
 * Missing numeric values are NaN; `condition` is "" when the sweep has none.
 */
export const RUN_STATUS = ['ok', 'diverged'] as const;
export type RunStatus = (typeof RUN_STATUS)[number];

/** Numeric canonical columns, in store order. */
export const NUMERIC_COLUMNS = [
  'seed',
  'width',
  'epochs',
  'train_size',
  'label_noise',
  'test_error',
  'train_error',
  'test_loss',
  'train_loss',
  'wall_seconds',
] as const;
export type NumericColumn = (typeof NUMERIC_COLUMNS)[number];

/** String canonical columns, in store order. */
export const STRING_COLUMNS = ['run', 'condition', 'source'] as const;
export type StringColumn = (typeof STRING_COLUMNS)[number];

/** The four sweep axes a map can be drawn over (condition keys come on top). */
export const AXES = ['width', 'epochs', 'train_size', 'label_noise'] as const;
export type Axis = (typeof AXES)[number];

/** The metrics a map, ridge or hurts analysis can be computed on. */
export const METRICS = ['test_error', 'test_loss', 'train_error', 'train_loss'] as const;
export type Metric = (typeof METRICS)[number];

export interface RowTable {
  readonly length: number;
  readonly run: string[];
  readonly condition: string[];
  /** File path as given on the command line (or "-" for stdin). */
  readonly source: string[];
  /** 1-based line (text formats) or record number (JSON array, Arrow). */
  readonly source_line: Int32Array;
  readonly status: RunStatus[];
  readonly seed: Float64Array;
  readonly width: Float64Array;
  readonly epochs: Float64Array;
  readonly train_size: Float64Array;
  readonly label_noise: Float64Array;
  readonly test_error: Float64Array;
  readonly train_error: Float64Array;
  readonly test_loss: Float64Array;
  readonly train_loss: Float64Array;
  readonly wall_seconds: Float64Array;
  /**
   * Extra numeric per-row columns the logs carried that are neither axes nor metrics
   * (e.g. the linear simulator's `sigma2`, `signal_in`, `signal_out`). Kept, never used to split cells.
   */
  readonly extra: Record<string, Float64Array>;
  /**
   * Text columns as dictionary codes, when the table has them (a store read from rows.arrow, the
   * table an ingest merged):
   * row i holds dict[codes[i]]. Row loops over a whole store read these instead of the string
   * arrays, which are then never built (a million-element array costs ~40 ms, mostly in faulting
   * in fresh memory). Never written to: a derived table has none.
   */
  readonly codes?: Partial<Record<TextColumn, TextCodes>>;
  /**
   * Number columns known to hold one value in every row (a worker's result: a run's log repeats
   * its width, size, seed and noise on every line, and lacks whole metrics). The merge fills
   * these instead of copying them; such a column is built only when read, and reading it drops
   * its entry here (the reader may then write to it).
   */
  readonly constants?: Partial<Record<NumericColumn, number>>;
}

/** The text columns (status included). */
export type TextColumn = 'run' | 'condition' | 'source' | 'status';

/** A dictionary-coded text column (as in rows.arrow); every entry of `dict` is used by some row. */
export interface TextCodes {
  readonly codes: Int32Array;
  readonly dict: readonly string[];
}

/** Row i of a text column, through its codes when the table has them. */
export function textReader<C extends TextColumn>(t: RowTable, name: C): (i: number) => RowTable[C][number] {
  const coded = t.codes?.[name];
  if (coded) {
    const { codes, dict } = coded;
    return (i) => dict[codes[i]] as RowTable[C][number];
  }
  const col = t[name];
  return (i) => col[i] as RowTable[C][number];
}

/** The distinct values of a text column (its dictionary when coded: every entry is used). */
export function textValues(t: RowTable, name: TextColumn): string[] {
  const coded = t.codes?.[name];
  return coded ? [...new Set(coded.dict)] : [...new Set<string>(t[name])];
}

/** An empty table with `length` rows: numbers NaN, strings "", status "ok". */
export function emptyTable(length: number, extraNames: readonly string[] = []): RowTable {
  const num = () => new Float64Array(length).fill(NaN);
  const extra: Record<string, Float64Array> = {};
  for (const name of extraNames) extra[name] = num();
  return {
    length,
    run: new Array<string>(length).fill(''),
    condition: new Array<string>(length).fill(''),
    source: new Array<string>(length).fill(''),
    source_line: new Int32Array(length),
    status: new Array<RunStatus>(length).fill('ok'),
    seed: num(),
    width: num(),
    epochs: num(),
    train_size: num(),
    label_noise: new Float64Array(length),
    test_error: num(),
    train_error: num(),
    test_loss: num(),
    train_loss: num(),
    wall_seconds: num(),
    extra,
  };
}

/**
 * A table of `length` rows with its columns allocated but not filled (numbers hold whatever the
 * memory held, text unset), for writers that set every canonical column of every row: filling
 * first would cost a pass over each column (ingest does this per file and again for the merged
 * million rows). Extras are NaN-filled since a writer may lack some of them. `text: false` leaves
 * the text columns empty, for a writer that attaches them as codes (attachTextCodes).
 */
export function allocTable(length: number, extraNames: readonly string[] = [], opts: { text?: boolean } = {}): RowTable {
  const { text: withText = true } = opts;
  // All number columns are views into one buffer: ingest allocates a table per file, and a dozen
  // typed arrays with their own backing stores cost ~20 µs each (a quarter second per worker on
  // the 2,000-file bench sweep); one allocation is cheap, and posting the table transfers it once.
  // Uninitialised (allocUnsafeSlow: never the shared pool, so the buffer can be transferred):
  // zero-filling the merged 84 MB first cost ~0.2 s.
  const bytes = length * 8 * (10 + extraNames.length) + length * 4;
  const buffer = Buffer.allocUnsafeSlow(bytes).buffer as ArrayBuffer;
  let offset = 0;
  const f64 = () => {
    const a = new Float64Array(buffer, offset, length);
    offset += length * 8;
    return a;
  };
  const extra: Record<string, Float64Array> = {};
  for (const name of extraNames) extra[name] = f64().fill(NaN);
  const text = () => (withText ? new Array<string>(length) : []);
  return {
    length,
    run: text(),
    condition: text(),
    source: text(),
    // After the ten canonical and the extra number columns (int32 needs only 4-byte alignment).
    source_line: new Int32Array(buffer, length * 8 * (10 + extraNames.length), length),
    status: (withText ? new Array<RunStatus>(length) : []) as RunStatus[],
    seed: f64(),
    width: f64(),
    epochs: f64(),
    train_size: f64(),
    label_noise: f64(),
    test_error: f64(),
    train_error: f64(),
    test_loss: f64(),
    train_loss: f64(),
    wall_seconds: f64(),
    extra,
  };
}

/** Which metric a sweep supports by default: test_error when any row has it, else test_loss. */
export function defaultMetric(table: RowTable): Metric {
  for (let i = 0; i < table.length; i++) if (Number.isFinite(table.test_error[i])) return 'test_error';
  return 'test_loss';
}
