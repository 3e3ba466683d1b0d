/** JSON schema (draft-07, checked with ajv) of a grid spec file. */

const axisDef = (value: Record<string, unknown>, defaultSpacing: string) => ({
  type: ['array', 'object'],
  if: { type: 'array' },
  then: { type: 'array', minItems: 1, uniqueItems: true, items: value },
  else: {
    type: 'object',
    additionalProperties: false,
    required: ['from', 'to', 'count'],
    properties: {
      from: value,
      to: value,
      count: { type: 'integer', minimum: 1, maximum: 10000 },
      spacing: { enum: ['log', 'linear'], description: `default ${defaultSpacing}` },
      round: { type: 'boolean' },
    },
  },
});

const positive = { type: 'number', exclusiveMinimum: 0 };
const fraction = { type: 'number', minimum: 0, maximum: 1 };

export const SPEC_SCHEMA = {
  type: 'object',
  additionalProperties: false,
  required: ['axes', 'seeds', 'epochs'],
  properties: {
    name: { type: 'string' },
    axes: {
      type: 'object',
      additionalProperties: false,
      required: ['width', 'train_size'],
      properties: {
        width: axisDef(positive, 'log'),
        train_size: axisDef({ type: 'integer', minimum: 1 }, 'log'),
        label_noise: axisDef(fraction, 'linear'),
      },
    },
    // A condition as the store spells it ("adam", "optimizer=adam,wd=0.01") or as key: value pairs.
    conditions: {
      type: 'array',
      minItems: 1,
      uniqueItems: true,
      items: {
        type: ['string', 'number', 'object'],
        if: { type: 'object' },
        then: { minProperties: 1, additionalProperties: { type: ['string', 'number', 'boolean'] } },
      },
    },
    seeds: {
      type: ['integer', 'array'],
      if: { type: 'integer' },
      then: { minimum: 1, maximum: 10000 },
      else: { minItems: 1, uniqueItems: true, items: { type: 'integer', minimum: 0 } },
    },
    epochs: positive,
  },
} as const;
