import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { controlBytes, decodeText } from '../../src/ingest/decodeText.js';

// ASCII (ANSI X3.4 / ECMA-6) control characters: C0 (0x00–0x1F) and DEL (0x7F); tab, line feed,
// form feed and carriage return are allowed in text logs.
const definition = (b: Uint8Array) => b.reduce((n, c) => n + (((c < 0x20 && ![9, 10, 12, 13].includes(c)) || c === 0x7f) ? 1 : 0), 0);

describe('controlBytes', () => {
  it('counts what a byte-by-byte reading of the definition counts, at any offset and length', () => {
    const byte = fc.oneof(fc.integer({ min: 0, max: 255 }), fc.constantFrom(0, 9, 10, 12, 13, 0x1f, 0x20, 0x7e, 0x7f, 0x80, 0xa0, 0xff));
    fc.assert(
      fc.property(fc.array(byte, { maxLength: 70 }), fc.integer({ min: 0, max: 7 }), (bytes, offset) => {
        const backing = new Uint8Array(bytes.length + offset);
        backing.set(bytes, offset);
        const view = backing.subarray(offset);
        expect(controlBytes(view)).toBe(definition(view));
      }),
      { numRuns: 5000, seed: 7 },
    );
  });

  it('a log with a few stray control bytes stays text; one made of them is refused as binary', () => {
    const text = Buffer.from('width,test_error\n64,0.25\x07\n'.repeat(20));
    expect(decodeText(text).text.startsWith('width')).toBe(true);
    expect(() => decodeText(Buffer.alloc(4096, 1))).toThrow();
  });
});
