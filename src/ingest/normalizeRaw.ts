import { allocTable, emptyTable, NUMERIC_COLUMNS } from '../store/RowTable.js';
import type { NumericColumn, RowTable, RunStatus } from '../store/RowTable.js';
import { cellAt } from './RawTable.js';
import type { RawColumn, RawTable, RawValue } from './RawTable.js';
import { CELL_BAD, CELL_MISSING, CELL_NONFINITE, isNumericColumn, notNumberHint, parseColumn } from './parseNumbers.js';
import type { ParsedColumn } from './parseNumbers.js';
import { isFractionTarget, matchTarget, nameKey, nameWords, TARGETS } from './synonyms.js';
import { conditionKey, hasConfigPrefix, isDerived, isNotCondition, isOutcome, outcomeMetric } from './fieldKinds.js';
import type { Target } from './synonyms.js';
import { ingestText, layoutText } from '../messages.js';
import type { Reject } from '../store/Reject.js';
import { formatCondition } from '../store/conditionText.js';
import { AXIS_RANGE } from './ReadLimits.js';
import { splitLongRows } from './splitColumn.js';

export type Scale = 'percent' | 'fraction';

export interface NormalizeOptions {
  /** Source path as given (goes into the `source` column and rejected.csv). */
  source: string;
  /** Explicit mapping canonical target → source column name or dotted path. */
  map?: Partial<Record<Target, string>>;
  /** Constants for keys a source lacks (`train_size=4000`); non-canonical keys join the condition. */
  set?: Record<string, string>;
  /** Takes the seed from the source path when it has no seed column (first capture group). */
  seedFrom?: RegExp;
  /** Forces percent (÷100) or fraction for an error/accuracy/noise column; default: detected. */
  scale?: Partial<Record<Target, Scale>>;
  /** Columns that join the condition whatever they hold (`--condition COL`). */
  condition?: string[];
}

/** What was read from one source: where each canonical column came from, and how. */
export interface SourceLayout {
  /** canonical → source column (or `config key`, `--set`, `key of 'per_seed'`). */
  mapping: Record<string, string>;
  /** canonical → other columns that could have served, passed over. */
  passedOver: Record<string, string[]>;
  /** Key levels named, curves expanded, arrays not read, summary blocks skipped (one line each). */
  structure: string[];
  /** condition → runs. */
  conditions: Record<string, number>;
}

export type { Reject };

export interface Normalized {
  /** Accepted rows of this source, in source order. */
  table: RowTable;
  rejects: Reject[];
  /** Rows read (accepted + rejected + pending + skipped; duplicates are found later, across sources). */
  read: number;
  pending: number;
  /** Records read that are not runs (summaries over seeds): see RawTable.skipped. */
  skipped: number;
  /** canonical target → where it came from (`column`, `config key`, `--set`). */
  mapping: Record<string, string>;
  /** Things the user should know (a column read as percent, a skipped label column). */
  notes: string[];
  layout?: SourceLayout;
  /** Set when the source is not a log at all (a plan of runs to do): skipped whole, its rows not read. */
  notLog?: string;
}

/** Columns only a plan of runs carries (`datlas plan --emit csv` writes them): why a run is proposed, what it sharpens. */
const PLAN_ONLY = new Set(['why', 'sharpens', 'resumefrom']);

const DEFAULT_SEED_FROM = /seed[_\-=]?(\d+)/i;
/** A per-row text column with more distinct values than this is an identifier, not a condition. */
const MAX_CONDITION_LEVELS = 64;

function findName(names: readonly string[], wanted: string): number {
  let j = names.indexOf(wanted);
  if (j >= 0) return j;
  const k = nameKey(wanted);
  j = names.findIndex((n) => nameKey(n) === k);
  return j;
}

const text = (v: RawValue): string => (v === undefined || v === null ? '' : typeof v === 'number' ? String(v) : String(v).trim());

function numberOf(v: RawValue): { value: number; kind: number } {
  const p = parseColumn([v], 1);
  return { value: p.values[0], kind: p.kind[0] };
}

const METRIC_TARGETS_ALL = ['test_error', 'train_error', 'test_loss', 'train_loss', 'test_accuracy', 'train_accuracy'] as const;

/** `name<number>` pairs of a folder name (`w8_seed0`, `width_64`, `noise=0.2`). */
function folderPairs(folder: string): [string, string][] {
  const out: [string, string][] = [];
  for (const m of folder.matchAll(/(?:^|[_\-,\s.])([A-Za-z]+)[=_\-]?(\d+(?:\.\d+)?)(?=$|[_\-,\s])/g)) out.push([m[1], m[2]]);
  return out;
}

/** Whether two columns never both hold a value on one row (one metric spelt two ways in different records). */
function disjoint(raw: RawTable, a: number, b: number): boolean {
  const has = (v: RawValue) => v !== undefined && v !== null && v !== '';
  let any = false;
  for (let i = 0; i < raw.length; i++) {
    const x = has(cellAt(raw.columns[a], i));
    const y = has(cellAt(raw.columns[b], i));
    if (x && y) return false;
    if (y) any = true;
  }
  return any;
}

/** Bare metric names (no split word) and the training target they are beside a held-out twin. */
const BARE_METRICS: Record<string, Target> = { accuracy: 'train_accuracy', acc: 'train_accuracy', loss: 'train_loss', error: 'train_error',
  err: 'train_error', mse: 'train_loss' };

/**
 * Columns holding a bare metric (`accuracy`, `loss`) whose held-out twin (`val_accuracy`,
 * `test_loss`) is also present: the bare one is measured on the training data (per-epoch
 * histories write `loss, accuracy, val_loss, val_accuracy`), so it maps to the train target.
 */
