/**
 * One recursive walk over a parsed JSON document that finds every block of rows in it: arrays of
 * records, objects of equal-length scalar arrays, objects whose keys are values
 * (`{"0.0": [...], "0.2": [...]}`), objects of per-run objects, and the table orients pandas
 * writes. Each row carries the scalar fields on its own path from the root and nothing from its
 * siblings. Records that hold their own curve (`history`, `log`, any list of records or object of
 * equal-length arrays) expand to one row per element. Blocks of means over seeds are counted as
 * skipped; arrays not read are named. The shapes are matched by the modules under ./json/.
 */
import { RecordColumns, emptyRaw, flattenRecord } from './RawTable.js';
import type { JsonLayout, RawTable, RawValue } from './RawTable.js';
import { keyMeaning, keyNumber, levelNameOfParent } from './json/keyLevel.js';
import { columnarBlock, isScalarArray } from './json/columnarBlock.js';
import { columnsTable, indexTable, splitTable, tableOrient } from './json/tableShapes.js';
import { isRunCollection } from './json/runCollection.js';
import { joinSplitCurves, splitPrefix } from './json/splitCurves.js';
import { CONFIG_PREFIXES, isSummaryName } from './fieldKinds.js';
import { matchTarget, METRIC_TARGETS, nameKey, nameWords } from './synonyms.js';
import { ingestText, layoutText } from '../messages.js';

export interface JsonRowsOptions {
  /** Names of the value-key levels, outermost first (`--keys seed,label_noise`). */
  keys?: string[];
  format?: string;
}

/** Keys whose subtree holds statistics over seeds, not runs. */
const SUMMARY_KEYS = new Set(['aggregated', 'aggregate', 'aggregates', 'summary', 'summaries', 'mean', 'means', 'avg', 'average',
  'averages', 'averaged', 'acrossseeds', 'overseeds', 'seedmean', 'seedmeans', 'meanoverseeds']);
const summaryKey = (k: string) => SUMMARY_KEYS.has(k.toLowerCase().replace(/[^a-z]/g, ''));

interface Ctx {
  fields: Record<string, RawValue>;
  path: string;
  /** Value-key levels passed so far (the index into --keys). */
  depth: number;
  parentKey: string | null;
  /** Path of the summary block this subtree sits in, or null. */
  summary: string | null;
  /** Keys naming the run on the path (`r1`, `w=4 (p=4,146)`), joined by `/`. */
  runKey: string;
  /** Line of a JSON Lines row (every row of it gets it), or 0 for record numbers. */
  line: number;
  /** The path with the keys of levels written `*` (one note per level, not per branch). */
  pattern: string;
  /** What a scalar under value keys measures: the nearest name key above (`test_error`), else `value`. */
  valueName: string;
}

type Rec = Record<string, unknown>;
const isRecord = (v: unknown): v is Rec => v !== null && typeof v === 'object' && !Array.isArray(v);
const isScalar = (x: unknown) => x === null || typeof x !== 'object';
/** Not a value: null, absent, or NaN (as JSON writers and our lenient parse leave it). */
const isVoid = (v: unknown) => v === null || v === undefined || v === 'NaN' || (typeof v === 'number' && Number.isNaN(v));
const isEpochName = (k: string) => matchTarget(k)?.target === 'epochs';
type KeyKind = number;
const SUMMARY = 1;
const METRIC = 2;
const EPOCH = 4;
const AXIS = 8;
const AXIS_TARGETS: readonly string[] = ['width', 'seed', 'train_size', 'label_noise', 'params', 'run', 'condition'];
const join = (path: string, key: string) => (path === '' ? key : `${path}.${key}`);

/** Scalars under value keys (`{"4": 0.31, "8": 0.36}`: a metric per width): a level of one-value rows. */
function isValueKeyed(v: unknown): boolean {
  if (!isRecord(v)) return false;
  let any = false;
  for (const k in v) {
    if (!isScalar(v[k]) || keyMeaning(k).kind !== 'value') return false;
    any = true;
  }
  return any;
}

