import { Ajv } from 'ajv';
import type { ErrorObject } from 'ajv';
import { LineCounter, parseDocument, isNode } from 'yaml';
import type { Document } from 'yaml';
import { UserError } from '../UserError.js';
import { planText as msg } from '../messages.js';
import { SPEC_SCHEMA } from './specSchema.js';
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

function describeError(e: ErrorObject): { segments: string[]; problem: string } {
  const segments = pointerSegments(e.instancePath);
  const p = e.params as Record<string, unknown>;
  if (e.keyword === 'required') return { segments: [...segments, String(p.missingProperty)], problem: msg.specRequired() };
  if (e.keyword === 'additionalProperties') {
    const schemaProps = (e.parentSchema as { properties?: Record<string, unknown> } | undefined)?.properties ?? {};
    return { segments: [...segments, String(p.additionalProperty)], problem: msg.specUnknownKey(Object.keys(schemaProps)) };
  }
  if (e.keyword === 'enum') return { segments, problem: `must be one of ${(p.allowedValues as unknown[]).join(', ')}` };
  return { segments, problem: e.message ?? 'is not valid' };
}

/**
 * Parses and validates a sweep spec (YAML or JSON; JSON is YAML 1.2), expanding axis
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
  validator ??= new Ajv({ allErrors: false, strict: false, verbose: true }).compile(SPEC_SCHEMA);
  if (!validator(data)) {
    const { segments, problem } = describeError(validator.errors![0]);
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
