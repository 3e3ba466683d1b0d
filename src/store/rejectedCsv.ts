import { readFileSync } from 'node:fs';
import { storeFiles } from './storeFiles.js';
import { createRequire } from 'node:module';
import type { Reject } from './Reject.js';
import { quoteCsvField } from '../csv/quoteCsvField.js';

export const REJECTED_HEADER = ['source', 'line', 'field', 'reason'] as const;

export function formatRejected(rows: readonly Reject[]): string {
  let out = `${REJECTED_HEADER.join(',')}\n`;
  for (const r of rows) out += `${quoteCsvField(r.source)},${r.line},${quoteCsvField(r.field)},${quoteCsvField(r.reason)}\n`;
  return out;
}

// csv-parse loads only when an ingest that writes reads the earlier rejections back: a re-ingest
// of unchanged files never does.
const requireHere = createRequire(import.meta.url);

/** Reads rejected.csv back (RFC 4180, written by formatRejected); rows with fewer than four fields are skipped. */
export function parseRejected(text: string): Reject[] {
  const { parse } = requireHere('csv-parse/sync') as typeof import('csv-parse/sync');
  const records = parse(text, { from_line: 2, relax_column_count: true, skip_empty_lines: true }) as string[][];
  return records.filter((f) => f.length >= 4).map((f) => ({ source: f[0], line: Number(f[1]), field: f[2], reason: f[3] }));
}

/** The rejections recorded in a store's rejected.csv (none when the file is absent). */
export function readRejected(dir: string): Reject[] {
  let text: string;
  try {
    text = readFileSync(storeFiles(dir).rejected, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw err;
  }
  return parseRejected(text);
}