/** Whether value keys appear anywhere in an object (then it holds rows, not settings). */
function hasValueKeys(v: Rec): boolean {
  for (const k in v) {
    if (keyMeaning(k).kind !== 'name') return true;
    const x = v[k];
    if (isRecord(x) && hasValueKeys(x)) return true;
  }
  return false;
}

/** An object of scalars only (taken as a row as it is, no flattening). */
function isScalarRecord(v: Rec): boolean {
  for (const k in v) {
    const x = v[k];
    if (x !== null && typeof x === 'object') return false;
  }
  return true;
}

/** An object holding no arrays at any depth: a block of settings (`config`), flattened into its parent. */
function isFlatObject(v: unknown): v is Rec {
  if (!isRecord(v)) return false;
  for (const k in v) {
    const x = v[k];
    if (Array.isArray(x)) return false;
    if (x !== null && typeof x === 'object' && !isFlatObject(x)) return false;
  }
  return true;
}

/** Words of settings that scripts key by epoch or step (`lr_schedule`, `milestones`, `warmup_steps`). */
const SETTING_WORDS = new Set(['schedule', 'scheduler', 'milestones', 'milestone', 'lr', 'learning', 'decay', 'warmup',
  'boundaries', 'gamma', 'momentum', 'wd', 'dropout', 'betas', 'steps']);
/** Words of a measurement: a map named with one (`error_rate` by width) holds results, not a setting. */
const MEASURE_WORDS = new Set(['error', 'err', 'acc', 'accuracy', 'loss', 'risk', 'mse', 'score', 'metric', 'metrics', 'result', 'results']);
const isConfigKey = (k: string) => CONFIG_PREFIXES.has(nameKey(k));

/**
 * A block of settings keyed by numbers (`"lr_schedule": {"10": 0.1, "20": 0.01}`): not rows. Inside
 * a config block any such map is one; elsewhere its name must say it is a setting, and never a metric or axis.
 */
function isSettingMap(key: string, v: unknown, inConfig: boolean): boolean {
  if (!isValueKeyed(v) || summaryKey(key) || levelNameOfParent(key) !== null) return false;
  const t = matchTarget(key)?.target;
  if (t !== undefined) return false;
  const words = nameWords(key);
  if (words.some((w) => MEASURE_WORDS.has(w))) return false;
  return inConfig || words.some((w) => SETTING_WORDS.has(w));
}

/** A config block holding scalars, lists of scalars and such blocks only (no rows): flattened as settings. */
function isSettingsObject(v: unknown): v is Rec {
  if (!isRecord(v) || columnarBlock(v) !== null) return false;
  for (const k in v) {
    const x = v[k];
    if (isScalar(x) || isScalarArray(x)) continue;
    if (Array.isArray(x) || !isSettingsObject(x)) return false;
  }
  return true;
}

export class JsonRows {
  private readonly rc: RecordColumns;
  private readonly runKeys: string[] = [];
  private readonly runLevel = new Set<string>();
  private readonly settingColumns = new Set<string>();
  private skipped = 0;
  private readonly layout: JsonLayout = { levels: [], curves: [], unread: [], summaries: [] };
  private readonly levelIndex = new Map<string, JsonLayout['levels'][number]>();
  private readonly curveIndex = new Map<string, JsonLayout['curves'][number]>();
  private readonly summaryIndex = new Map<string, JsonLayout['summaries'][number]>();
  private readonly kinds = new Map<string, KeyKind>();
  /** Value-key levels of the deepest branch (what --keys can name). */
  private deepest = 0;

  constructor(private readonly opts: JsonRowsOptions = {}) {
    this.rc = new RecordColumns(opts.format ?? 'json');
  }

  /** Walks one document (or one JSON Lines row, all of whose rows get `line`). */
  add(value: unknown, line = 0): void {
    const ctx: Ctx = { fields: {}, path: '', depth: 0, parentKey: null, summary: null, runKey: '', line, pattern: '', valueName: 'value' };
    if (Array.isArray(value)) this.visitArray(value, ctx, false);
    else if (isRecord(value)) this.visitObject(value, ctx, true);
    else this.rc.addError(line || this.rc.raw.length + 1, ingestText.notARecord), this.runKeys.push('');
  }

