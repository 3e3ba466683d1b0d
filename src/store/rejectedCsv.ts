import type { Reject } from '../ingest/normalizeRaw.js';
import { tokenizeDelimited } from '../ingest/tokenizeDelimited.js';
import { quoteCsvField } from '../csv/quoteCsvField.js';

export const REJECTED_HEADER = ['source', 'line', 'field', 'reason'] as const;

export function formatRejected(rows: readonly Reject[]): string {
  let out = `${REJECTED_HEADER.join(',')}\n`;
  for (const r of rows) out += `${quoteCsvField(r.source)},${r.line},${quoteCsvField(r.field)},${quoteCsvField(r.reason)}\n`;
  return out;
}

export function parseRejected(text: string): Reject[] {
  const rows: Reject[] = [];
  let header = true;
  tokenizeDelimited(text, ',', (f, count) => {
    if (header) {
      header = false;
      return;
    }
    if (count >= 4) rows.push({ source: f[0], line: Number(f[1]), field: f[2], reason: f[3] });
  });
  return rows;
}