function heldOutTwins(names: readonly string[]): Map<string, { target: Target; heldOut: string }> {
  const out = new Map<string, { target: Target; heldOut: string }>();
  const keys = new Map<string, string>();
  for (const n of names) keys.set(nameKey(n.slice(n.lastIndexOf('.') + 1)), n);
  for (const n of names) {
    const bare = nameKey(n.slice(n.lastIndexOf('.') + 1));
    const target = BARE_METRICS[bare];
    if (!target) continue;
    for (const split of ['val', 'valid', 'validation', 'test', 'eval', 'dev']) {
      const twin = keys.get(split + bare);
      if (twin !== undefined) {
        out.set(n, { target, heldOut: twin });
        break;
      }
    }
  }
  return out;
}

/** A width written with a letter before or after its number (`4x`, `w64`, `width=8`, `k_16`), or null. */
function widthText(cell: string): number | null {
  const m = /^(?:w|width|k|h|hidden|x)?\s*[_=:\-]?\s*(\d+(?:\.\d+)?)\s*(?:x|w|×)?$/i.exec(cell.trim());
  if (!m) return null;
  const v = Number(m[1]);
  return v > 0 ? v : null;
}

/** The columns a source's stages read: targets found, constants, conditions and extras. */
interface ColumnPlan {
  mapping: Record<string, string>;
  colOf: Partial<Record<Target, number>>;
  constOf: Partial<Record<Target, RawValue>>;
  passedOver: Record<string, string[]>;
  condFixed: Map<string, string>;
  constExtras: { name: string; value: number }[];
  extraCols: { name: string; j: number }[];
  condCols: { key: string; j: number }[];
}

/**
 * Stages 1–4 of normalisation: explicit mapping and synonyms (with final_/last_ outcomes standing
 * in for a missing metric), constants (config keys, --set), params, and the columns left over
 * (extra measurements, or conditions when they are settings).
 */