  /** A row that could not be read at all (bad JSON on a line). */
  addError(line: number, reason: string): void {
    this.rc.addError(line, reason);
    this.runKeys.push('');
  }

  finish(): RawTable {
    const raw = this.rc.finish();
    raw.skipped = this.skipped;
    if (this.runKeys.some((k) => k !== '')) raw.runKeys = this.runKeys;
    raw.runLevel = this.runLevel;
    raw.settingColumns = this.settingColumns;
    for (const l of this.layout.levels) {
      l.distinct = l.values.length;
      l.values = l.values.slice(0, 12);
    }
    const keys = this.opts.keys ?? [];
    if (keys.length > this.deepest) this.layout.unusedKeys = keys.slice(this.deepest);
    raw.jsonLayout = this.layout;
    return raw;
  }

  private lineOf(ctx: Ctx): number {
    return ctx.line || this.rc.raw.length + 1;
  }

  private summaryCount(path: string, reason: 'key' | 'names'): void {
    this.skipped++;
    let s = this.summaryIndex.get(path);
    if (!s) this.summaryIndex.set(path, (s = { path: path || '(top)', rows: 0, reason })), this.layout.summaries.push(s);
    s.rows++;
  }

  /** One row: stored, counted as a summary, or rejected as a curve point with nothing measured. */
  /** What a key is, by name (asked once per distinct key: a curve repeats its keys a million times). */
  private kind(k: string): KeyKind {
    let x = this.kinds.get(k);
    if (x === undefined) {
      const summary = isSummaryName(k);
      const t = matchTarget(k)?.target;
      x = (summary ? SUMMARY : 0) | (!summary && METRIC_TARGETS.includes(t as never) ? METRIC : 0) | (t === 'epochs' ? EPOCH : 0) |
        (t !== undefined && AXIS_TARGETS.includes(t) ? AXIS : 0);
      this.kinds.set(k, x);
    }
    return x;
  }

  /** One row (the inherited fields, then its own): stored, counted as a summary, or rejected as a curve point with nothing measured. */
  private emit(fields: Record<string, RawValue>, own: Record<string, RawValue>, ctx: Ctx, curvePoint: boolean, index = -1): void {
    if (ctx.summary !== null) return this.summaryCount(ctx.summary, 'key');
    let summaries = 0;
    let metrics = 0;
    let measured = 0;
    let voids = 0;
    for (const k in own) {
      const x = this.kind(k);
      if (x & SUMMARY) summaries++;
      if (x & METRIC) metrics++;
      if (!(x & EPOCH)) {
        measured++;
        if (isVoid(own[k])) voids++;
      }
    }
    if (summaries > 0 && metrics === 0) return this.summaryCount(ctx.path, 'names');
    const line = this.lineOf(ctx);
    if (curvePoint && measured > 0 && voids === measured) {
      // Its place in the document: a record number alone does not find a point of a nested curve.
      this.rc.addError(line, layoutText.notEvaluated, index < 0 ? ctx.path || '(top)' : `${ctx.path || '(top)'}[${index}]`);
      this.runKeys.push(ctx.runKey);
      return;
    }
    this.rc.addMerged(fields, own, line);
    this.runKeys.push(ctx.runKey);
  }

  /** One note per place in the document's pattern (`[].lr_schedule`), however many records repeat it. */
  private noteUnread(pattern: string, length: number, what: 'values' | 'lists' | 'mixed'): void {
    const path = pattern || '(top)';
    const seen = this.layout.unread.find((u) => u.path === path);
    if (seen) {
      seen.times = (seen.times ?? 1) + 1;
      seen.length = Math.max(seen.length, length);
    } else this.layout.unread.push({ path, length, what });
  }

