import { mulberry32 } from '../random/mulberry32.js';

/** A small deterministic random source: same seed, same stream on every machine. */
export interface Rng {
  /** Uniform on [0, 1). */
  next(): number;
  /** Uniform integer in [0, n). */
  int(n: number): number;
  /** Standard normal draw. */
  normal(): number;
}

/**
 * mulberry32 (a 32-bit counter hashed by multiply–xorshift): fast, tiny and good enough for
 * bootstrap resampling; results must be reproducible, not cryptographic.
 */
export function seededRng(seed: number): Rng {
  const next = mulberry32((Math.floor(seed) ^ 0x9e3779b9) >>> 0);
  let spare: number | null = null;
  return {
    next,
    int: (n) => Math.floor(next() * n),
    normal: () => {
      // Box–Muller, keeping the second draw.
      if (spare !== null) {
        const v = spare;
        spare = null;
        return v;
      }
      let u = 0;
      while (u === 0) u = next();
      const r = Math.sqrt(-2 * Math.log(u));
      const a = 2 * Math.PI * next();
      spare = r * Math.sin(a);
      return r * Math.cos(a);
    },
  };
}

/** Mixes a base seed with a small integer (a row or slice index) into a new seed. */
export function deriveSeed(seed: number, k: number): number {
  let h = (Math.floor(seed) ^ Math.imul(k + 1, 0x85ebca6b)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x7feb352d) >>> 0;
  h = Math.imul(h ^ (h >>> 15), 0x846ca68b) >>> 0;
  return (h ^ (h >>> 16)) >>> 0;
}
