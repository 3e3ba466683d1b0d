/**
 * What an object key says: a value of an axis (`"0.2"`, `"7"`), `name=value` pairs
 * (`"w=4 (p=4,146, p/n=1.04)"`, `"seed_7"`), or a name (`"r1"`, `"history"`).
 */
import { matchTarget } from '../synonyms.js';

export type KeyMeaning =
  | { kind: 'value'; value: number }
  | { kind: 'pairs'; pairs: [string, number][] }
  | { kind: 'name' };

/** A number as a key writes it, thousands separators allowed (`4,146`, `1_000`). */
export function keyNumber(text: string): number | null {
  const t = text.trim();
  if (/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return Number(t);
  if (/^[-+]?\d{1,3}([,_]\d{3})+(\.\d+)?$/.test(t)) return Number(t.replace(/[,_]/g, ''));
  if (/^[-+]?(nan|inf|infinity)$/i.test(t)) return null;
  return null;
}

const NUM = String.raw`[-+]?(?:\d{1,3}(?:,\d{3})+|\d+)(?:\.\d+)?(?:[eE][-+]?\d+)?|[-+]?\.\d+(?:[eE][-+]?\d+)?`;
const PAIR = new RegExp(String.raw`([A-Za-z_][\w/.\-]*)\s*[=:]\s*(${NUM})`, 'g');
const AXIS_NAMES: readonly string[] = ['seed', 'width', 'epochs', 'train_size', 'label_noise', 'params'];
const JOINED = new RegExp(String.raw`^([A-Za-z][A-Za-z_]*?)[_\-]?(${NUM})$`);

// Keys repeat across the records of a document: each distinct key is read once.
const memo = new Map<string, KeyMeaning>();

/** The meaning of one key. */
export function keyMeaning(key: string): KeyMeaning {
  let m = memo.get(key);
  if (m === undefined) {
    m = readKey(key);
    if (memo.size > 100_000) memo.clear();
    memo.set(key, m);
  }
  return m;
}

function readKey(key: string): KeyMeaning {
  const v = keyNumber(key);
  if (v !== null) return { kind: 'value', value: v };
  const pairs: [string, number][] = [];
  for (const m of key.matchAll(PAIR)) pairs.push([m[1], Number(m[2].replace(/,/g, ''))]);
  if (pairs.length > 0) return { kind: 'pairs', pairs };
  // `seed_7`, `width8`, `noise-0.2`, `n4000_w8`: names of axes joined to their values.
  // (Axes only: `run_1` names a run. A lone one-letter name, `k8`, `p1`, is too easily something else.)
  const tokens = key.trim().split(/[\s_,;/]+(?=[A-Za-z])/);
  const joined: [string, number][] = [];
  for (const token of tokens) {
    const j = JOINED.exec(token);
    const t = j ? matchTarget(j[1])?.target : undefined;
    if (!j || t === undefined || !AXIS_NAMES.includes(t) || (tokens.length === 1 && j[1].replace(/_$/, '').length < 2)) return { kind: 'name' };
    joined.push([j[1].replace(/_$/, ''), Number(j[2].replace(/,/g, ''))]);
  }
  return joined.length > 0 ? { kind: 'pairs', pairs: joined } : { kind: 'name' };
}

const CURVE_KEYS = new Set(['history', 'curve', 'curves', 'log', 'logs', 'traininglog', 'trainlog', 'progress', 'trajectory', 'learningcurve']);

/**
 * The column a level of value keys stands for when its parent's key names an axis
 * (`per_seed` → seed, `by_noise` → noise, `noise_levels` → noise, `widths` → width), or null.
 */
export function levelNameOfParent(parentKey: string | null): string | null {
  if (parentKey === null) return null;
  // A run's curve keyed by number (`"history": {"1": {...}, "2": {...}}`): the keys are its epochs.
  if (CURVE_KEYS.has(parentKey.toLowerCase().replace(/[^a-z]/g, ''))) return 'epoch';
  const candidates: string[] = [];
  let k = parentKey.trim().toLowerCase().replace(/[\s-]+/g, '_');
  k = k.replace(/^(per|by|for|each|over|results_by|results_per)_?/, '').replace(/_?(levels|level|values|list|sweep|grid|results)$/, '');
  // The singular first: the level is named for one of its values (`widths` → width).
  if (k.endsWith('s')) candidates.push(k.slice(0, -1));
  if (k.endsWith('es')) candidates.push(k.slice(0, -2));
  candidates.push(k);
  for (const c of candidates) {
    if (c === '') continue;
    const t = matchTarget(c);
    if (t && ['seed', 'width', 'epochs', 'train_size', 'label_noise', 'params'].includes(t.target)) return c;
  }
  return null;
}