  /**
   * A curve of metrics alone with no epoch or step key (`{"train_loss": [...], "test_acc": [...]}`)
   * is indexed by epoch: its points are numbered 1..n (logged after each epoch), with a note. A
   * block naming an axis (width, seed, ...) is a table of runs, not a curve, and is left alone.
   */
  private numberPoints(points: Record<string, RawValue>[], pattern: string): void {
    let metric = false;
    for (const p of points) {
      for (const k in p) {
        const x = this.kind(k);
        if (x & EPOCH) return;
        if (x & AXIS) return;
        if (x & METRIC) metric = true;
      }
    }
    if (!metric) return;
    for (let i = 0; i < points.length; i++) points[i].epoch = i + 1;
    const list = (this.layout.numbered ??= []);
    const seen = list.find((x) => x.path === pattern);
    if (seen) seen.curves++;
    else list.push({ path: pattern || '(top)', curves: 1 });
  }

  private noteCurve(path: string, key: string, rows: number): void {
    // Curves of many records under one key are one line: `history` (300 records, 60,000 rows).
    const pattern = path.replace(/\[\d+\]/g, '[]');
    let c = this.curveIndex.get(pattern);
    if (!c) this.curveIndex.set(pattern, (c = { path: pattern, key, records: 0, rows: 0 })), this.layout.curves.push(c);
    c.records++;
    c.rows += rows;
  }

  private noteLevel(column: string, path: string, how: JsonLayout['levels'][number]['how'], value: string): void {
    const pattern = path.replace(/\[\d+\]/g, '[]');
    const id = `${pattern}\u0000${column}`;
    let l = this.levelIndex.get(id);
    if (!l) this.levelIndex.set(id, (l = { column, path: pattern || '(top)', how, values: [], count: 0 })), this.layout.levels.push(l);
    if (l.count < 64 && !l.values.includes(value)) l.values.push(value);
    l.count++;
  }

  /** Returns the rows it found (stored, skipped or rejected). */
  private visitArray(arr: unknown[], ctx: Ctx, curve: boolean): number {
    if (arr.length === 0) return 0;
    let records = 0;
    let arrays = 0;
    for (const x of arr) {
      if (isRecord(x)) records++;
      else if (Array.isArray(x)) arrays++;
    }
    if (records === 0) {
      if (ctx.path === '' && arrays === arr.length) {
        // Rows without column names (pandas `orient="values"`): each one counted, and rejected.
        for (let i = 0; i < arr.length; i++) this.addError(this.lineOf(ctx), layoutText.valuesWithoutNames);
        return arr.length;
      }
      this.noteUnread(ctx.pattern, arr.length, arrays === arr.length ? 'lists' : 'values');
      return 0;
    }
    // A list of flat records is a block of rows (inside a record: its curve, where per-point rules apply).
    if (records === arr.length && arr.every((x) => isFlatObject(x) && !hasValueKeys(x))) {
      const own = arr.map((x) => (isScalarRecord(x as Rec) ? (x as Record<string, RawValue>) : flattenRecord(x as Rec)));
      if (curve) {
        clearInterleavedGaps(own);
        this.numberPoints(own, ctx.pattern);
      }
      for (let i = 0; i < own.length; i++) this.emit(ctx.fields, own[i], ctx, curve, i);
      return arr.length;
    }
    let count = 0;
    arr.forEach((x, i) => {
      const c: Ctx = { ...ctx, path: `${ctx.path}[${i}]`, pattern: `${ctx.pattern}[]` };
      if (isRecord(x)) count += this.visitObject(x, c, true);
      else {
        this.rc.addError(this.lineOf(c), ingestText.notARecord);
        this.runKeys.push(ctx.runKey);
        count++;
      }
    });
    return count;
  }

  /** The object without its numeric-keyed setting maps (noted, not read as rows), and its split curves joined. */
  private settle(obj: Rec, ctx: Ctx, inConfig: boolean): Rec {
    let out: Rec | null = null;
    for (const k in obj) {
      const v = obj[k];
      if (isSettingMap(k, v, inConfig)) {
        out ??= { ...obj };
        delete out[k];
        this.noteSetting(join(ctx.pattern, k), Object.keys(v as Rec));
      } else if (isRecord(v) && (inConfig || isConfigKey(k))) {
        const inner = this.settle(v, { ...ctx, pattern: join(ctx.pattern, k) }, true);
        if (inner !== v) (out ??= { ...obj })[k] = inner;
      }
    }
    if (inConfig) return out ?? obj;
    const joined = joinSplitCurves(out ?? obj);
    if (!joined) return out ?? obj;
    const rest: Rec = {};
    const name = joined.keys.join('+');
    for (const k in out ?? obj) if (!joined.keys.includes(k)) rest[k] = (out ?? obj)[k];
    rest[name] = joined.points;
    const list = (this.layout.joined ??= []);
    const seen = list.find((x) => x.path === (ctx.pattern || '(top)'));
    if (seen) seen.records++;
    else list.push({ path: ctx.pattern || '(top)', keys: joined.keys, records: 1 });
    return rest;
  }

