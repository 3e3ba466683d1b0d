import { scheme } from 'vega';
import type { ColorScheme } from './colorSchemes.js';

/** 256 RGB triples sampled from a scheme, the same interpolator vega uses for the legend. */
export function colorLut(name: ColorScheme): Uint8Array {
  // vega's scheme() returns an interpolator t ∈ [0, 1] → "rgb(r, g, b)".
  const interp = scheme(name) as (t: number) => string;
  const lut = new Uint8Array(256 * 3);
  for (let i = 0; i < 256; i++) {
    const m = /rgb\((\d+),\s*(\d+),\s*(\d+)\)/.exec(interp(i / 255));
    if (!m) throw new Error(`colour scheme ${name} gave no rgb() at ${i}`);
    lut[i * 3] = Number(m[1]);
    lut[i * 3 + 1] = Number(m[2]);
    lut[i * 3 + 2] = Number(m[3]);
  }
  return lut;
}
