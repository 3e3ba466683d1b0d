import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Ajv } from 'ajv';
import type { ValidateFunction } from 'ajv';

let validate: ValidateFunction | null = null;

/** The vega-lite JSON schema shipped with the installed vega-lite, compiled once. */
export function vegaLiteValidator(): ValidateFunction {
  if (validate) return validate;
  // The package's exports map hides the schema file, so read it from node_modules directly.
  const path = fileURLToPath(new URL('../../node_modules/vega-lite/build/vega-lite-schema.json', import.meta.url));
  const schema = JSON.parse(readFileSync(path, 'utf8'));
  // The schema uses union types and custom formats (color-hex); validate structure, not formats.
  const ajv = new Ajv({ allowUnionTypes: true, strict: false, validateFormats: false, inlineRefs: false, code: { optimize: false } });
  validate = ajv.compile(schema);
  return validate;
}