  private noteSettingLists(v: Rec, pattern: string): void {
    for (const k in v) {
      const x = v[k];
      if (isScalarArray(x)) this.noteSetting(join(pattern, k), x.slice(0, 8).map(String));
      else if (isRecord(x)) this.noteSettingLists(x, join(pattern, k));
    }
  }

  private noteSetting(pattern: string, keys: string[]): void {
    const list = (this.layout.settings ??= []);
    const seen = list.find((x) => x.path === pattern);
    if (seen) seen.times++;
    else list.push({ path: pattern, keys: keys.slice(0, 8), times: 1 });
  }

  private visitObject(given: Rec, ctx: Ctx, asRecord: boolean): number {
    if (isValueKeyed(given)) return this.scalarLevel(given, ctx);
    const obj = this.settle(given, ctx, false);
    const shaped = this.tableShape(obj, ctx);
    if (shaped >= 0) return shaped;
    const keys = Object.keys(obj);
    if (keys.length === 0) return 0;
    // Its scalars and flat sub-objects (`config`) are its own fields; the rest is structure.
    const own: Record<string, RawValue> = {};
    const nested: string[] = [];
    for (const k of keys) {
      const v = obj[k];
      if (isScalar(v)) own[k] = v as RawValue;
      else if (isFlatObject(v) && !summaryKey(k) && keyMeaning(k).kind === 'name' && !hasValueKeys(v)) flattenRecord(v, k, own);
      else if (isConfigKey(k) && isSettingsObject(v) && !hasValueKeys(v)) {
        // A config block with lists in it (`milestones: [10, 20]`): its scalars are settings; the lists are named.
        flattenRecord(v, k, own);
        this.noteSettingLists(v, join(ctx.pattern, k));
      } else nested.push(k);
    }
    const fields = { ...ctx.fields, ...own };
    const block = columnarBlock(obj);
    let count = 0;
    if (block) {
      const points: Record<string, RawValue>[] = [];
      for (let i = 0; i < block.length; i++) {
        const p: Record<string, RawValue> = {};
        for (const name of block.names) p[name] = (obj[name] as RawValue[])[i];
        points.push(p);
      }
      clearInterleavedGaps(points);
      this.numberPoints(points, ctx.pattern);
      for (let i = 0; i < points.length; i++) this.emit(fields, points[i], ctx, true, i);
      count += block.length;
      this.noteCurve(ctx.pattern, block.names.join(','), block.length);
    }
    // Keys that are values or name=value pairs, and names of sibling per-run objects, are a level.
    const meaning = new Map(nested.map((k) => [k, keyMeaning(k)]));
    // (Keys naming a metric or an axis, `test_error`, `widths`, are not run names.)
    const runNames = nested.filter((k) => meaning.get(k)!.kind === 'name' && isRecord(obj[k]) && !summaryKey(k) && levelNameOfParent(k) === null && matchTarget(k) === null);
    const runs = runNames.length >= 2 && isRunCollection(Object.fromEntries(runNames.map((k) => [k, obj[k]])));
    const level = nested.filter((k) => meaning.get(k)!.kind !== 'name' || (runs && runNames.includes(k)));
    if (level.length > 0) count += this.visitLevel(obj, level, level.map((k) => meaning.get(k)!), { ...ctx, fields });
    for (const k of nested) {
      const v = obj[k];
      if ((block && block.names.includes(k)) || level.includes(k)) continue;
      const path = join(ctx.path, k);
      if (isScalarArray(v) || (Array.isArray(v) && v.length === 0)) {
        if ((v as unknown[]).length > 0 && ctx.summary === null) this.noteUnread(join(ctx.pattern, k), (v as unknown[]).length, 'values');
        continue;
      }
      // Blocks of runs by split (`"train": [records], "test": [records]`): each row says its split, and
      // normalisation reads its metrics as train_* / test_* (see splitColumn.ts).
      const sp = splitPrefix(k);
      const c: Ctx = { ...ctx, fields: sp === undefined ? fields : { ...fields, split: sp }, path, parentKey: k, summary: ctx.summary ?? (summaryKey(k) ? path : null), pattern: join(ctx.pattern, k), valueName: levelNameOfParent(k) === null ? k : ctx.valueName };
      if (isValueKeyed(v)) count += this.scalarLevel(v as Rec, c);
      else if (Array.isArray(v)) {
        const got = this.visitArray(v, c, true);
        if (got > 0 && c.summary === null && v.every(isFlatObject)) this.noteCurve(ctx.pattern, k, got);
        count += got;
      } else if (isFlatObject(v) && !hasValueKeys(v)) {
        // A flat object under a summary key (`"aggregated": {"test_acc_mean": 0.4}`): one summary row.
        const o = flattenRecord(v);
        this.emit(fields, o, c, false);
        count++;
      } else count += this.visitObject(v as Rec, c, false);
    }
    if (count > 0) {
      // The scalars of a record that holds rows below it are its settings (and outcomes).
      for (const k in own) {
        this.runLevel.add(k);
        this.settingColumns.add(k);
      }
      return count;
    }
    if (Object.keys(own).length === 0 || (!asRecord && ctx.path !== '' && nested.length > 0)) return 0;
    this.emit(ctx.fields, own, ctx, false);
    return 1;
  }

