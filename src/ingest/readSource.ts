import { readFileSync } from 'node:fs';
import { basename, extname } from 'node:path';
import { createRequire } from 'node:module';
import { emptyRaw, flattenRecord } from './RawTable.js';
import type { RawTable, RawValue } from './RawTable.js';
import { rawFromDelimited } from './rawFromDelimited.js';
import { rawFromJson, rawFromJsonLines } from './rawFromJson.js';
import type { JsonReadOptions } from './rawFromJson.js';
import { limitText } from './limitText.js';
import { DEFAULT_LIMITS, MAX_DEPTH } from './ReadLimits.js';
import type { ReadLimits } from './ReadLimits.js';
import { depthOverAt, JsonTooDeep, jsonWhy, parseJsonLenient } from './parseJsonLenient.js';
import { rawFromArrow } from './rawFromArrow.js';
import { decodeHead, decodeText } from './decodeText.js';
import { ingestText } from '../messages.js';

export type SourceFormat = 'csv' | 'tsv' | 'text' | 'jsonl' | 'json' | 'arrow';

const BY_EXTENSION: Record<string, SourceFormat | 'sniff'> = {
  '.csv': 'csv', '.tsv': 'tsv', '.tab': 'tsv', '.jsonl': 'jsonl', '.ndjson': 'jsonl', '.json': 'json',
  '.arrow': 'arrow', '.feather': 'arrow', '.ipc': 'arrow', '.arrows': 'arrow',
  '.txt': 'sniff', '.dat': 'sniff', '.log': 'sniff', '.out': 'sniff',
};

/** The format a file name stands for, 'sniff' for generic text, null when ingest does not read it. */
export function formatOfName(path: string): SourceFormat | 'sniff' | null {
  return BY_EXTENSION[extname(path).toLowerCase()] ?? null;
}

const ARROW_MAGIC = [0x41, 0x52, 0x52, 0x4f, 0x57, 0x31]; // "ARROW1"

/** Guesses the format of text (or bytes) from its start: JSON, Arrow, tab, comma or whitespace. */
export function sniffFormat(bytes: Uint8Array): SourceFormat {
  if (ARROW_MAGIC.every((b, i) => bytes[i] === b) || (bytes[0] === 0xff && bytes[1] === 0xff && bytes[2] === 0xff && bytes[3] === 0xff)) return 'arrow';
  const head = decodeHead(bytes).replace(/^\uFEFF/, '').trimStart();
  if (head.startsWith('[')) return 'json';
  if (head.startsWith('{')) {
    const first = head.split('\n')[0].trim();
    try {
      parseJsonLenient(first);
      return 'jsonl';
    } catch {
      return 'json';
    }
  }
  const first = head.split(/\r?\n/)[0];
  if (first.includes('\t')) return 'tsv';
  if (first.includes(',') || first.includes(';')) return 'csv';
  return 'text';
}

/** How to read one source: the limits (ReadLimits), its path as given (for notes), and --keys for nested JSON. */
export interface ReadOptions {
  limits?: ReadLimits;
  source?: string;
  /** Names of a JSON document's value-key levels, outermost first (`--keys`). */
  keys?: string[];
}

/**
 * Reads bytes of a known format into a RawTable (pure: no file access), within the limits (a
 * row over one is a rejected row, a header over one refuses the file). Throws on an unreadable file.
 */
export function rawFromBytes(bytes: Uint8Array, format: SourceFormat, opts: ReadOptions = {}): RawTable {
  if (bytes.byteLength === 0) return emptyRaw(format);
  const limits = opts.limits ?? DEFAULT_LIMITS;
  let raw: RawTable;
  if (format === 'arrow') {
    try {
      raw = rawFromArrow(bytes);
    } catch (err) {
      throw new Error(ingestText.badArrow((err as Error).message.split('\n')[0]));
    }
  } else {
    const decoded = decodeText(bytes);
    raw = rawFromText(decoded.text, format, limits, { keys: opts.keys });
    if (decoded.guessed) raw.encoding = decoded.encoding;
  }
  limitText(raw, { maxText: limits.maxText, source: opts.source ?? '' });
  return raw;
}

/** Comma, or semicolon for spreadsheet exports of locales whose decimal mark is the comma. */
function csvDelimiter(text: string): ',' | ';' {
  const end = text.indexOf('\n');
  const header = end < 0 ? text : text.slice(0, end);
  return header.includes(';') && !header.includes(',') ? ';' : ',';
}

