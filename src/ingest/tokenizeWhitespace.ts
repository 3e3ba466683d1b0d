import { DEFAULT_LIMITS } from './ReadLimits.js';
import type { ReadLimits } from './ReadLimits.js';
import { ingestText } from '../messages.js';

/** Where a tokenizer stopped. */
export interface TokenizeEnd {
  /** Physical lines seen (1-based number of the line after the last complete row). */
  lines: number;
  /** Line where an incomplete final row starts, or 0 when the text ended cleanly. */
  pendingLine: number;
}

export type RowHandler = (fields: string[], count: number, line: number) => void;
/** A line over a limit: its number and why (it is not split). */
export type RejectHandler = (line: number, reason: string) => void;

const CR = 13;

/**
 * Whitespace-separated text with a header line (e.g. `epoch  width  test_err`): fields split
 * on runs of spaces or tabs; blank lines and lines starting with '#' are skipped.
 */
export function tokenizeWhitespace(text: string, onRow: RowHandler, opts: { limits?: ReadLimits; onReject?: RejectHandler } = {}): TokenizeEnd {
  const { maxLine, maxFields } = opts.limits ?? DEFAULT_LIMITS;
  const onReject = opts.onReject ?? (() => {});
  const n = text.length;
  let start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let line = 1;
  const fields: string[] = [];
  while (start < n) {
    let end = text.indexOf('\n', start);
    if (end < 0) {
      const rest = text.slice(start).trim();
      return { lines: line, pendingLine: rest === '' || rest.startsWith('#') ? 0 : line };
    }
    let stop = end;
    if (stop > start && text.charCodeAt(stop - 1) === CR) stop--;
    if (stop - start > maxLine) {
      // Not split at all: the limit bounds what one line may cost.
      onReject(line, ingestText.lineTooLong(maxLine));
      line++;
      start = end + 1;
      continue;
    }
    const body = text.slice(start, stop).trim();
    if (body !== '' && body.charCodeAt(0) !== 35) {
      const parts = body.split(/[ \t]+/, maxFields + 1);
      if (parts.length > maxFields) onReject(line, ingestText.tooManyFields(maxFields));
      else {
        for (let k = 0; k < parts.length; k++) fields[k] = parts[k];
        onRow(fields, parts.length, line);
      }
    }
    line++;
    start = end + 1;
  }
  return { lines: line, pendingLine: 0 };
}
