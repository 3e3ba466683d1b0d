/**
 * Sibling curves of one run keyed by data split (`{"train": {"epoch": [...], "error": [...]},
 * "test": {...}}`): one run whose points carry `train_error`, `test_error`, joined per epoch
 * (or per index when no split has an epoch key). Read apart they would be two runs, each with
 * its bare `error` taken as the test error.
 */
import { columnarBlock } from './columnarBlock.js';
import { matchTarget } from '../synonyms.js';
import type { RawValue } from '../RawTable.js';

/** Split names → the prefix their metrics take (`val_error` and the like are held-out synonyms). */
const SPLITS: Record<string, string> = {
  train: 'train', training: 'train', trn: 'train',
  test: 'test', testing: 'test', tst: 'test',
  val: 'val', valid: 'val', validation: 'val', eval: 'val', dev: 'val', heldout: 'val',
};

export const splitPrefix = (key: string): string | undefined => SPLITS[key.toLowerCase().replace(/[^a-z]/g, '')];

type Rec = Record<string, unknown>;
const isRecord = (v: unknown): v is Rec => v !== null && typeof v === 'object' && !Array.isArray(v);
const isScalar = (x: unknown) => x === null || typeof x !== 'object';
const isEpochName = (k: string) => matchTarget(k)?.target === 'epochs';
/** Keys that make a record a run, not a curve point (`{"train": [{"width": 8, ...}]}` is runs by split). */
const AXES = new Set(['width', 'seed', 'train_size', 'label_noise', 'params', 'run']);
const namesAxis = (p: Rec) => Object.keys(p).some((n) => AXES.has(matchTarget(n)?.target ?? ''));

/** The points of one split's curve (records of scalars), or null when it is no curve. */
function curvePoints(v: unknown): Record<string, RawValue>[] | null {
  if (Array.isArray(v)) {
    if (v.length === 0 || !v.every((x) => isRecord(x) && Object.values(x).every(isScalar) && !namesAxis(x))) return null;
    return v as Record<string, RawValue>[];
  }
  if (!isRecord(v)) return null;
  const block = columnarBlock(v);
  if (!block || namesAxis(Object.fromEntries(block.names.map((n) => [n, 0])))) return null;
  const out: Record<string, RawValue>[] = [];
  for (let i = 0; i < block.length; i++) {
    const p: Record<string, RawValue> = {};
    for (const name of block.names) p[name] = (v[name] as RawValue[])[i];
    out.push(p);
  }
  return out;
}

export interface JoinedSplits {
  /** Keys of the object that were joined (`train`, `test`). */
  keys: string[];
  /** One record per epoch (or index), metrics named `<split>_<name>`. */
  points: Record<string, RawValue>[];
}

/** The split curves of an object joined into one, or null when it has none. */
export function joinSplitCurves(obj: Rec): JoinedSplits | null {
  let keys: string[] | null = null;
  for (const k in obj) {
    if (splitPrefix(k) === undefined) continue;
    (keys ??= []).push(k);
  }
  if (keys === null) return null;
  const curves: { prefix: string; points: Record<string, RawValue>[] }[] = [];
  const used: string[] = [];
  for (const k of keys) {
    const points = curvePoints(obj[k]);
    if (points) curves.push({ prefix: splitPrefix(k)!, points }), used.push(k);
  }
  if (curves.length === 0) return null;
  const epochKey = (p: Record<string, RawValue>) => {
    for (const n in p) if (isEpochName(n)) return n;
    return null;
  };
  const byEpoch = curves.every((c) => c.points.every((p) => epochKey(p) !== null && p[epochKey(p)!] !== null && p[epochKey(p)!] !== undefined));
  const joined = new Map<string, Record<string, RawValue>>();
  for (const c of curves) {
    c.points.forEach((p, i) => {
      const ek = byEpoch ? epochKey(p)! : null;
      const id = ek === null ? String(i) : String(p[ek]);
      let row = joined.get(id);
      if (!row) joined.set(id, (row = ek === null ? {} : { [ek]: p[ek] }));
      for (const n in p) {
        if (n === ek) continue;
        // A name that already says its split (`train_loss` under `train`) keeps it.
        const named = n.toLowerCase().startsWith(c.prefix) || splitPrefix(n.split(/[_\-. ]/)[0]) !== undefined;
        row[named ? n : `${c.prefix}_${n}`] = p[n];
      }
    });
  }
  const points = [...joined.values()];
  if (byEpoch) {
    const num = (p: Record<string, RawValue>) => Number(p[epochKey(p)!]);
    if (points.every((p) => Number.isFinite(num(p)))) points.sort((a, b) => num(a) - num(b));
  }
  return { keys: used, points };
}
