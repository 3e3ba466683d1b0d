import { NUMERIC_COLUMNS } from '../store/RowTable.js';
import type { RowTable, TextColumn } from '../store/RowTable.js';
import { textReader } from '../store/RowTable.js';
import { DictionaryBuilder, TEXT_COLUMNS } from '../store/textCodes.js';
import { concatTable } from '../store/concatTable.js';
import type { Concatenation, TablePiece } from '../store/concatTable.js';
import type { Reject } from '../store/Reject.js';
import { ingestText } from '../messages.js';
import { selectRows } from '../store/selectRows.js';

export interface MergeInput {
  /** Accepted rows of one source. */
  table: RowTable;
  /** Modification time of the source (ms); the newest source wins a conflict. */
  mtime: number;
}

export interface MergeResult {
  table: RowTable;
  /** Per input: rows kept, exact duplicates dropped, rows that lost a conflict. */
  accepted: number[];
  duplicates: number[];
  conflictLost: number[];
  /** Conflict losers (incoming and earlier stored rows) for rejected.csv. */
  rejects: Reject[];
  /** Conflicts found (same run and epoch, different values). */
  conflicts: number;
  /** Stored rows from earlier ingests that lost a conflict to a newer source. */
  displaced: number;
  /**
   * Rows that completed another row of the same run and epoch instead of conflicting with it
   * (each holds values only where the other has none: train and test metrics logged on separate
   * lines or files). Counted among the duplicates.
   */
  merged: number;
}

const KEPT = 0;
const DUPLICATE = 1;
const LOST = 2;

const same = (a: number, b: number) => a === b || (a !== a && b !== b);

/**
 * Merges new rows into the stored ones. A row is one run at one epoch: the same (run, epochs)
 * with equal values is a duplicate (dropped and counted); with different values it is a
 * conflict: the row from the newer source (mtime; later line within one source) wins and the
 * loser goes to rejected.csv with reason `conflict`.
 */
