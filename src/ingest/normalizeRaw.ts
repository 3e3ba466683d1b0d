import { allocTable, emptyTable, NUMERIC_COLUMNS } from '../store/RowTable.js';
import type { NumericColumn, RowTable, RunStatus } from '../store/RowTable.js';
import { cellAt } from './RawTable.js';
import type { RawColumn, RawTable, RawValue } from './RawTable.js';
import { CELL_BAD, CELL_MISSING, CELL_NONFINITE, isNumericColumn, notNumberHint, parseColumn } from './parseNumbers.js';
import type { ParsedColumn } from './parseNumbers.js';
import { isFractionTarget, matchTarget, nameKey, TARGETS } from './synonyms.js';
import type { Target } from './synonyms.js';
import { ingestText } from '../messages.js';
import type { Reject } from '../store/Reject.js';
import { AXIS_RANGE } from './ReadLimits.js';

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
}

const DEFAULT_SEED_FROM = /seed[_\-=]?(\d+)/i;
/** Config prefixes whose keys describe the run (condition), not a per-row measurement. */
const CONFIG_PREFIXES = new Set(['config', 'cfg', 'hparams', 'hyperparameters', 'args', 'params', 'settings', 'conf']);
/** Keys that identify or time-stamp a run; they never split the sweep into conditions. */
const NOT_CONDITION = new Set(['name', 'id', 'runname', 'experiment', 'exp', 'expname', 'path', 'dir', 'outdir', 'outputdir',
  'logdir', 'output', 'date', 'timestamp', 'datetime', 'host', 'hostname', 'node', 'commit', 'gitcommit', 'githash', 'git', 'user',
  'created', 'createdat', 'started', 'startedat', 'finished', 'finishedat', 'device', 'gpu', 'version', 'pid', 'jobname', 'slurmjobid']);
/** A per-row text column with more distinct values than this is an identifier, not a condition. */
const MAX_CONDITION_LEVELS = 64;

const conditionKey = (name: string): string => {
  const parts = name.split('.');
  while (parts.length > 1 && CONFIG_PREFIXES.has(nameKey(parts[0]))) parts.shift();
  return parts.join('.');
};
const hasConfigPrefix = (name: string): boolean => name.includes('.') && CONFIG_PREFIXES.has(nameKey(name.split('.')[0]));

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

/** Maps, converts and validates the rows of one source; every row read ends accepted, rejected or pending. */
export function normalizeRaw(raw: RawTable, opts: NormalizeOptions): Normalized {
  const { source, map = {}, set = {}, seedFrom, scale = {} } = opts;
  const n = raw.length;
  const notes: string[] = [];
  if (raw.encoding) notes.push(ingestText.encodingNote(source, raw.encoding));
  if (raw.headerRepeats) notes.push(ingestText.headerRepeated(source, raw.headerRepeats.line, raw.headerRepeats.count));
  if (raw.notes) notes.push(...raw.notes);
  const summaries = raw.skipped ?? 0;
  if (n === 0 && !raw.pendingLine) {
    if (summaries === 0) notes.push(ingestText.noRows(source, raw.names.length > 0));
    return { table: emptyTable(0), rejects: [], read: summaries, pending: 0, skipped: summaries, mapping: {}, notes };
  }
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
  raw.names.forEach((name, j) => {
    if (used.has(j) || hasConfigPrefix(name)) return;
    const m = matchTarget(name);
    if (!m || m.target in map) return;
    if (bestRank[m.target] === undefined || m.rank < bestRank[m.target]!) {
      bestRank[m.target] = m.rank;
      colOf[m.target] = j;
    }
  });
  for (const t of TARGETS) {
    const j = colOf[t];
    if (j !== undefined) {
      used.add(j);
      mapping[t] ??= raw.names[j];
    }
  }

  // 2. Constants: canonical ones fill targets without a column, others become the condition.
  const condFixed = new Map<string, string>();
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
    if (NOT_CONDITION.has(nameKey(ck)) || v === undefined || v === null) continue;
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

  // 4. Columns left over: numbers are extra measurements, labels with few levels are conditions.
  const extraCols: { name: string; j: number }[] = [];
  const condCols: { key: string; j: number }[] = [];
  raw.names.forEach((name, j) => {
    if (used.has(j) || name === '') return; // an unnamed column (a trailing delimiter in the header)
    const col = raw.columns[j];
    if (hasConfigPrefix(name)) {
      const ck = conditionKey(name);
      if (!NOT_CONDITION.has(nameKey(ck))) condCols.push({ key: ck, j });
      return;
    }
    if (isNumericColumn(col, n)) {
      extraCols.push({ name, j });
      return;
    }
    if (NOT_CONDITION.has(nameKey(name))) return;
    const levels = new Set<string>();
    for (let i = 0; i < n && levels.size <= MAX_CONDITION_LEVELS; i++) levels.add(text(cellAt(col, i)));
    if (levels.size <= MAX_CONDITION_LEVELS) condCols.push({ key: name, j });
    else notes.push(ingestText.skippedColumn(source, name));
  });

  // 5. Parse numeric targets column by column.
  const numericTargets: Target[] = ['seed', 'width', 'epochs', 'train_size', 'label_noise', 'test_error', 'train_error', 'test_loss',
    'train_loss', 'test_accuracy', 'train_accuracy', 'wall_seconds'];
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
  for (const t of numericTargets) {
    const ex = parsed[t]?.thousands;
    if (ex !== undefined) notes.push(ingestText.thousandsColumn(source, clip(raw.names[colOf[t]!]), ex));
  }

  // 6. Per-row checks and output, column arrays only (no per-row objects on this path).
  // (Most logs have no extra or condition columns: those steps are skipped outright then, so the
  // compiled code of this function meets one kind of empty array, not several, and stays.)
  const extraNames = extraCols.length === 0 ? [] : extraCols.map((e) => e.name).filter((x) => !(NUMERIC_COLUMNS as readonly string[]).includes(x));
  const extraParsed = extraNames.length === 0 ? [] : extraCols.filter((e) => extraNames.includes(e.name)).map((e) => ({ name: e.name, j: e.j, p: parseColumn(raw.columns[e.j], n) }));
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
  let k = 0;
  const last = { run: '', width: NaN, train_size: NaN, label_noise: NaN, seed: NaN, condition: '' };
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
      if (width !== last.width || trainSize !== last.train_size || noise !== last.label_noise ||
          !(seed === last.seed || (seed !== seed && last.seed !== last.seed)) || condition !== last.condition || last.run === '') {
        last.run = `${condition === '' ? '' : `${condition},`}width=${width},train_size=${trainSize},label_noise=${noise}` +
          (Number.isFinite(seed) ? `,seed=${seed}` : `,source=${source}`);
        last.width = width;
        last.train_size = trainSize;
        last.label_noise = noise;
        last.seed = seed;
        last.condition = condition;
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
  const table = sliceTable(out, k);
  curveNotes(table, { source, notes, mapping });
  return { table, rejects, read: n - skipped + (raw.pendingLine ? 1 : 0) + summaries, pending: raw.pendingLine ? 1 : 0, skipped: summaries, mapping, notes };
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

export function formatCondition(pairs: [string, string][]): string {
  return pairs
    .sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0))
    .map(([k, v]) => `${k}=${v}`)
    .join(',');
}

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