export function rawFromText(text: string, format: Exclude<SourceFormat, 'arrow'>, limits: ReadLimits = DEFAULT_LIMITS, json: JsonReadOptions = {}): RawTable {
  switch (format) {
    case 'csv':
      return rawFromDelimited(text, csvDelimiter(text), limits);
    case 'tsv':
      return rawFromDelimited(text, '\t', limits);
    case 'text':
      return rawFromDelimited(text, 'whitespace', limits);
    case 'jsonl':
      return rawFromJsonLines(text, { ...json, limits });
    case 'json':
      return rawFromJson(text, json);
  }
}

export function formatOfBytes(path: string, bytes: Uint8Array): SourceFormat {
  const f = formatOfName(path);
  return f === null || f === 'sniff' ? sniffFormat(bytes) : f;
}

/** File names that hold a run's configuration inside a run directory. */
export const CONFIG_NAMES = ['config.json', 'config.yaml', 'config.yml', 'params.json', 'params.yaml', 'params.yml', 'hparams.json',
  'hparams.yaml', 'hparams.yml', 'args.json', 'args.yaml', 'args.yml', 'run.json', 'run.yaml', 'run.yml'];
/** Base names (any readable extension) that hold a run's metrics inside a run directory. */
export const METRICS_NAMES = ['metrics', 'history', 'log', 'logs', 'progress', 'results', 'train_log', 'stats', 'eval', 'curve'];

/** A run directory's (config file, metrics file) pair, or null when the folder is not one. */
export function runDirectoryFiles(files: readonly string[]): { config: string; metrics: string } | null {
  const lower = new Map(files.map((f) => [f.toLowerCase(), f]));
  const config = CONFIG_NAMES.find((c) => lower.has(c));
  if (!config) return null;
  const metrics = files.find((f) => {
    const ext = extname(f).toLowerCase();
    const base = basename(f, extname(f)).toLowerCase();
    return METRICS_NAMES.includes(base) && formatOfName(f) !== null && f.toLowerCase() !== config;
  });
  return metrics ? { config: lower.get(config)!, metrics } : null;
}

// The YAML parser costs ~0.2 s of start-up per thread (ingest's main thread and each worker):
// load it only when a YAML config is actually read.
const requireHere = createRequire(import.meta.url);
let yamlParse: ((text: string) => unknown) | null = null;
const parseYaml = (text: string): unknown => (yamlParse ??= (requireHere('yaml') as typeof import('yaml')).parse)(text);

/** Whether a parsed value nests objects and arrays more than `max` levels (walked without recursion). */
function deeperThan(value: unknown, max: number): boolean {
  const stack: [unknown, number][] = [[value, 1]];
  const seen = new Set<unknown>(); // YAML anchors can make a value refer to itself
  while (stack.length > 0) {
    const [v, d] = stack.pop()!;
    if (d > max) return true;
    if (seen.has(v)) continue;
    seen.add(v);
    for (const x of Object.values(v as object)) if (x !== null && typeof x === 'object') stack.push([x, d + 1]);
  }
  return false;
}

/** Reads a run directory's config file (JSON or YAML) into flat constants. */
export function readConfigFile(path: string): Record<string, RawValue> {
  const text = readFileSync(path, 'utf8');
  let value: unknown;
  try {
    const yaml = /\.ya?ml$/i.test(path);
    // YAML's flow collections (`[[[...`) nest like JSON's, and its parser recurses into them.
    if (yaml && depthOverAt(text, MAX_DEPTH) >= 0) throw new JsonTooDeep(0, MAX_DEPTH);
    value = yaml ? parseYaml(text) : parseJsonLenient(text);
  } catch (err) {
    // The YAML parser recurses into flow collections (`[[[...`): a stack overflow there is depth.
    if (err instanceof RangeError || err instanceof JsonTooDeep) throw new Error(ingestText.badConfig(ingestText.tooDeep(MAX_DEPTH)));
    throw new Error(ingestText.badConfig(jsonWhy(err)));
  }
  if (value === null || typeof value !== 'object' || Array.isArray(value)) throw new Error(ingestText.badConfig('not a mapping of keys to values'));
  // YAML is parsed without a depth check of its own; flattening recurses.
  if (deeperThan(value, MAX_DEPTH)) throw new Error(ingestText.badConfig(ingestText.tooDeep(MAX_DEPTH)));
  return flattenRecord(value as Record<string, unknown>);
}