function mapColumns(raw: RawTable, o: { source: string; map: Partial<Record<Target, string>>; set: Record<string, string>; conditionNames: string[]; notes: string[] }): ColumnPlan {
  const { source, map, set, conditionNames, notes } = o;
  const n = raw.length;
  const mapping: Record<string, string> = {};
  const colOf: Partial<Record<Target, number>> = {};
  const constOf: Partial<Record<Target, RawValue>> = {};
  const used = new Set<number>();

  // 1. Explicit mapping, then synonyms (best-ranked synonym wins).
  const constNames = Object.keys(raw.constants);
  for (const [t, src] of Object.entries(map) as [Target, string][]) {
    const j = findName(raw.names, src);
    if (j >= 0) {
      colOf[t] = j;
      used.add(j);
      mapping[t] = raw.names[j];
    } else {
      const c = findName(constNames, src);
      if (c >= 0) {
        constOf[t] = raw.constants[constNames[c]];
        mapping[t] = `config ${constNames[c]}`;
      }
    }
  }
  const bestRank: Partial<Record<Target, number>> = {};
  const twinNotes: string[] = [];
  const candidates: Partial<Record<Target, string[]>> = {};
  const runLevel = raw.runLevel;
  const forcedCondition = new Set(conditionNames.map((c) => findName(raw.names, c)).filter((j) => j >= 0));
  const twins = heldOutTwins(raw.names);
  raw.names.forEach((name, j) => {
    if (used.has(j) || forcedCondition.has(j)) return;
    const twin = twins.get(name);
    if (twin && !(twin.target in map)) {
      // Bare `accuracy` beside `val_accuracy` (a per-epoch history): the training metric.
      (candidates[twin.target] ??= []).push(name);
      if (bestRank[twin.target] === undefined || 50 < bestRank[twin.target]!) {
        bestRank[twin.target] = 50;
        colOf[twin.target] = j;
      }
      twinNotes.push(layoutText.heldOutTwin(source, name, twin.target, twin.heldOut));
      return;
    }
    // A row's own key beats one its record or a key above it gave (a curve point's `epoch` beats
    // the run's planned `epochs`); a config key (`config.width` of a JSON Lines row) comes last.
    const inConfig = hasConfigPrefix(name);
    const m = matchTarget(inConfig ? conditionKey(name) : name);
    if (!m || m.target in map) return;
    const rank = m.rank + (inConfig ? 300 : 0) + (runLevel?.has(name) ? 50 : 0);
    (candidates[m.target] ??= []).push(name);
    if (bestRank[m.target] === undefined || rank < bestRank[m.target]!) {
      bestRank[m.target] = rank;
      colOf[m.target] = j;
    }
  });
  // A run-level final_/last_ metric stands for the metric when no curve holds it (never best_).
  const outcomeNotes: string[] = [];
  for (const [metric, acc] of [['test_error', 'test_accuracy'], ['test_loss', null], ['train_error', 'train_accuracy'], ['train_loss', null]] as const) {
    if (colOf[metric] !== undefined || (acc && colOf[acc] !== undefined) || metric in map || (acc && acc in map)) continue;
    const j = raw.names.findIndex((name, jj) => {
      if (used.has(jj)) return false;
      const o = outcomeMetric(name);
      return o !== null && o.prefix !== 'best' && (o.target === metric || o.target === acc);
    });
    if (j < 0) continue;
    const o = outcomeMetric(raw.names[j])!;
    colOf[o.target] = j;
    outcomeNotes.push(layoutText.outcomeMetric(source, raw.names[j], o.target));
  }
  // One metric per file (`Wall time, Step, Value` exports): a `value` column is the metric the file is named after.
  if (!METRIC_TARGETS_ALL.some((t) => colOf[t] !== undefined || t in map)) {
    const jv = raw.names.findIndex((name, jj) => !used.has(jj) && nameKey(name) === 'value');
    const stem = source.replace(/\\/g, '/').split('/').pop()!.replace(/\.[^.]*$/, '');
    const t = jv >= 0 ? matchTarget(stem)?.target : undefined;
    if (t !== undefined && (METRIC_TARGETS_ALL as readonly string[]).includes(t)) {
      colOf[t] = jv;
      mapping[t] = raw.names[jv];
      outcomeNotes.push(layoutText.valueByFileName(source, raw.names[jv], stem, t));
    }
  }
  for (const [t, src] of Object.entries(map) as [Target, string][]) {
    if (/^(best|min|max|peak)[_\- ]/i.test(conditionKey(src))) notes.push(layoutText.bestCaution(source, src));
  }
  // Records that name one metric two ways (`val_acc` in some runs, `val_accuracy` in others) never
  // on one row: one column, so no run loses its metric to the other spelling.
  for (const t of METRIC_TARGETS_ALL) {
    const names = candidates[t];
    if (colOf[t] === undefined || t in map || !names || names.length < 2) continue;
    const js = [colOf[t]!, ...names.map((nm) => raw.names.indexOf(nm)).filter((jj) => jj !== colOf[t] && jj >= 0 && !used.has(jj))];
    const spare = js.slice(1).filter((jj) => disjoint(raw, colOf[t]!, jj));
    if (spare.length === 0) continue;
    const merged: RawValue[] = new Array(n);
    const from = [colOf[t]!, ...spare];
    for (let i = 0; i < n; i++) {
      for (const jj of from) {
        const v = cellAt(raw.columns[jj], i);
        if (v !== undefined && v !== null && v !== '') {
          merged[i] = v;
          break;
        }
      }
    }
    const label = from.map((jj) => raw.names[jj]).join(' | ');
    for (const jj of spare) used.add(jj);
    used.add(colOf[t]!);
    raw.names.push(label);
    raw.columns.push(merged);
    colOf[t] = raw.names.length - 1;
    mapping[t] = label;
  }
  for (const t of TARGETS) {
    const j = colOf[t];
    if (j !== undefined) {
      used.add(j);
      mapping[t] ??= raw.names[j];
    }
  }
  const passedOver: Record<string, string[]> = {};
  for (const [t, names] of Object.entries(candidates) as [Target, string[]][]) {
    const others = names.filter((n) => n !== mapping[t]);
    if (others.length > 0) passedOver[t] = others;
  }
  notes.push(...outcomeNotes, ...twinNotes);
  // A column made from object keys says so: `label_noise (keys under 'per_seed.*')`.
  for (const lv of raw.jsonLayout?.levels ?? []) {
    if (lv.how === 'run') continue;
    for (const t of TARGETS) if (colOf[t] !== undefined && raw.names[colOf[t]!] === lv.column && mapping[t] === lv.column) mapping[t] = `${lv.column} (keys under '${lv.path}')`;
  }

  // 2. Constants: canonical ones fill targets without a column, others become the condition.
  const condFixed = new Map<string, string>();
  const outcomeConsts: { name: string; value: number }[] = [];
  for (const key of constNames) {
    const v = raw.constants[key];
    if (Object.values(mapping).includes(`config ${key}`)) continue;
    const m = hasConfigPrefix(key) ? matchTarget(conditionKey(key)) : matchTarget(key);
    if (m && !(m.target in map)) {
      if (colOf[m.target] === undefined && constOf[m.target] === undefined) {
        constOf[m.target] = v;
        mapping[m.target] = `config ${key}`;
      }
      continue; // a column of the same meaning wins (e.g. config `epochs` = planned total)
    }
    const ck = conditionKey(key);
    if (v === undefined || v === null || isNotCondition(ck, v)) continue;
    if (isOutcome(ck) || isDerived(ck)) {
      // A run-level outcome (best_test_acc, wallclock_sec, effective_rank): an extra column, never a condition.
      if (typeof v === 'number' || (typeof v === 'string' && Number.isFinite(Number(v)) && v.trim() !== '')) outcomeConsts.push({ name: ck, value: Number(v) });
      continue;
    }
    condFixed.set(ck, text(v));
  }
  // 3. --set: constants for targets the source lacks; other keys always join the condition.
  for (const [key, v] of Object.entries(set)) {
    if ((TARGETS as readonly string[]).includes(key)) {
      const t = key as Target;
      if (colOf[t] === undefined && constOf[t] === undefined) {
        constOf[t] = v;
        mapping[t] = '--set';
      }
    } else condFixed.set(key, v);
  }
  // Axes the source lacks, from its own folder's name (`w8_seed0`, `width_64_n_4000`), with a note.
  const folder = source.replace(/\\/g, '/').split('/').slice(-2, -1)[0] ?? '';
  for (const [name, value] of folderPairs(folder)) {
    // Single letters other than w, k (width) and n (train size) say too little in a folder name (`p3`: part 3?).
    const t = name.length > 1 || /^[wkn]$/i.test(name) ? matchTarget(name)?.target : undefined;
    if ((t === 'width' || t === 'train_size' || t === 'label_noise') && colOf[t] === undefined && constOf[t] === undefined && !(t in map)) {
      constOf[t] = value;
      mapping[t] = `folder ${folder}`;
      notes.push(layoutText.axisFromFolder(source, t, value, folder));
    }
  }
  // params: a column of its own; the model-size axis only when the sweep has no width.
  const constExtras = outcomeConsts.slice();
  if ((colOf.params !== undefined || constOf.params !== undefined) && colOf.width === undefined && constOf.width === undefined && !('width' in map)) {
    if (colOf.params !== undefined) colOf.width = colOf.params;
    else constOf.width = constOf.params;
    mapping.width = mapping.params;
    notes.push(layoutText.paramsAsWidth(source, mapping.params));
  }
  if (constOf.params !== undefined) {
    const v = numberOf(constOf.params);
    if (v.kind === 0) constExtras.push({ name: 'params', value: v.value });
  }

  // 4. Columns left over: numbers are extra measurements, labels with few levels are conditions.
  const extraCols: { name: string; j: number }[] = [];
  const condCols: { key: string; j: number }[] = [];
  const settings = raw.settingColumns;
  if (colOf.params !== undefined) extraCols.push({ name: 'params', j: colOf.params });
  raw.names.forEach((name, j) => {
    if (used.has(j) || name === '') return; // an unnamed column (a trailing delimiter in the header)
    const col = raw.columns[j];
    if (forcedCondition.has(j)) {
      condCols.push({ key: conditionKey(name), j });
      return;
    }
    if (raw.outcomeColumns?.has(name)) {
      if (isNumericColumn(col, n)) extraCols.push({ name, j });
      return;
    }
    if (hasConfigPrefix(name) || settings?.has(name)) {
      // Settings (a config key, a record's scalar above its curve, a key level) split conditions;
      // outcomes and values derived from the axes (p_over_n) stay extra columns.
      const ck = conditionKey(name);
      const numeric = isNumericColumn(col, n);
      if (matchTarget(ck) !== null || isOutcome(ck) || isDerived(ck)) {
        if (numeric) extraCols.push({ name, j });
        return;
      }
      if (!isNotCondition(ck, cellAt(col, 0))) condCols.push({ key: ck, j });
      return;
    }
    if (isNumericColumn(col, n)) {
      extraCols.push({ name, j });
      return;
    }
    if (isNotCondition(name, cellAt(col, 0))) return;
    const levels = new Set<string>();
    for (let i = 0; i < n && levels.size <= MAX_CONDITION_LEVELS; i++) levels.add(text(cellAt(col, i)));
    if (levels.size <= MAX_CONDITION_LEVELS) condCols.push({ key: name, j });
    else notes.push(ingestText.skippedColumn(source, name));
  });

  return { mapping, colOf, constOf, passedOver, condFixed, constExtras, extraCols, condCols };
}

