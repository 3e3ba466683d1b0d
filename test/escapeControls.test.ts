import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { escapeControls } from '../src/escapeControls.js';

describe('escapeControls', () => {
  it('writes terminal controls as \\u escapes, keeps tab, line feed and ordinary text', () => {
    // ECMA-48: ESC (U+001B) starts CSI `ESC[` and OSC `ESC]` sequences; BEL (U+0007) ends an OSC
    // (the xterm title sequence ESC]0;title BEL); U+009B is the 8-bit CSI.
    expect(escapeControls('\u001b[31mred\u001b]0;title\u0007')).toBe('\\u001b[31mred\\u001b]0;title\\u0007');
    expect(escapeControls('a\rb\u009b2J\u007f')).toBe('a\\u000db\\u009b2J\\u007f');
    expect(escapeControls('\u202eevil')).toBe('\\u202eevil'); // right-to-left override (Unicode bidi)
    expect(escapeControls('width\t8\nepoch é 𝛼 ≈')).toBe('width\t8\nepoch é 𝛼 ≈');
  });

  it('leaves JSON text parsing to the same value (the escapes are JSON escapes)', () => {
    fc.assert(
      fc.property(fc.jsonValue(), fc.string({ unit: 'binary' }), (v, s) => {
        for (const x of [v, s, { run: s }]) {
          const out = escapeControls(JSON.stringify(x));
          expect(JSON.parse(out)).toEqual(x);
          expect(out).not.toMatch(/[\u0000-\u0008\u000b-\u001f\u007f-\u009f]/);
        }
      }),
      { seed: 19, numRuns: 300 },
    );
  });
});