  /** The column a level of value keys fills: --keys, else its parent's axis name, else key1, key2, ... */
  private levelName(ctx: Ctx): { name: string; how: JsonLayout['levels'][number]['how'] } {
    const given = this.opts.keys?.[ctx.depth];
    if (given) return { name: given, how: 'keys' };
    const parent = levelNameOfParent(ctx.parentKey);
    if (parent) return { name: parent, how: 'parent' };
    return { name: `key${ctx.depth + 1}`, how: 'unnamed' };
  }

  /** `{"4": 0.31, "8": 0.36}`: one row per key, the key in the level's column, the scalar named for what it measures. */
  private scalarLevel(obj: Rec, ctx: Ctx): number {
    const { name, how } = this.levelName(ctx);
    const depth = ctx.depth + 1;
    if (depth > this.deepest) this.deepest = depth;
    this.runLevel.add(name);
    this.settingColumns.add(name);
    let count = 0;
    for (const k in obj) {
      const fields = { ...ctx.fields, [name]: keyNumber(k) as number };
      if (ctx.summary === null) this.noteLevel(name, ctx.pattern, how, k);
      this.emit(fields, { [ctx.valueName]: obj[k] as RawValue }, { ...ctx, path: join(ctx.path, k) }, false);
      count++;
    }
    return count;
  }