const NUMERIC_TARGETS: Target[] = ['seed', 'width', 'epochs', 'train_size', 'label_noise', 'test_error', 'train_error', 'test_loss',
  'train_loss', 'test_accuracy', 'train_accuracy', 'wall_seconds'];

/** Stage 5: the numeric targets parsed column by column, percent scales found and undone. */
function parseTargets(raw: RawTable, o: { colOf: Partial<Record<Target, number>>; constOf: Partial<Record<Target, RawValue>>; scale: Partial<Record<Target, Scale>>; source: string; notes: string[] }) {
  const { colOf, constOf, scale, source, notes } = o;
  const n = raw.length;
  // 5. Parse numeric targets column by column.
  const numericTargets = NUMERIC_TARGETS;
  const parsed: Partial<Record<Target, ParsedColumn>> = {};
  const constNum: Partial<Record<Target, { value: number; kind: number }>> = {};
  for (const t of numericTargets) {
    const j = colOf[t];
    if (j !== undefined) parsed[t] = parseColumn(raw.columns[j], n);
    else if (constOf[t] !== undefined) constNum[t] = numberOf(constOf[t]);
  }
  // Percent scale, per column: a '%' sign, a forced --scale, a name saying so ('err (%)', 'acc_pct'),
  // or more than a quarter of the values in (1, 100] with none above 100. A few stray values above
  // 1 in a column of fractions are bad rows (rejected below), not a reason to divide the good ones.
  for (const t of numericTargets) {
    if (!isFractionTarget(t)) continue;
    const p = parsed[t];
    const c = constNum[t];
    const forced = scale[t];
    if (p) {
      let max = -Infinity;
      let above = 0;
      let finite = 0;
      const { kind, values } = p;
      for (let i = 0; i < n; i++) {
        if (kind[i] !== 0) continue;
        const v = values[i];
        finite++;
        if (v > max) max = v;
        if (v > 1) above++;
      }
      const named = /%|percent|pct/i.test(raw.names[colOf[t]!]);
      const percent = forced ? forced === 'percent' : !p.percentSign && max > 1 && max <= 100 && (named || above * 4 > finite);
      if (percent && !p.percentSign) {
        for (let i = 0; i < n; i++) p.values[i] /= 100;
        notes.push(ingestText.percentColumn(source, clip(raw.names[colOf[t]!]), t));
      } else if (!forced && !p.percentSign && above > 0) {
        notes.push(ingestText.fractionColumn(source, clip(raw.names[colOf[t]!]), t, above, finite));
      }
    } else if (c && (forced === 'percent' || (!forced && c.value > 1 && c.value <= 100))) c.value /= 100;
  }
  // A width written with a letter (`4x`, `w64`, `width=8`): its number, with a note. Only cells that
  // did not read as numbers are looked at (flat files of plain numbers pay nothing).
  const wp = parsed.width;
  if (wp) {
    let fixed = 0;
    let example = '';
    for (let i = 0; i < n; i++) {
      if (wp.kind[i] !== CELL_BAD) continue;
      const cell = text(cellAt(raw.columns[colOf.width!], i));
      const v = widthText(cell);
      if (v === null) continue;
      wp.values[i] = v;
      wp.kind[i] = 0;
      if (fixed++ === 0) example = cell;
    }
    if (fixed > 0) notes.push(ingestText.widthText(source, clip(raw.names[colOf.width!]), clip(example), widthText(example)!, fixed));
  } else if (constNum.width && constNum.width.kind === CELL_BAD) {
    const cell = text(constOf.width!);
    const v = widthText(cell);
    if (v !== null) {
      constNum.width = { value: v, kind: 0 };
      notes.push(ingestText.widthText(source, 'config width', clip(cell), v, 1));
    }
  }
  for (const t of numericTargets) {
    const ex = parsed[t]?.thousands;
    if (ex !== undefined) notes.push(ingestText.thousandsColumn(source, clip(raw.names[colOf[t]!]), ex));
  }

  return { parsed, constNum };
}