export function mergeTables(opts: { existing: RowTable; existingMtime: (source: string) => number; incoming: MergeInput[] }): MergeResult {
  const { existing, existingMtime, incoming } = opts;
  const tables = [existing, ...incoming.map((x) => x.table)];
  const mtimes = [NaN, ...incoming.map((x) => x.mtime)];
  let total = 0;
  const offset = tables.map((t) => {
    const o = total;
    total += t.length;
    return o;
  });
  // Text through each table's codes when it has them (store reads and worker results do): the
  // merge never builds a million-element string array.
  // Readers are made when first needed: only `run` is read for every table; the others only for
  // rows that meet another row of their run and epoch.
  const text = (name: TextColumn) => {
    const readers: ((i: number) => string)[] = [];
    return (ti: number, i: number) => (readers[ti] ??= textReader(tables[ti], name))(i);
  };
  const conditionOf = text('condition');
  const sourceOf = text('source');
  const statusOf = text('status');
  const disposition = new Uint8Array(total);
  const tableOf = new Int32Array(total);
  tables.forEach((t, ti) => tableOf.fill(ti, offset[ti], offset[ti] + t.length));
  const mtimeOf = (slot: number) => {
    const ti = tableOf[slot];
    return ti === 0 ? existingMtime(sourceOf(0, slot)) : mtimes[ti];
  };
  const extraNames = [...new Set(tables.flatMap((t) => Object.keys(t.extra)))];
  const equal = (a: number, b: number): boolean => {
    const ta = tables[tableOf[a]];
    const tb = tables[tableOf[b]];
    const ia = a - offset[tableOf[a]];
    const ib = b - offset[tableOf[b]];
    for (const c of NUMERIC_COLUMNS) if (!same(ta[c][ia], tb[c][ib])) return false;
    if (statusOf(tableOf[a], ia) !== statusOf(tableOf[b], ib) || conditionOf(tableOf[a], ia) !== conditionOf(tableOf[b], ib)) return false;
    for (const e of extraNames) if (!same(ta.extra[e]?.[ia] ?? NaN, tb.extra[e]?.[ib] ?? NaN)) return false;
    return true;
  };
  // Same run and epoch, and every value either equal or missing on one side.
  const complementary = (a: number, b: number): boolean => {
    const ta = tables[tableOf[a]];
    const tb = tables[tableOf[b]];
    const ia = a - offset[tableOf[a]];
    const ib = b - offset[tableOf[b]];
    if (statusOf(tableOf[a], ia) !== statusOf(tableOf[b], ib) || conditionOf(tableOf[a], ia) !== conditionOf(tableOf[b], ib)) return false;
    for (const c of NUMERIC_COLUMNS) {
      const x = ta[c][ia];
      const y = tb[c][ib];
      if (!(same(x, y) || x !== x || y !== y)) return false;
    }
    for (const e of extraNames) {
      const x = ta.extra[e]?.[ia] ?? NaN;
      const y = tb.extra[e]?.[ib] ?? NaN;
      if (!(same(x, y) || x !== x || y !== y)) return false;
    }
    return true;
  };
  // Fills the holder's missing values from the other row (the holder keeps its provenance).
  const complete = (holder: number, from: number) => {
    const th = tables[tableOf[holder]];
    const tf = tables[tableOf[from]];
    const ih = holder - offset[tableOf[holder]];
    const iff = from - offset[tableOf[from]];
    for (const c of NUMERIC_COLUMNS) if (th[c][ih] !== th[c][ih]) th[c][ih] = tf[c][iff];
    for (const e of extraNames) {
      const v = tf.extra[e]?.[iff];
      if (v === undefined || v !== v) continue;
      if (!th.extra[e]) th.extra[e] = new Float64Array(th.length).fill(NaN);
      if (th.extra[e][ih] !== th.extra[e][ih]) th.extra[e][ih] = v;
    }
  };
  let merged = 0;
  const rowOf = (slot: number) => {
    const ti = tableOf[slot];
    return { t: tables[ti], ti, i: slot - offset[ti] };
  };

  // Run id → its rows. A run seen once in one contiguous block with increasing epochs (the usual
  // layout) needs no per-epoch map; one is built only when the run shows up again.
  interface RunEntry {
    blocks: [number, number][];
    byEpoch: Map<number, number> | null;
  }
  const index = new Map<string, RunEntry>();
  const rejects: Reject[] = [];
  let conflicts = 0;
  const place = (byEpoch: Map<number, number>, run: string, slot: number, ti: number, ep: number) => {
    const holder = byEpoch.get(ep);
    if (holder === undefined) {
      byEpoch.set(ep, slot);
      return;
    }
    if (equal(holder, slot)) {
      disposition[slot] = DUPLICATE;
      return;
    }
    if (complementary(holder, slot)) {
      complete(holder, slot);
      disposition[slot] = DUPLICATE;
      merged++;
      return;
    }
    conflicts++;
    const newer = ti === 0 ? false : mtimeOf(slot) >= mtimeOf(holder);
    const loser = newer ? holder : slot;
    const winner = newer ? slot : holder;
    disposition[loser] = LOST;
    if (newer) byEpoch.set(ep, slot);
    const l = rowOf(loser);
    const w = rowOf(winner);
    rejects.push({ source: sourceOf(l.ti, l.i), line: l.t.source_line[l.i], field: 'run', reason: ingestText.conflict(run, ep, sourceOf(w.ti, w.i), w.t.source_line[w.i]) });
  };
  const materialize = (entry: RunEntry): Map<number, number> => {
    if (entry.byEpoch) return entry.byEpoch;
    const m = new Map<number, number>();
    for (const [s0, s1] of entry.blocks) {
      const { t, i } = rowOf(s0);
      const epochs = t.epochs;
      for (let s = s0; s < s1; s++) m.set(epochs[i + s - s0], s);
    }
    entry.byEpoch = m;
    return m;
  };
  // Older sources first, so a newer one arriving later in the same ingest wins its conflicts.
  const order = [0, ...incoming.map((_, k) => k + 1).sort((a, b) => mtimes[a] - mtimes[b] || a - b)];
  for (const ti of order) {
    const t = tables[ti];
    // A table of one run (a run's log) has one entry in its run dictionary: no per-row compare.
    const runCodes = t.codes?.run;
    const oneRun = runCodes?.dict.length === 1 ? runCodes.dict[0] : null;
    const runAt = oneRun !== null ? () => oneRun : textReader(t, 'run');
    // Read once: a worker's table holds some columns behind getters (its object is then slow to index).
    const epochs = t.epochs;
    const base = offset[ti];
    let i = 0;
    while (i < t.length) {
      const run = runAt(i);
      let j = i + 1;
      let increasing = true;
      if (oneRun !== null) {
        j = t.length;
        increasing = isIncreasing(epochs, i, j);
      } else {
        while (j < t.length && runAt(j) === run) {
          if (!(epochs[j] > epochs[j - 1])) increasing = false;
          j++;
        }
      }
      const entry = index.get(run);
      if (!entry && increasing) {
        index.set(run, { blocks: [[base + i, base + j]], byEpoch: null });
      } else {
        let e = entry;
        if (!e) index.set(run, (e = { blocks: [], byEpoch: new Map() }));
        const byEpoch = materialize(e);
        for (let r = i; r < j; r++) place(byEpoch, run, base + r, ti, epochs[r]);
      }
      i = j;
    }
  }

  const accepted = incoming.map(() => 0);
  const duplicates = incoming.map(() => 0);
  const conflictLost = incoming.map(() => 0);
  let kept = 0;
  let displaced = 0;
  for (let s = 0; s < total; s++) {
    const ti = tableOf[s];
    const d = disposition[s];
    if (d === KEPT) kept++;
    if (ti === 0) {
      if (d === LOST) displaced++;
      continue;
    }
    if (d === KEPT) accepted[ti - 1]++;
    else if (d === DUPLICATE) duplicates[ti - 1]++;
    else conflictLost[ti - 1]++;
  }
  // The kept rows are the input tables' rows one after another: described, not copied (the store
  // writer takes the pieces; a column is built only if read). Text goes out as codes over one
  // dictionary per column (what rows.arrow stores), never as strings.
  const pieces: TablePiece[] = [];
  tables.forEach((t, ti) => {
    const base = offset[ti];
    let all = true;
    for (let i = 0; i < t.length && all; i++) if (disposition[base + i] !== KEPT) all = false;
    if (all) {
      if (t.length > 0) pieces.push({ table: t, rows: null });
      return;
    }
    const keptRows: number[] = [];
    for (let i = 0; i < t.length; i++) if (disposition[base + i] === KEPT) keptRows.push(i);
    if (keptRows.length > 0) pieces.push({ table: t, rows: Int32Array.from(keptRows) });
  });
  const outText = {} as Concatenation['text'];
  for (const name of TEXT_COLUMNS) {
    const builder = new DictionaryBuilder();
    const codes = pieces.map((p) => pieceCodes({ piece: p, name, builder }));
    outText[name] = { dict: name === 'status' ? builder.dict.map((s) => (s === 'diverged' ? 'diverged' : 'ok')) : builder.dict, codes };
  }
  const out = concatTable({ length: kept, pieces, extraNames, text: outText });
  return { table: out, accepted, duplicates, conflictLost, rejects, conflicts, displaced, merged };
}

