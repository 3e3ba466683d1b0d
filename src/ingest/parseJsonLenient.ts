import { MAX_DEPTH } from './ReadLimits.js';
import { ingestText } from '../messages.js';

// Python's json module writes NaN, Infinity and -Infinity, which JSON.parse refuses: quote them
// so they read as non-finite numbers (a diverged run's test error is often logged this way).
const BARE_NONFINITE = /([:[,]\s*)(-?Infinity|NaN)(?=\s*[,\]}])/g;

const QUOTE = 34;
const BACKSLASH = 92;

/** A JSON text nested deeper than the limit: where (the message ends like JSON.parse's, "in JSON at position N"). */
export class JsonTooDeep extends Error {
  constructor(
    readonly position: number,
    readonly limit: number,
  ) {
    super(`${ingestText.tooDeep(limit)} in JSON at position ${position}`);
  }
}

/**
 * The offset where `text` opens its (maxDepth + 1)-th level of nested objects or arrays, or -1.
 * Strings are jumped over with native searches; the rest is one pass over the characters (about
 * a tenth of what JSON.parse takes). Checked before parsing: the engine parses any depth, but
 * everything that walks the value afterwards (flattening records, finding blocks of rows)
 * recurses, and 100,000 levels overflow the stack.
 */
export function depthOverAt(text: string, maxDepth: number): number {
  const n = text.length;
  let depth = 0;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if (c === QUOTE) {
      let q = i;
      for (;;) {
        q = text.indexOf('"', q + 1);
        if (q < 0) return -1; // an unclosed string: JSON.parse says so
        let b = 0;
        while (text.charCodeAt(q - 1 - b) === BACKSLASH) b++;
        if ((b & 1) === 0) break;
      }
      i = q;
    } else if (c === 91 || c === 123) {
      if (++depth > maxDepth) return i;
    } else if (c === 93 || c === 125) depth--;
  }
  return -1;
}

/**
 * JSON.parse, also taking the bare NaN / Infinity / -Infinity that Python writes (as strings).
 * A value nested more than `maxDepth` levels throws JsonTooDeep (its position tells the line).
 */
export function parseJsonLenient(text: string, opts: { maxDepth?: number } = {}): unknown {
  const maxDepth = opts.maxDepth ?? MAX_DEPTH;
  const deep = depthOverAt(text, maxDepth);
  if (deep >= 0) throw new JsonTooDeep(deep, maxDepth);
  try {
    return JSON.parse(text);
  } catch (err) {
    if (!/NaN|Infinity/.test(text)) throw err;
    return JSON.parse(text.replace(BARE_NONFINITE, '$1"$2"'));
  }
}

/** JSON.parse's reason without the echo of the input (which can be a whole huge line). */
export function jsonWhy(err: unknown): string {
  const m = (err as Error).message.split('\n')[0];
  return m.replace(/^(Unexpected token .*?), ".*$/, '$1').replace(/ in JSON at position \d+.*$/, '').slice(0, 160);
}
