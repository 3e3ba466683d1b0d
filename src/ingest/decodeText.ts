import { isUtf8 } from 'node:buffer';
import { ingestText } from '../messages.js';

/** How the bytes of a text log were read. */
export type TextEncoding = 'utf-8' | 'utf-16le' | 'utf-16be' | 'latin1';

export interface DecodedText {
  text: string;
  encoding: TextEncoding;
  /** The encoding was guessed (no byte-order mark): worth a note to the user. */
  guessed: boolean;
}

/** Bytes looked at to tell text from binary. */
const HEAD = 64 * 1024;

/** Share of control bytes (other than tab, line ends, form feed) above which a file is binary. */
const BINARY_SHARE = 0.05;

function asBuffer(bytes: Uint8Array): Buffer {
  return Buffer.isBuffer(bytes) ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

const isControl = (c: number): number => ((c < 0x20 && c !== 9 && c !== 10 && c !== 13 && c !== 12) || c === 0x7f ? 1 : 0);

/**
 * Control bytes (other than tab, line ends, form feed) in `b`. Four bytes at a time: a word
 * with no byte below 0x20 and none equal to 0x7f is skipped whole (the "has less than" and "has
 * zero byte" word tests, common practice), so a text log costs a quarter of a byte loop; only
 * words holding a line end are looked at byte by byte.
 */
export function controlBytes(b: Uint8Array): number {
  const n = b.length;
  let control = 0;
  // Bytes before the first 4-byte boundary (a Uint32Array view must start on one).
  const i = (4 - (b.byteOffset & 3)) & 3;
  if (n < i + 4) {
    for (let k = 0; k < n; k++) control += isControl(b[k]);
    return control;
  }
  for (let k = 0; k < i; k++) control += isControl(b[k]);
  const words = new Uint32Array(b.buffer, b.byteOffset + i, (n - i) >> 2);
  for (let w = 0; w < words.length; w++) {
    const x = words[w];
    const y = x ^ 0x7f7f7f7f;
    if ((((x - 0x20202020) & ~x) | ((y - 0x01010101) & ~y)) & 0x80808080) {
      const k = i + w * 4;
      control += isControl(b[k]) + isControl(b[k + 1]) + isControl(b[k + 2]) + isControl(b[k + 3]);
    }
  }
  for (let k = i + words.length * 4; k < n; k++) control += isControl(b[k]);
  return control;
}

/** UTF-16 without a byte-order mark: ASCII text leaves every other byte zero. */
function utf16Guess(b: Buffer): 'utf-16le' | 'utf-16be' | null {
  const n = Math.min(b.length, 4096) & ~1;
  if (n < 4) return null;
  let evenZero = 0;
  let oddZero = 0;
  for (let i = 0; i < n; i += 2) {
    if (b[i] === 0) evenZero++;
    if (b[i + 1] === 0) oddZero++;
  }
  const half = n / 2;
  if (oddZero > 0.6 * half && evenZero < 0.05 * half) return 'utf-16le';
  if (evenZero > 0.6 * half && oddZero < 0.05 * half) return 'utf-16be';
  return null;
}

/**
 * Decodes a text log: UTF-8 (with or without byte-order mark), UTF-16 with a byte-order mark
 * (or plain ASCII saved as UTF-16 without one), and otherwise Latin-1 (Windows-1252), the usual
 * encoding of logs that are not UTF-8. Throws a one-line Error when the bytes are not text at all
 * (control bytes in the first 64 KB, a compressed file). A leading byte-order mark is kept as
 * U+FEFF (the readers skip it).
 */
export function decodeText(bytes: Uint8Array): DecodedText {
  const b = asBuffer(bytes);
  if (b.length >= 2 && b[0] === 0xff && b[1] === 0xfe) return { text: `\uFEFF${new TextDecoder('utf-16le').decode(b.subarray(2))}`, encoding: 'utf-16le', guessed: false };
  if (b.length >= 2 && b[0] === 0xfe && b[1] === 0xff) return { text: `\uFEFF${new TextDecoder('utf-16be').decode(b.subarray(2))}`, encoding: 'utf-16be', guessed: false };
  const head = b.subarray(0, HEAD);
  if (head.indexOf(0) >= 0) {
    const guess = utf16Guess(b);
    if (guess) return { text: new TextDecoder(guess).decode(b), encoding: guess, guessed: true };
  }
  if (b.length >= 2 && b[0] === 0x1f && b[1] === 0x8b) throw new Error(ingestText.compressed('gzip'));
  if (b.length >= 4 && b[0] === 0x50 && b[1] === 0x4b && b[2] === 0x03 && b[3] === 0x04) throw new Error(ingestText.compressed('zip'));
  const control = controlBytes(head);
  if (head.length > 0 && control > BINARY_SHARE * head.length) throw new Error(ingestText.binary(control, head.length));
  if (isUtf8(b)) return { text: b.toString('utf8'), encoding: 'utf-8', guessed: false };
  return { text: new TextDecoder('latin1').decode(b), encoding: 'latin1', guessed: true };
}

/** The first few KB as text, for format sniffing (never throws). */
export function decodeHead(bytes: Uint8Array, size = 4096): string {
  const b = asBuffer(bytes);
  if (b.length >= 2 && b[0] === 0xff && b[1] === 0xfe) return new TextDecoder('utf-16le').decode(b.subarray(2, 2 + size * 2));
  if (b.length >= 2 && b[0] === 0xfe && b[1] === 0xff) return new TextDecoder('utf-16be').decode(b.subarray(2, 2 + size * 2));
  const guess = b.subarray(0, size).indexOf(0) >= 0 ? utf16Guess(b) : null;
  if (guess) return new TextDecoder(guess).decode(b.subarray(0, size * 2));
  return new TextDecoder().decode(b.subarray(0, size));
}