/** Maps, converts and validates the rows of one source; every row read ends accepted, rejected or pending. */
export function normalizeRaw(raw: RawTable, opts: NormalizeOptions): Normalized {
  const { source, map = {}, set = {}, seedFrom, scale = {}, condition: conditionNames = [] } = opts;
  const n = raw.length;
  const notes: string[] = [];
  if (raw.encoding) notes.push(ingestText.encodingNote(source, raw.encoding));
  if (raw.headerRepeats) notes.push(ingestText.headerRepeated(source, raw.headerRepeats.line, raw.headerRepeats.count));
  if (raw.notes) notes.push(...raw.notes);
  const summaries = raw.skipped ?? 0;
  const long = Object.keys(map).length === 0 ? splitLongRows(raw) : null;
  if (long) notes.push(layoutText.longSplit(source, long.column, long.splits, long.metrics));
  if (n === 0 && !raw.pendingLine) {
    if (summaries === 0) notes.push(ingestText.noRows(source, raw.names.length > 0));
    const layout: SourceLayout = { mapping: {}, passedOver: {}, structure: structureNotes(raw, ''), conditions: {} };
    return { table: emptyTable(0), rejects: [], read: summaries, pending: 0, skipped: summaries, mapping: {}, notes, layout };
  }
  const { mapping, colOf, constOf, passedOver, condFixed, constExtras, extraCols, condCols } = mapColumns(raw, { source, map, set, conditionNames, notes });

  const { parsed, constNum } = parseTargets(raw, { colOf, constOf, scale, source, notes });
  const numericTargets = NUMERIC_TARGETS;

  // 6. Per-row checks and output, column arrays only (no per-row objects on this path).
  // (Most logs have no extra or condition columns: those steps are skipped outright then, so the
  // compiled code of this function meets one kind of empty array, not several, and stays.)
  for (const c of constExtras) if (extraCols.some((e) => e.name === c.name)) c.name = `${c.name}_config`;
  const extraNames = extraCols.length === 0 && constExtras.length === 0 ? [] : [...extraCols.map((e) => e.name), ...constExtras.map((c) => c.name)].filter((x) => !(NUMERIC_COLUMNS as readonly string[]).includes(x));
  const extraParsed = extraCols.length === 0 ? [] : extraCols.filter((e) => extraNames.includes(e.name)).map((e) => ({ name: e.name, j: e.j, p: parseColumn(raw.columns[e.j], n) }));
  // Every column of every kept row is written below: no need to fill first.
  const out = allocTable(n, extraNames);
  const rejects: Reject[] = [];
  const fieldName = (t: Target) => (colOf[t] !== undefined ? raw.names[colOf[t]!] : mapping[t] ?? t);
  // Every numeric target as full-length value and kind arrays (constants repeated, absent = missing).
  const V = {} as Record<Target, Float64Array>;
  const K = {} as Record<Target, Uint8Array>;
  for (const t of numericTargets) {
    const p = parsed[t];
    if (p) {
      V[t] = p.values;
      K[t] = p.kind;
    } else {
      const c = constNum[t];
      if (c) {
        V[t] = new Float64Array(n).fill(c.value);
        K[t] = new Uint8Array(n).fill(c.kind);
      } else {
        // Absent targets share one read-only pair of arrays (most logs lack half the targets, and
        // typed-array allocations were the single hottest line of ingest).
        const a = absentColumns(n);
        V[t] = a.values;
        K[t] = a.kind;
      }
    }
  }
  // The first unparseable cell of each row, found column by column.
  // (Made only when some cell is bad: most logs have none.)
  let badAt: Int16Array | null = null;
  const badSources: { field: string; j: number }[] = [];
  const markBad = (kind: Uint8Array, field: string, j: number) => {
    const id = badSources.length;
    let any = false;
    for (let i = 0; i < n; i++) {
      if (kind[i] !== CELL_BAD) continue;
      badAt ??= new Int16Array(n).fill(-1);
      if (badAt[i] < 0) {
        badAt[i] = id;
        any = true;
      }
    }
    if (any) badSources.push({ field, j });
  };
  for (const t of numericTargets) if (parsed[t]) markBad(parsed[t]!.kind, fieldName(t), colOf[t]!);
  for (let x = 0; x < extraParsed.length; x++) markBad(extraParsed[x].p.kind, extraParsed[x].name, extraParsed[x].j);

  const condFixedText: [string, string][] = condFixed.size === 0 ? [] : [...condFixed.entries()];
  const fixedCondition = condCols.length > 0 || condFixedText.length === 0 ? '' : formatCondition(condFixedText);
  const runCol = colOf.run !== undefined ? (raw.columns[colOf.run] as RawColumn) : null;
  const statusCol = colOf.status !== undefined ? (raw.columns[colOf.status] as RawColumn) : null;
  const condCol = colOf.condition !== undefined ? (raw.columns[colOf.condition] as RawColumn) : null;
  // A run id, status or condition given once for the whole source (a run directory's config).
  const runConst = constOf.run !== undefined ? text(constOf.run) : '';
  const statusConst = constOf.status !== undefined && /^(diverged|failed|nan|inf|crashed)$/i.test(text(constOf.status));
  const condConst = constOf.condition !== undefined ? text(constOf.condition) : '';
  const seedFromPath = (() => {
    if (parsed.seed || constNum.seed) return NaN;
    const m = (seedFrom ?? DEFAULT_SEED_FROM).exec(source);
    if (!m) return NaN;
    const digits = (m[1] ?? m[0]).match(/-?\d+/);
    return digits ? Number(digits[0]) : NaN;
  })();
  if (Number.isFinite(seedFromPath)) mapping.seed = `path ${seedFrom ? '--seed-from' : 'seed<N>'}`;
  const anyMetric = (['test_error', 'train_error', 'test_loss', 'train_loss', 'test_accuracy', 'train_accuracy'] as const).some((t) => parsed[t] || constNum[t]);
  if (!anyMetric && (parsed.width || constNum.width) && raw.names.some((name) => PLAN_ONLY.has(nameKey(name)))) {
    // A plan (runs proposed, nothing measured) found beside the logs: not rows that failed.
    return { table: emptyTable(0), rejects: [], read: 0, pending: 0, skipped: 0, mapping: {}, notes: [], notLog: ingestText.planFile(raw.length) };
  }
  const hasMetric = !!(parsed.test_error || constNum.test_error || parsed.test_loss || constNum.test_loss || parsed.test_accuracy || constNum.test_accuracy);
  const missingAxis = (['width', 'epochs', 'train_size'] as const).filter((t) => !parsed[t] && !constNum[t]);
  for (const t of missingAxis) notes.push(ingestText.missingAxis(source, t));
  if (!hasMetric) notes.push(ingestText.missingMetric(source));
  const noMetricField = hasMetric ? fieldName(parsed.test_error ? 'test_error' : parsed.test_loss ? 'test_loss' : 'test_accuracy') : 'test_error';

  const Vw = V.width, Kw = K.width, Ve = V.epochs, Ke = K.epochs, Vn = V.train_size, Kn = K.train_size;
  const Vl = V.label_noise, Kl = K.label_noise, Vs = V.seed, Ks = K.seed;
  const Vte = V.test_error, Kte = K.test_error, Vta = V.test_accuracy, Kta = K.test_accuracy;
  const Vtr = V.train_error, Ktr = K.train_error, Vra = V.train_accuracy, Kra = K.train_accuracy;
  const Vtl = V.test_loss, Ktl = K.test_loss, Vrl = V.train_loss, Krl = K.train_loss;
  const Vwall = V.wall_seconds;
  const Kwall = K.wall_seconds;
  // Extra columns as plain array pairs (the row loop runs a million times: no iterator per row).
  const nExtra = extraParsed.length;
  const extraOut: Float64Array[] = [];
  const extraIn: Float64Array[] = [];
  for (let x = 0; x < nExtra; x++) {
    extraOut.push(out.extra[extraParsed[x].name]);
    extraIn.push(extraParsed[x].p.values);
  }
  const runKeys = raw.runKeys;
  let k = 0;
  const last = { run: '', width: NaN, train_size: NaN, label_noise: NaN, seed: NaN, condition: '', key: '' };
  const reject = (i: number, field: string, reason: string) => rejects.push({ source, line: raw.lines[i], field: clip(field), reason });
  let skipped = 0;
  rows: for (let i = 0; i < n; i++) {
    const err = raw.rowErrors.size > 0 ? raw.rowErrors.get(i) : undefined;
    if (err) {
      if (err.skip) skipped++; // not a row (a repeated header line)
      else reject(i, err.field, err.reason);
      continue;
    }
    if (badAt !== null && badAt[i] >= 0) {
      const b = badSources[badAt[i]];
      const cell = text(cellAt(raw.columns[b.j], i));
      const hint = notNumberHint(cell);
      const shown = oneLine(cell);
      reject(i, b.field, hint === null ? ingestText.notANumber(shown) : 'unit' in hint ? ingestText.withUnit(shown, hint.unit) : ingestText.decimalComma(shown));
      continue;
    }
    const width = Vw[i];
    const epochs = Ve[i];
    const trainSize = Vn[i];
    if (Kw[i] === CELL_MISSING) { reject(i, fieldName('width'), ingestText.missing('width')); continue; }
    if (!(width > 0) || width === Infinity) { reject(i, fieldName('width'), ingestText.badAxis('width', width)); continue; }
    if (!(width >= AXIS_RANGE.width[0] && width <= AXIS_RANGE.width[1])) { reject(i, fieldName('width'), ingestText.implausibleAxis('width', width, AXIS_RANGE.width)); continue; }
    if (Ke[i] === CELL_MISSING) { reject(i, fieldName('epochs'), ingestText.missing('epochs')); continue; }
    if (!(epochs >= 0) || epochs === Infinity) { reject(i, fieldName('epochs'), ingestText.badAxis('epochs', epochs)); continue; }
    if (!(epochs <= AXIS_RANGE.epochs[1])) { reject(i, fieldName('epochs'), ingestText.implausibleAxis('epochs', epochs, AXIS_RANGE.epochs)); continue; }
    if (Kn[i] === CELL_MISSING) { reject(i, fieldName('train_size'), ingestText.missing('train_size')); continue; }
    if (!(trainSize > 0) || !Number.isInteger(trainSize)) { reject(i, fieldName('train_size'), ingestText.badAxis('train_size', trainSize)); continue; }
    if (!(trainSize <= AXIS_RANGE.train_size[1])) { reject(i, fieldName('train_size'), ingestText.implausibleAxis('train_size', trainSize, AXIS_RANGE.train_size)); continue; }
    let noise = 0;
    if (Kl[i] !== CELL_MISSING) {
      noise = Vl[i];
      if (!(noise >= 0 && noise <= 1)) { reject(i, fieldName('label_noise'), ingestText.outOfRange('label_noise', noise)); continue; }
    }
    let seed = seedFromPath;
    if (Ks[i] !== CELL_MISSING) {
      seed = Vs[i];
      if (!Number.isInteger(seed)) { reject(i, fieldName('seed'), ingestText.badSeed(seed)); continue; }
    }

    // Metrics: errors are fractions in [0,1]; accuracy becomes 1 − accuracy; non-finite = diverged.
    // An empty cell is "not measured at this epoch" (test metrics are often logged every k epochs):
    // the row stays when any other metric has a value. (Written out per metric: hot loop.)
    let status: RunStatus = 'ok';
    let anyTest = false;
    let anyTrain = false;
    let te = NaN;
    let tr = NaN;
    let tl = NaN;
    let trl = NaN;
    {
      let v = Vte[i];
      let kind = Kte[i];
      let from: Target = 'test_error';
      if (kind === CELL_MISSING && Kta[i] !== CELL_MISSING) {
        v = 1 - Vta[i];
        kind = Kta[i];
        from = 'test_accuracy';
      }
      if (kind !== CELL_MISSING) {
        anyTest = true;
        if (kind === CELL_NONFINITE) status = 'diverged';
        else if (v >= -1e-12 && v <= 1 + 1e-12) te = v < 0 ? 0 : v > 1 ? 1 : v;
        else {
          reject(i, fieldName(from), ingestText.outOfRange(from, from === 'test_error' ? v : 1 - v));
          continue;
        }
      }
    }
    {
      let v = Vtr[i];
      let kind = Ktr[i];
      let from: Target = 'train_error';
      if (kind === CELL_MISSING && Kra[i] !== CELL_MISSING) {
        v = 1 - Vra[i];
        kind = Kra[i];
        from = 'train_accuracy';
      }
      if (kind !== CELL_MISSING) {
        anyTrain = true;
        if (kind === CELL_NONFINITE) status = 'diverged';
        else if (v >= -1e-12 && v <= 1 + 1e-12) tr = v < 0 ? 0 : v > 1 ? 1 : v;
        else {
          reject(i, fieldName(from), ingestText.outOfRange(from, from === 'train_error' ? v : 1 - v));
          continue;
        }
      }
    }
    if (Ktl[i] !== CELL_MISSING) {
      anyTest = true;
      if (Ktl[i] === CELL_NONFINITE) status = 'diverged';
      else if (Vtl[i] >= 0) tl = Vtl[i];
      else {
        reject(i, fieldName('test_loss'), ingestText.outOfRange('test_loss', Vtl[i]));
        continue;
      }
    }
    if (Krl[i] !== CELL_MISSING) {
      anyTrain = true;
      if (Krl[i] === CELL_NONFINITE) status = 'diverged';
      else if (Vrl[i] >= 0) trl = Vrl[i];
      else {
        reject(i, fieldName('train_loss'), ingestText.outOfRange('train_loss', Vrl[i]));
        continue;
      }
    }
    if (!anyTest && !anyTrain) {
      reject(i, noMetricField, ingestText.noMetricRow);
      continue;
    }
    if (statusConst || (statusCol && /^(diverged|failed|nan|inf|crashed)$/i.test(text(cellAt(statusCol, i))))) status = 'diverged';

    // Condition: fixed config keys plus per-row label columns, `key=value` sorted by key.
    let condition = fixedCondition;
    if (condCols.length > 0) {
      const pairs: [string, string][] = condFixedText.slice();
      for (const c of condCols) {
        const v = text(cellAt(raw.columns[c.j], i));
        if (v !== '') pairs.push([c.key, v]);
      }
      condition = formatCondition(pairs);
    }
    if (condCol || condConst) {
      const v = condCol ? text(cellAt(condCol, i)) : condConst;
      if (v !== '') condition = condition === '' ? v : `${v},${condition}`;
    }
    let run = runCol ? text(cellAt(runCol, i)) : runConst;
    if (run === '') {
      // Rows of one run are usually contiguous: reuse the id while the configuration repeats.
      // Keys naming the run in a document (`r1`, `w=4 (p=4,146)`) lead it.
      const key = runKeys === undefined ? '' : runKeys[i];
      if (width !== last.width || trainSize !== last.train_size || noise !== last.label_noise ||
          !(seed === last.seed || (seed !== seed && last.seed !== last.seed)) || condition !== last.condition || key !== last.key || last.run === '') {
        last.run = key === ''
          ? `${condition === '' ? '' : `${condition},`}width=${width},train_size=${trainSize},label_noise=${noise}` + (Number.isFinite(seed) ? `,seed=${seed}` : `,source=${source}`)
          : `${key}${condition === '' ? '' : `,${condition}`},width=${width},train_size=${trainSize},label_noise=${noise}${Number.isFinite(seed) ? `,seed=${seed}` : ''}`;
        last.width = width;
        last.train_size = trainSize;
        last.label_noise = noise;
        last.seed = seed;
        last.condition = condition;
        last.key = key;
      }
      run = last.run;
    }

    out.run[k] = run;
    out.condition[k] = condition;
    out.source[k] = source;
    out.source_line[k] = raw.lines[i];
    out.status[k] = status;
    out.seed[k] = seed;
    out.width[k] = width;
    out.epochs[k] = epochs;
    out.train_size[k] = trainSize;
    out.label_noise[k] = noise;
    out.wall_seconds[k] = Kwall[i] === 0 ? Vwall[i] : NaN;
    out.test_error[k] = te;
    out.train_error[k] = tr;
    out.test_loss[k] = tl;
    out.train_loss[k] = trl;
    for (let x = 0; x < nExtra; x++) extraOut[x][k] = extraIn[x][i];
    k++;
  }
  for (const c of constExtras) if (out.extra[c.name]) out.extra[c.name].fill(c.value, 0, k);
  const table = sliceTable(out, k);
  curveNotes(table, { source, notes, mapping });
  const layout: SourceLayout = { mapping, passedOver, structure: structureNotes(raw, ''), conditions: runsPerCondition(table) };
  return { table, rejects, read: n - skipped + (raw.pendingLine ? 1 : 0) + summaries, pending: raw.pendingLine ? 1 : 0, skipped: summaries, mapping, notes, layout };
}