  /** An object whose keys are values, `name=value` pairs or run names: one branch per key. */
  private visitLevel(obj: Rec, keys: string[], meanings: ReturnType<typeof keyMeaning>[], ctx: Ctx): number {
    const hasValues = meanings.some((m) => m.kind === 'value');
    let name = '';
    let how: JsonLayout['levels'][number]['how'] = 'unnamed';
    if (hasValues) {
      const given = this.opts.keys?.[ctx.depth];
      const parent = levelNameOfParent(ctx.parentKey);
      if (given) (name = given), (how = 'keys');
      else if (parent) (name = parent), (how = 'parent');
      else name = `key${ctx.depth + 1}`;
    }
    let count = 0;
    keys.forEach((k, i) => {
      const m = meanings[i];
      const path = join(ctx.path, k);
      const fields = { ...ctx.fields };
      const c: Ctx = { ...ctx, fields, path, parentKey: k, summary: ctx.summary ?? (summaryKey(k) ? path : null), pattern: join(ctx.pattern, '*') };
      const note = ctx.summary === null;
      if (m.kind === 'value') {
        fields[name] = m.value;
        c.depth = ctx.depth + 1;
        if (c.depth > this.deepest) this.deepest = c.depth;
        this.runLevel.add(name);
        this.settingColumns.add(name);
        if (note) this.noteLevel(name, ctx.pattern, how, k);
      } else {
        if (m.kind === 'pairs') {
          for (const [n, v] of m.pairs) {
            fields[n] = v;
            this.runLevel.add(n);
            // A setting (`lr=0.1`) splits conditions; axes, their synonyms (`p`) and ratios (`p/n`) do not.
            this.settingColumns.add(n);
            if (note) this.noteLevel(n, ctx.pattern, 'pairs', String(v));
          }
        } else if (note) this.noteLevel('run', ctx.pattern, 'run', k);
        c.runKey = ctx.runKey === '' ? k : `${ctx.runKey}/${k}`;
      }
      const v = obj[k];
      if (isValueKeyed(v)) count += this.scalarLevel(v as Rec, c);
      else if (Array.isArray(v)) count += this.visitArray(v, c, false);
      else if (isFlatObject(v) && !hasValueKeys(v)) {
        const o = flattenRecord(v);
        this.emit(fields, o, c, false);
        count++;
      } else count += this.visitObject(v as Rec, c, true);
    });
    return count;
  }

  /** pandas-style whole tables; -1 when the object is none of them. */
  private tableShape(obj: Rec, ctx: Ctx): number {
    const split = splitTable(obj);
    if (split) {
      for (const row of split.data) {
        if (row.length !== split.columns.length || !row.every(isScalar)) {
          this.rc.addError(this.lineOf(ctx), ingestText.fieldCount(split.columns.length, row.length));
          this.runKeys.push(ctx.runKey);
          continue;
        }
        const own: Record<string, RawValue> = {};
        split.columns.forEach((c, j) => (own[c] = row[j] as RawValue));
        this.emit(ctx.fields, own, ctx, false);
      }
      return split.data.length;
    }
    const records = tableOrient(obj);
    if (records) return this.visitArray(records, { ...ctx, path: join(ctx.path, 'data') }, false);
    const columns = columnsTable(obj);
    const rows = columns ?? (this.opts.keys?.[ctx.depth] || levelNameOfParent(ctx.parentKey) ? null : indexTable(obj));
    if (!rows) return -1;
    rows.forEach((r, i) => {
      const own = flattenRecord(r);
      // Keys 0..n-1 over records (pandas orient="index") are a row number, kept as `index` and
      // noted: when they are seeds, --keys names them.
      if (!columns) {
        own.index = i;
        this.noteLevel('index', ctx.pattern, 'unnamed', String(i));
      }
      this.emit(ctx.fields, own, ctx, false);
    });
    return rows.length;
  }
}

/**
 * A metric logged every k points of a curve leaves NaN or null between its values: those are
 * "not measured here", not a divergence. A metric whose gaps all come after its last value
 * (NaN from some point on) keeps them: the run diverged. A metric NaN at every point was never measured.
 */
export function clearInterleavedGaps(points: Record<string, RawValue>[]): void {
  const names = new Set<string>();
  for (const p of points) for (const k in p) names.add(k);
  for (const k of names) {
    let last = -1;
    for (let i = points.length - 1; i >= 0; i--) {
      if (!isVoid(points[i][k])) {
        last = i;
        break;
      }
    }
    // Never measured at all (every point NaN) is not measured, not diverged.
    let gapBefore = last < 0;
    for (let i = 0; i < last && !gapBefore; i++) if (isVoid(points[i][k])) gapBefore = true;
    if (!gapBefore) continue;
    for (const p of points) if (isVoid(p[k])) p[k] = undefined;
  }
}

/** Rows of one parsed JSON document. */
export function jsonRows(value: unknown, opts: JsonRowsOptions = {}): RawTable {
  if (value === undefined) return emptyRaw(opts.format ?? 'json');
  const w = new JsonRows(opts);
  w.add(value);
  return w.finish();
}
