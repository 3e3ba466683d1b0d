import { emptyTable, NUMERIC_COLUMNS } from '../store/RowTable.js';
import type { NumericColumn, RowTable, RunStatus } from '../store/RowTable.js';
import type { RawColumn, RawTable, RawValue } from './RawTable.js';
import { CELL_BAD, CELL_MISSING, CELL_NONFINITE, isNumericColumn, parseColumn } from './parseNumbers.js';
import type { ParsedColumn } from './parseNumbers.js';
import { isFractionTarget, matchTarget, nameKey, TARGETS } from './synonyms.js';
import type { Target } from './synonyms.js';
import { ingestText } from '../messages.js';

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

export interface Reject {
  source: string;
  line: number;
  field: string;
  reason: string;
}

export interface Normalized {
  /** Accepted rows of this source, in source order. */
  table: RowTable;
  rejects: Reject[];
  /** Rows read (accepted + rejected + pending; duplicates are found later, across sources). */
  read: number;
  pending: number;
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
    if (used.has(j)) return;
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
    for (let i = 0; i < n && levels.size <= MAX_CONDITION_LEVELS; i++) levels.add(text((col as RawValue[])[i]));
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
  // Percent scale, per column: a '%' sign, a forced --scale, or values in (1, 100].
  for (const t of numericTargets) {
    if (!isFractionTarget(t)) continue;
    const p = parsed[t];
    const c = constNum[t];
    const forced = scale[t];
    if (p) {
      let max = -Infinity;
      for (let i = 0; i < n; i++) if (p.kind[i] === 0 && p.values[i] > max) max = p.values[i];
      const percent = forced ? forced === 'percent' : !p.percentSign && max > 1 && max <= 100;
      if (percent && !p.percentSign) {
        for (let i = 0; i < n; i++) p.values[i] /= 100;
        notes.push(ingestText.percentColumn(source, raw.names[colOf[t]!], t));
      }
    } else if (c && (forced === 'percent' || (!forced && c.value > 1 && c.value <= 100))) c.value /= 100;
  }

  // 6. Per-row checks and output.
  const extraNames = extraCols.map((e) => e.name).filter((x) => !(NUMERIC_COLUMNS as readonly string[]).includes(x));
  const extraParsed = extraCols.filter((e) => extraNames.includes(e.name)).map((e) => ({ name: e.name, p: parseColumn(raw.columns[e.j], n) }));
  const out = emptyTable(n, extraNames);
  const rejects: Reject[] = [];
  const fieldName = (t: Target) => (colOf[t] !== undefined ? raw.names[colOf[t]!] : mapping[t] ?? t);
  const get = (t: Target, i: number): { value: number; kind: number } | null => {
    const p = parsed[t];
    if (p) return { value: p.values[i], kind: p.kind[i] };
    return constNum[t] ?? null;
  };
  const condFixedText = [...condFixed.entries()];
  const fixedCondition = condCols.length === 0 ? formatCondition(condFixedText) : '';
  const runCol = colOf.run !== undefined ? (raw.columns[colOf.run] as RawColumn) : null;
  const statusCol = colOf.status !== undefined ? (raw.columns[colOf.status] as RawColumn) : null;
  const condCol = colOf.condition !== undefined ? (raw.columns[colOf.condition] as RawColumn) : null;
  const seedFromPath = (() => {
    if (parsed.seed || constNum.seed) return NaN;
    const m = (seedFrom ?? DEFAULT_SEED_FROM).exec(source);
    if (!m) return NaN;
    const digits = (m[1] ?? m[0]).match(/-?\d+/);
    return digits ? Number(digits[0]) : NaN;
  })();
  if (Number.isFinite(seedFromPath)) mapping.seed = `path ${seedFrom ? '--seed-from' : 'seed<N>'}`;
  const hasMetric = parsed.test_error || constNum.test_error || parsed.test_loss || constNum.test_loss || parsed.test_accuracy || constNum.test_accuracy;
  const missingAxis = (['width', 'epochs', 'train_size'] as const).filter((t) => !parsed[t] && !constNum[t]);
  for (const t of missingAxis) notes.push(ingestText.missingAxis(source, t));
  if (!hasMetric) notes.push(ingestText.missingMetric(source));