/** One line per key level named, curve expanded, array not read and summary block skipped. */
function structureNotes(raw: RawTable, source: string): string[] {
  const l = raw.jsonLayout;
  if (!l) return [];
  const out: string[] = [];
  const runLevels = new Map<string, string[]>();
  for (const v of l.levels) {
    if (v.how === 'run') {
      runLevels.set(v.path, v.values);
      continue;
    }
    if (v.how === 'unnamed') out.push(layoutText.levelUnnamed(source, v.path, v.column, v.values, Math.max(0, distinctCount(v) - v.values.length)));
    else if (v.how === 'parent') out.push(layoutText.levelNamed(source, v.path, v.column, v.path.split('.').pop() ?? v.path));
    else if (v.how === 'keys') out.push(layoutText.levelKeys(source, v.path, v.column));
    else out.push(layoutText.levelPairs(source, v.path, v.column));
  }
  for (const [path, values] of runLevels) {
    const lv = l.levels.find((x) => x.how === 'run' && x.path === path)!;
    out.push(layoutText.levelRuns(source, path, distinctCount(lv), values));
  }
  for (const c of l.curves) out.push(layoutText.curves(source, c.path, c.key, c.records, c.rows));
  for (const u of l.unread) out.push(layoutText.unread(source, u.path, u.length, u.what, u.times ?? 1));
  for (const s of l.summaries) out.push(layoutText.summaries(source, s.path, s.rows, s.reason));
  for (const c of l.numbered ?? []) out.push(layoutText.numbered(source, c.path, c.curves));
  for (const j of l.joined ?? []) out.push(layoutText.joinedSplits(source, j.path, j.keys, j.records));
  for (const s of l.settings ?? []) out.push(layoutText.settingBlock(source, s.path, s.keys, s.times));
  if (l.unusedKeys) out.push(layoutText.unusedKeys(source, l.unusedKeys));
  return out;
}

