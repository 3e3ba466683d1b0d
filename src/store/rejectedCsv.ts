import type { Reject } from '../ingest/normalizeRaw.js';
import { tokenizeDelimited } from '../ingest/tokenizeDelimited.js';

export const REJECTED_HEADER = ['source', 'line', 'field', 'reason'] as const;

/** RFC 4180 quoting: fields with a comma, quote or line break are quoted, quotes doubled. */
function quote(s: string): string {
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export function formatRejected(rows: readonly Reject[]): string {
  let out = `${REJECTED_HEADER.join(',')}\n`;
  for (const r of rows) out += `${quote(r.source)},${r.line},${quote(r.field)},${quote(r.reason)}\n`;
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
