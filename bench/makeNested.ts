/**
 * One nested JSON document (~100 MB) and the same rows as JSON Lines, for the nested-read step:
 * `{"n_train": .., "per_seed": {"<seed>": {"w=<width> (p=..)": {"history": [{"epoch": .., "test_error": .., "train_error": ..}]}}}}`.
 * Deterministic numbers; written once and reused while the shape stays.
 */
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync, openSync, writeSync, closeSync } from 'node:fs';
import { join } from 'node:path';

export const NESTED_SHAPE = { seeds: 10, widths: 40, epochs: 4000 };

export function makeNested(dir: string): { json: string; jsonl: string; rows: number; jsonBytes: number; jsonlBytes: number } {
  mkdirSync(dir, { recursive: true });
  const json = join(dir, 'nested.json');
  const jsonl = join(dir, 'flat.jsonl');
  const stamp = join(dir, 'shape.json');
  const shape = JSON.stringify(NESTED_SHAPE);
  const rows = NESTED_SHAPE.seeds * NESTED_SHAPE.widths * NESTED_SHAPE.epochs;
  if (!(existsSync(stamp) && readFileSync(stamp, 'utf8') === shape && existsSync(json) && existsSync(jsonl))) {
    const fj = openSync(json, 'w');
    const fl = openSync(jsonl, 'w');
    writeSync(fj, '{"n_train": 4000, "per_seed": {');
    for (let s = 0; s < NESTED_SHAPE.seeds; s++) {
      writeSync(fj, `${s ? ',' : ''}"${s}": {`);
      for (let w = 0; w < NESTED_SHAPE.widths; w++) {
        const width = Math.round(4 * 2 ** (w / 4));
        writeSync(fj, `${w ? ',' : ''}"w=${width} (p=${(width * 1000).toLocaleString('en')})": {"history": [`);
        const parts: string[] = [];
        const lines: string[] = [];
        for (let e = 1; e <= NESTED_SHAPE.epochs; e++) {
          const te = (0.2 + 0.3 * Math.exp(-((Math.log2(width) - 6) ** 2)) * (1 - Math.exp(-e / 500)) + 0.001 * s).toFixed(5);
          const tr = Math.max(0, 0.5 - e / (NESTED_SHAPE.epochs * (width / 64))).toFixed(5);
          parts.push(`{"epoch": ${e}, "test_error": ${te}, "train_error": ${tr}}`);
          lines.push(`{"n_train": 4000, "seed": ${s}, "width": ${width}, "epoch": ${e}, "test_error": ${te}, "train_error": ${tr}}\n`);
        }
        writeSync(fj, `${parts.join(', ')}]}`);
        writeSync(fl, lines.join(''));
      }
      writeSync(fj, '}');
    }
    writeSync(fj, '}}\n');
    closeSync(fj);
    closeSync(fl);
    writeFileSync(stamp, shape);
  }
  return { json, jsonl, rows, jsonBytes: statSync(json).size, jsonlBytes: statSync(jsonl).size };
}