/** Distinct values of a level (at most its first 64 are kept). */
const distinctCount = (v: { values: string[]; distinct?: number }) => v.distinct ?? v.values.length;

/** Runs per condition of a source's accepted rows. */
function runsPerCondition(t: RowTable): Record<string, number> {
  const seen = new Map<string, Set<string>>();
  for (let i = 0; i < t.length; i++) {
    let s = seen.get(t.condition[i]);
    if (!s) seen.set(t.condition[i], (s = new Set()));
    s.add(t.run[i]);
  }
  const out: Record<string, number> = {};
  for (const [c, s] of seen) out[c] = s.size;
  return out;
}

/** Column names in messages: a header can hold a megabyte-long "name" (or line breaks, when quoted). */
function clip(name: string): string {
  const s = oneLine(name);
  return s.length > 80 ? `${s.slice(0, 80)}…` : s;
}

/** Cell text in a one-line message: line breaks and other control characters written as escapes. */
function oneLine(s: string): string {
  // eslint-disable-next-line no-control-regex
  return /[\u0000-\u001f\u007f]/.test(s) ? s.replace(/[\u0000-\u001f\u007f]/g, (c) => JSON.stringify(c).slice(1, -1)) : s;
}

/**
 * Notes on the accepted curves of one source (values are kept as given):
 * - a run whose epochs go backwards (a job restarted from a checkpoint re-logs epochs; for an
 *   epoch logged twice mergeTables keeps the later line);
 * - an error column that rises over training in most runs: usually an accuracy read as an error
 *   (or, after the 1 − x conversion, an error mapped as an accuracy).
 */