  let k = 0;
  const reject = (i: number, field: string, reason: string) => rejects.push({ source, line: raw.lines[i], field, reason });
  rows: for (let i = 0; i < n; i++) {
    const err = raw.rowErrors.get(i);
    if (err) {
      reject(i, err.field, err.reason);
      continue;
    }
    // Unparseable numbers first: name the column and the text.
    for (const t of numericTargets) {
      const p = parsed[t];
      if (p && p.kind[i] === CELL_BAD) {
        reject(i, fieldName(t), ingestText.notANumber(text((raw.columns[colOf[t]!] as RawValue[])[i])));
        continue rows;
      }
    }
    for (const e of extraParsed) {
      if (e.p.kind[i] === CELL_BAD) {
        reject(i, e.name, ingestText.notANumber(text((raw.columns[extraCols.find((x) => x.name === e.name)!.j] as RawValue[])[i])));
        continue rows;
      }
    }
    let status: RunStatus = 'ok';
    const axes: Record<'width' | 'epochs' | 'train_size' | 'label_noise' | 'seed', number> = { width: NaN, epochs: NaN, train_size: NaN, label_noise: 0, seed: NaN };
    for (const t of ['width', 'epochs', 'train_size'] as const) {
      const c = get(t, i);
      if (!c || c.kind === CELL_MISSING) {
        reject(i, fieldName(t), ingestText.missing(t));
        continue rows;
      }
      const v = c.value;
      const okValue = t === 'width' ? v > 0 : t === 'epochs' ? v >= 0 : v > 0 && Number.isInteger(v);
      if (!Number.isFinite(v) || !okValue) {
        reject(i, fieldName(t), ingestText.badAxis(t, v));
        continue rows;
      }
      axes[t] = v;
    }
    const noise = get('label_noise', i);
    if (noise && noise.kind !== CELL_MISSING) {
      if (!(noise.value >= 0 && noise.value <= 1)) {
        reject(i, fieldName('label_noise'), ingestText.outOfRange('label_noise', noise.value));
        continue;
      }
      axes.label_noise = noise.value;
    }
    const seed = get('seed', i);
    if (seed && seed.kind !== CELL_MISSING) {
      if (!Number.isInteger(seed.value)) {
        reject(i, fieldName('seed'), ingestText.badSeed(seed.value));
        continue;
      }
      axes.seed = seed.value;
    } else axes.seed = seedFromPath;

    // Metrics: errors are fractions in [0,1]; accuracy becomes 1 − accuracy; non-finite = diverged.
    const metric: Record<'test_error' | 'train_error' | 'test_loss' | 'train_loss', number> = { test_error: NaN, train_error: NaN, test_loss: NaN, train_loss: NaN };
    let anyTest = false;
    for (const [t, acc] of [['test_error', 'test_accuracy'], ['train_error', 'train_accuracy']] as const) {
      let c = get(t, i);
      let from: Target = t;
      if (!c || c.kind === CELL_MISSING) {
        const a = get(acc, i);
        if (a && a.kind !== CELL_MISSING) {
          c = { value: 1 - a.value, kind: a.kind };
          from = acc;
        }
      }
      if (!c || c.kind === CELL_MISSING) continue;
      if (t === 'test_error') anyTest = true;
      if (c.kind === CELL_NONFINITE) {
        status = 'diverged';
        continue;
      }
      if (!(c.value >= -1e-12 && c.value <= 1 + 1e-12)) {
        reject(i, fieldName(from), ingestText.outOfRange(from, from === t ? c.value : 1 - c.value));
        continue rows;
      }
      metric[t] = Math.min(1, Math.max(0, c.value));
    }
    for (const t of ['test_loss', 'train_loss'] as const) {
      const c = get(t, i);
      if (!c || c.kind === CELL_MISSING) continue;
      if (t === 'test_loss') anyTest = true;
      if (c.kind === CELL_NONFINITE) {
        status = 'diverged';
        continue;
      }
      if (!(c.value >= 0)) {
        reject(i, fieldName(t), ingestText.outOfRange(t, c.value));
        continue rows;
      }
      metric[t] = c.value;
    }
    if (!anyTest) {
      reject(i, hasMetric ? fieldName(parsed.test_error ? 'test_error' : parsed.test_loss ? 'test_loss' : 'test_accuracy') : 'test_error', ingestText.noMetric);
      continue;
    }
    if (statusCol && /^(diverged|failed|nan|inf|crashed)$/i.test(text((statusCol as RawValue[])[i]))) status = 'diverged';
    const wall = get('wall_seconds', i);

    // Condition: fixed config keys plus per-row label columns, `key=value` sorted by key.
    let condition = fixedCondition;
    if (condCols.length > 0) {
      const pairs: [string, string][] = condFixedText.slice();
      for (const c of condCols) {
        const v = text((raw.columns[c.j] as RawValue[])[i]);
        if (v !== '') pairs.push([c.key, v]);
      }
      condition = formatCondition(pairs);
    }
    if (condCol) {
      const v = text((condCol as RawValue[])[i]);
      if (v !== '') condition = condition === '' ? v : `${v},${condition}`;
    }
    let run = runCol ? text((runCol as RawValue[])[i]) : '';
    if (run === '') {
      run = `${condition === '' ? '' : `${condition},`}width=${axes.width},train_size=${axes.train_size},label_noise=${axes.label_noise}`;
      run += Number.isFinite(axes.seed) ? `,seed=${axes.seed}` : `,source=${source}`;
    }

    out.run[k] = run;
    out.condition[k] = condition;
    out.source[k] = source;
    out.source_line[k] = raw.lines[i];
    out.status[k] = status;
    out.seed[k] = axes.seed;
    out.width[k] = axes.width;
    out.epochs[k] = axes.epochs;
    out.train_size[k] = axes.train_size;
    out.label_noise[k] = axes.label_noise;
    out.test_error[k] = metric.test_error;
    out.train_error[k] = metric.train_error;
    out.test_loss[k] = metric.test_loss;
    out.train_loss[k] = metric.train_loss;
    out.wall_seconds[k] = wall && wall.kind === 0 ? wall.value : NaN;
    for (const e of extraParsed) out.extra[e.name][k] = e.p.values[i];
    k++;
  }
  return { table: sliceTable(out, k), rejects, read: n + (raw.pendingLine ? 1 : 0), pending: raw.pendingLine ? 1 : 0, mapping, notes };
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