/** Whether a[from..to) strictly increases (a small function of its own: called per table, it is optimised early). */
function isIncreasing(a: Float64Array, from: number, to: number): boolean {
  for (let j = from + 1; j < to; j++) if (!(a[j] > a[j - 1])) return false;
  return true;
}

/** The rows of a table whose source is not in `drop` (a changed source's earlier rows are replaced). */
export function dropSources(t: RowTable, drop: ReadonlySet<string>): RowTable {
  if (drop.size === 0) return t;
  const source = textReader(t, 'source');
  const keep: number[] = [];
  for (let i = 0; i < t.length; i++) if (!drop.has(source(i))) keep.push(i);
  if (keep.length === t.length) return t;
  return selectRows(t, keep);
}

/**
 * A piece's codes in `builder`'s dictionary: the one code all its rows hold when its dictionary
 * has one entry, else an array (through the table's own codes when it has them: one lookup per
 * dictionary entry; else one lookup per stretch of equal strings).
 */
function pieceCodes(opts: { piece: TablePiece; name: TextColumn; builder: DictionaryBuilder }): Int32Array | number {
  const { piece, name, builder } = opts;
  const { table: t, rows } = piece;
  const n = rows ? rows.length : t.length;
  const coded = t.codes?.[name];
  if (coded?.dict.length === 1) return builder.code(coded.dict[0]);
  const dest = new Int32Array(n);
  if (coded) {
    const tr = builder.translator(coded.dict);
    const src = coded.codes;
    for (let r = 0; r < n; r++) dest[r] = tr(src[rows ? rows[r] : r]);
    return dest;
  }
  const col = t[name] as readonly string[];
  let last: string | undefined;
  let lastCode = -1;
  for (let r = 0; r < n; r++) {
    const v = col[rows ? rows[r] : r] ?? '';
    if (v !== last) {
      last = v;
      lastCode = builder.code(v);
    }
    dest[r] = lastCode;
  }
  return dest;
}
