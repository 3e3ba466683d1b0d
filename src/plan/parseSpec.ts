import { Ajv } from 'ajv';
import type { ErrorObject } from 'ajv';
import { LineCounter, parseDocument, isMap, isNode, isScalar } from 'yaml';
import type { Document } from 'yaml';
import { UserError } from '../UserError.js';
import { planText as msg } from '../messages.js';
import { SPEC_SCHEMA } from './specSchema.js';
import { nearestName } from '../nearestName.js';
import { expandAxis } from './expandAxis.js';
import type { AxisDef } from './expandAxis.js';
import type { SweepSpec } from './SweepSpec.js';
import { formatCondition } from '../ingest/normalizeRaw.js';

/** Conditions as the store spells them: key=value pairs sorted by key and joined by commas (as ingest writes them). */
function conditions(list: RawSpec['conditions']): string[] {
  if (!list) return [''];
  return list.map((c) =>
    typeof c === 'object' ? formatCondition(Object.entries(c).map(([k, v]) => [k, String(v)] as [string, string])) : String(c),
  );
}

interface RawSpec {
  name?: string;
  axes: { width: AxisDef; train_size: AxisDef; label_noise?: AxisDef };
  conditions?: (string | number | Record<string, string | number | boolean>)[];
  seeds: number | number[];
  epochs: number;
}

let validator: ReturnType<Ajv['compile']> | null = null;

/** JSON-pointer path of an ajv error as a dotted key (`axes.width.count`, `seeds[1]`). */
function dotted(segments: (string | number)[]): string {
  let out = '';
  for (const s of segments) out += typeof s === 'number' || /^\d+$/.test(String(s)) ? `[${s}]` : out ? `.${s}` : String(s);
  return out || '(top level)';
}

function pointerSegments(pointer: string): string[] {
  return pointer
    .split('/')
    .slice(1)
    .map((s) => s.replace(/~1/g, '/').replace(/~0/g, '~'));
}

/** 1-based line of the node at `segments` (or its closest existing parent). */
function lineOf(doc: Document, lc: LineCounter, segments: string[]): number | null {
  for (let k = segments.length; k >= 0; k--) {
    const path = segments.slice(0, k).map((s) => (/^\d+$/.test(s) ? Number(s) : s));
    const node = k === 0 ? doc.contents : doc.getIn(path, true);
    if (isNode(node) && node.range) return lc.linePos(node.range[0]).line;
  }
  return null;
}

// Which of ajv's errors (allErrors) to report: a misspelt key explains the "required" error it
// causes, so unknown keys come first; the if/then/else wrappers only repeat their branch's error.
const RANK: Record<string, number> = { additionalProperties: 0, required: 1, if: 9 };

const pointerParent = (segments: string[]) => (segments.length ? dotted(segments) : '');

/** A problem found by ajv, in its own terms: instance path, keyword, params. */
function describeError(e: ErrorObject): { segments: string[]; key?: string; problem: string } {
  const segments = pointerSegments(e.instancePath);
  const p = e.params as Record<string, unknown>;
  if (e.keyword === 'required') return { segments: [...segments, String(p.missingProperty)], problem: msg.specRequired() };
  if (e.keyword === 'additionalProperties') {
    const known = Object.keys((e.parentSchema as { properties?: Record<string, unknown> } | undefined)?.properties ?? {});
    const key = String(p.additionalProperty);
    return { segments: [...segments, key], key, problem: msg.specUnknownKey(key, pointerParent(segments), nearestName(key, known), known) };
  }
  if (e.keyword === 'enum') return { segments, problem: `must be one of ${(p.allowedValues as unknown[]).join(', ')}` };
  return { segments, problem: e.message ?? 'is not valid' };
}

/** 1-based line of the key `segments[last]` itself (not its value, which may start lines below). */
function keyLine(doc: Document, lc: LineCounter, segments: string[]): number | null {
  const parent = segments.length === 1 ? doc.contents : doc.getIn(segments.slice(0, -1).map((s) => (/^\d+$/.test(s) ? Number(s) : s)), true);
  if (isMap(parent)) {
    const pair = parent.items.find((it) => isScalar(it.key) && String(it.key.value) === segments[segments.length - 1]);
    if (pair && isNode(pair.key) && pair.key.range) return lc.linePos(pair.key.range[0]).line;
  }
  return lineOf(doc, lc, segments);
}

/**
 * Parses and validates a grid spec (YAML or JSON; JSON is YAML 1.2), expanding axis
 * generators. Throws a UserError naming the file, line and key of the first problem.
 */
export function parseSpec(text: string, file: string): SweepSpec {
  const lc = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lc, prettyErrors: false, uniqueKeys: true });
  if (doc.errors.length > 0) {
    const e = doc.errors[0];
    const line = lc.linePos(e.pos[0]).line;
    throw new UserError(msg.specSyntax(file, line, e.message.split('\n')[0]));
  }
  const data: unknown = doc.toJS();
  validator ??= new Ajv({ allErrors: true, strict: false, verbose: true }).compile(SPEC_SCHEMA);
  if (!validator(data)) {
    // Stable sort: among equals, ajv's own order (document order of the schema walk).
    const first = [...validator.errors!].sort((a, b) => (RANK[a.keyword] ?? 5) - (RANK[b.keyword] ?? 5))[0];
    const { segments, key, problem } = describeError(first);
    if (key !== undefined) throw new UserError(msg.specUnknown(file, keyLine(doc, lc, segments), problem));
    throw new UserError(msg.specInvalid(file, lineOf(doc, lc, segments), dotted(segments), problem));
  }
  const raw = data as RawSpec;
  const fail = (segments: string[], problem: string) =>
    new UserError(msg.specInvalid(file, lineOf(doc, lc, segments), dotted(segments), problem));
  const axis = (name: 'width' | 'train_size' | 'label_noise', def: AxisDef, defaultSpacing: 'log' | 'linear') => {
    if (!Array.isArray(def) && (def.spacing ?? defaultSpacing) === 'log' && (def.from <= 0 || def.to <= 0))
      throw fail(['axes', name, def.from <= 0 ? 'from' : 'to'], msg.specLogNonPositive());
    return expandAxis(def, { defaultSpacing });
  };
  const seeds = typeof raw.seeds === 'number' ? Array.from({ length: raw.seeds }, (_, i) => i) : [...raw.seeds].sort((a, b) => a - b);
  return {
    file,
    name: raw.name,
    axes: {
      width: axis('width', raw.axes.width, 'log'),
      train_size: axis('train_size', raw.axes.train_size, 'log'),
      label_noise: raw.axes.label_noise === undefined ? [0] : axis('label_noise', raw.axes.label_noise, 'linear'),
    },
    conditions: conditions(raw.conditions),
    seeds,
    epochs: raw.epochs,
  };
}