function curveNotes(t: RowTable, ctx: { source: string; notes: string[]; mapping: Record<string, string> }): void {
  let restarts = 0;
  let first: { run: string; from: number; to: number; line: number } | null = null;
  for (let k = 1; k < t.length; k++) {
    if (t.run[k] === t.run[k - 1] && t.epochs[k] < t.epochs[k - 1]) {
      if (restarts++ === 0) first = { run: t.run[k], from: t.epochs[k - 1], to: t.epochs[k], line: t.source_line[k] };
    }
  }
  if (first) ctx.notes.push(ingestText.restarted(ctx.source, clip(first.run), first.from, first.to, first.line, restarts));
  for (const col of ['train_error', 'test_error'] as const) {
    const v = t[col];
    let runs = 0;
    let rising = 0;
    let k = 0;
    while (k < t.length) {
      let j = k + 1;
      while (j < t.length && t.run[j] === t.run[k]) j++;
      // First and last finite value at the run's smallest and largest epochs.
      let lo = -1;
      let hi = -1;
      let points = 0;
      for (let r = k; r < j; r++) {
        if (!Number.isFinite(v[r])) continue;
        points++;
        if (lo < 0 || t.epochs[r] < t.epochs[lo]) lo = r;
        if (hi < 0 || t.epochs[r] >= t.epochs[hi]) hi = r;
      }
      if (points >= 3) {
        runs++;
        if (v[hi] - v[lo] > 0.3) rising++;
      }
      k = j;
    }
    if (runs > 0 && rising * 3 >= runs * 2) {
      // From an error column: maybe an accuracy. From an accuracy column (1 − x): maybe an error.
      const acc = col === 'test_error' ? 'test_accuracy' : 'train_accuracy';
      const fromError = ctx.mapping[col];
      const name = fromError ?? ctx.mapping[acc] ?? col;
      ctx.notes.push(ingestText.risingError(ctx.source, clip(name), col, rising, runs, fromError !== undefined ? acc : col));
    }
  }
}

/** NaN values and CELL_MISSING kinds of length n, reused while n repeats (never written to). */
let absent: { values: Float64Array; kind: Uint8Array } | null = null;
function absentColumns(n: number): { values: Float64Array; kind: Uint8Array } {
  if (!absent || absent.values.length !== n) absent = { values: new Float64Array(n).fill(NaN), kind: new Uint8Array(n).fill(CELL_MISSING) };
  return absent;
}

export { formatCondition };

/** The first `k` rows of a table (copies, so the rest can be freed). */
export function sliceTable(t: RowTable, k: number): RowTable {
  if (k === t.length) return t;
  const extra: Record<string, Float64Array> = {};
  for (const [name, col] of Object.entries(t.extra)) extra[name] = col.slice(0, k);
  const num = {} as Record<NumericColumn, Float64Array>;
  for (const c of NUMERIC_COLUMNS) num[c] = t[c].slice(0, k);
  return {
    length: k,
    run: t.run.slice(0, k),
    condition: t.condition.slice(0, k),
    source: t.source.slice(0, k),
    source_line: t.source_line.slice(0, k),
    status: t.status.slice(0, k),
    ...num,
    extra,
  };
}
