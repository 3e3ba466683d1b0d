/**
 * mulberry32: a 32-bit counter hashed by multiply–xorshift. Fast, tiny, and the same stream on
 * every machine for a seed — what bootstraps, subset choices and test fixtures need (results
 * must be reproducible, not cryptographic). Returns uniform draws on [0, 1).
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
