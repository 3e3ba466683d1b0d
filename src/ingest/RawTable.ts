/**
 * What a reader hands to normalisation: the columns of one source as read (strings, numbers or
 * nothing), before mapping and validation. Columnar so a million-row file costs no row objects.
 */
import { NumTextColumn } from './NumTextColumn.js';

export type RawValue = string | number | boolean | null | undefined;
export type RawColumn = RawValue[] | Float64Array | NumTextColumn;

/** Cell i of a column, whatever its representation. */
export function cellAt(col: RawColumn, i: number): RawValue {
  if (col instanceof NumTextColumn) return col.at(i);
  return col[i];
}

export interface RawTable {
  format: string;
  /** Column names; nested JSON keys are dotted paths (`config.model.width`). */
  names: string[];
  columns: RawColumn[];
  length: number;
  /** 1-based line (text) or record number (JSON array, Arrow) of each row. */
  lines: number[];
  /**
   * Rows that could not be split into fields (bad JSON, wrong field count): row index → problem.
   * `skip` marks a line that is not a row at all (a repeated header): neither read nor rejected.
   */
  rowErrors: Map<number, { field: string; reason: string; skip?: boolean }>;
  /** Per-source constants (a run directory's config, the scalar keys of a JSON object file). */
  constants: Record<string, RawValue>;
  /** Line of an incomplete last row (a log still being written), or 0. */
  pendingLine: number;
  /** Text encoding when it was guessed (not UTF-8, no byte-order mark): noted to the user. */
  encoding?: string;
  /** Lines repeating the header (logs joined end to end), skipped: the first one and how many. */
  headerRepeats?: { line: number; count: number };
  /**
   * Records read but not runs (blocks of means over seeds, summaries): counted as read and as
   * `skipped`, never stored or rejected. The reader names them in `notes`.
   */
  skipped?: number;
  /** What the reader wants the user to know about this source (blocks skipped, key levels named). */
  notes?: string[];
  /** Per row: the keys naming its run on its path in a JSON document (`r1`, `w=4 (p=4,146)`), or ''. */
  runKeys?: string[];
  /** Columns holding run-level values (inherited from an enclosing record or key): ranked after a row's own. */
  runLevel?: Set<string>;
  /**
   * Columns that are settings of a run: key levels (`key1`, `--keys` names) and the scalars of a
   * record that holds a curve. They join the condition unless they are axes or outcomes.
   */
  settingColumns?: Set<string>;
  /** Run-level columns that are outcomes whatever their names (a run folder's metrics-file scalars): extras, never conditions. */
  outcomeColumns?: Set<string>;
  /** How a JSON document was read: key levels, curves expanded, arrays not read, summary blocks. */
  jsonLayout?: JsonLayout;
}

export interface JsonLayout {
  levels: { column: string; path: string; how: 'keys' | 'parent' | 'unnamed' | 'pairs' | 'run'; values: string[]; count: number; distinct?: number }[];
  curves: { path: string; key: string; records: number; rows: number }[];
  /** `length`: the longest of them; `times`: how many records repeat it (absent = once). */
  unread: { path: string; length: number; what: 'values' | 'lists' | 'mixed'; times?: number }[];
  summaries: { path: string; rows: number; reason: 'key' | 'names' }[];
  /** Curves without an epoch key whose points were numbered 1..n as epochs. */
  numbered?: { path: string; curves: number }[];
  /** Sibling curves keyed by split (`train`, `test`) joined per epoch into one run. */
  joined?: { path: string; keys: string[]; records: number }[];
  /** Settings keyed by number (`lr_schedule`) or lists in a config block: named, not read as rows. */
  settings?: { path: string; keys: string[]; times: number }[];
  /** Names of --keys past the deepest level of value keys the document has. */
  unusedKeys?: string[];
}

export function emptyRaw(format: string): RawTable {
  return { format, names: [], columns: [], length: 0, lines: [], rowErrors: new Map(), constants: {}, pendingLine: 0 };
}

/** Builds a RawTable from records whose keys vary (JSON): new keys get a column padded with undefined. */
export class RecordColumns {
  readonly raw: RawTable;
  private readonly index = new Map<string, number>();
  constructor(format: string) {
    this.raw = emptyRaw(format);
  }

  /** Adds one flattened record as the next row. */
  add(flat: Record<string, RawValue>, line: number): void {
    const raw = this.raw;
    const row = raw.length;
    for (const key in flat) {
      let j = this.index.get(key);
      if (j === undefined) {
        j = raw.names.length;
        this.index.set(key, j);
        raw.names.push(key);
        raw.columns.push(new Array<RawValue>(row));
      }
      (raw.columns[j] as RawValue[])[row] = flat[key];
    }
    raw.lines.push(line);
    raw.length = row + 1;
  }

  // The last inherited-fields object and the last own key order, with their columns: a curve's
  // points share both, so a million points cost no key lookups.
  private lastBase: object | null = null;
  private baseKeys: string[] = [];
  private baseCols: number[] = [];
  private readonly ownKeys: string[] = [];
  private readonly ownCols: number[] = [];

  /** Adds one row made of inherited fields and its own (own win where both have a key): no merged object. */
  addMerged(base: Record<string, RawValue>, own: Record<string, RawValue>, line: number): void {
    const raw = this.raw;
    const row = raw.length;
    const cols = raw.columns as RawValue[][];
    if (base !== this.lastBase) {
      this.lastBase = base;
      this.baseKeys = Object.keys(base);
      this.baseCols = this.baseKeys.map((k) => this.col(k, row));
    }
    const bk = this.baseKeys;
    const bc = this.baseCols;
    for (let i = 0; i < bk.length; i++) cols[bc[i]][row] = base[bk[i]];
    const ok = this.ownKeys;
    const oc = this.ownCols;
    let i = 0;
    for (const key in own) {
      let j: number;
      if (i < ok.length && ok[i] === key) j = oc[i];
      else {
        j = this.col(key, row);
        ok[i] = key;
        oc[i] = j;
      }
      cols[j][row] = own[key];
      i++;
    }
    raw.lines.push(line);
    raw.length = row + 1;
  }

  /** The column of a key, made (padded to `row` rows) when new. */
  private col(key: string, row: number): number {
    let j = this.index.get(key);
    if (j === undefined) {
      j = this.raw.names.length;
      this.index.set(key, j);
      this.raw.names.push(key);
      this.raw.columns.push(new Array<RawValue>(row));
    }
    return j;
  }

  /** Adds a row that could not be read at all (it still counts as read, and is rejected). */
  addError(line: number, reason: string, field = ''): void {
    this.raw.rowErrors.set(this.raw.length, { field, reason });
    this.raw.lines.push(line);
    this.raw.length++;
  }

  finish(): RawTable {
    for (const col of this.raw.columns) (col as RawValue[]).length = this.raw.length;
    return this.raw;
  }
}

/** Flattens nested objects into dotted keys; arrays inside a record are left out. */
export function flattenRecord(obj: Record<string, unknown>, prefix = '', out: Record<string, RawValue> = {}): Record<string, RawValue> {
  for (const key in obj) {
    const v = obj[key];
    const name = prefix === '' ? key : `${prefix}.${key}`;
    if (v !== null && typeof v === 'object') {
      if (!Array.isArray(v)) flattenRecord(v as Record<string, unknown>, name, out);
    } else out[name] = v as RawValue;
  }
  return out;
}
