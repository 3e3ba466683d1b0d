import { existsSync, readFileSync } from 'node:fs';
import { parseSpec } from '../plan/parseSpec.js';
import type { SweepSpec } from '../plan/SweepSpec.js';
import { planText } from '../messages.js';
import { UserError } from '../UserError.js';

/**
 * A spec as the library takes it: a file path (YAML or JSON, as `--spec`), the spec object itself
 * (`{ axes: { width: [4, 8], train_size: [1000] }, seeds: 3, epochs: 4000 }`), or a parsed SweepSpec.
 */
export type SpecInput = string | SweepSpec | Record<string, unknown>;

function isParsed(s: object): s is SweepSpec {
  const x = s as Partial<SweepSpec>;
  return typeof x.file === 'string' && Array.isArray(x.conditions) && Array.isArray(x.seeds) && !!x.axes && Array.isArray(x.axes.label_noise);
}

/** The parsed, validated spec (generators expanded); a UserError names the file, line and key of a problem. */
export function specOf(spec: SpecInput): SweepSpec {
  if (typeof spec === 'string') {
    if (!existsSync(spec)) throw new UserError(planText.specMissing(spec));
    return parseSpec(readFileSync(spec, 'utf8'), spec);
  }
  if (isParsed(spec)) return spec;
  return parseSpec(JSON.stringify(spec), '(spec object)');
}
