/**
 * Seeded pseudo-random numbers: xoshiro128** (32-bit state words, fast in JS) seeded through
 * splitmix32 from (seed, stream), so independent streams (data pool, features, flips, test set)
 * can be drawn in any order and a run is the same whatever else the sweep contains.
 */
export class Rng {
  private a: number;
  private b: number;
  private c: number;
  private d: number;
  private spare = 0;
  private hasSpare = false;

  constructor(seed: number, stream = 0) {
    let x = (Math.imul(seed | 0, 0x9e3779b1) ^ Math.imul((stream | 0) + 0x7f4a7c15, 0x85ebca6b)) >>> 0;
    const next = () => {
      x = (x + 0x9e3779b9) >>> 0;
      let z = x;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.a = next();
    this.b = next();
    this.c = next();
    this.d = next();
    if ((this.a | this.b | this.c | this.d) === 0) this.a = 1;
  }

  /** Uniform 32-bit unsigned integer. */
  u32(): number {
    const result = Math.imul(rotl(Math.imul(this.b, 5), 7), 9) >>> 0;
    const t = this.b << 9;
    this.c ^= this.a;
    this.d ^= this.b;
    this.b ^= this.c;
    this.a ^= this.d;
    this.c ^= t;
    this.d = rotl(this.d, 11);
    return result;
  }

  /** Uniform in [0, 1) with 53 random bits. */
  uniform(): number {
    return ((this.u32() >>> 5) * 67108864 + (this.u32() >>> 6)) / 9007199254740992;
  }

  /** Standard normal (Box–Muller on 32-bit uniforms, both values used; tails cut at 6.6σ). */
  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    const u = (this.u32() + 0.5) / 4294967296;
    const th = (2 * Math.PI * this.u32()) / 4294967296;
    const r = Math.sqrt(-2 * Math.log(u));
    this.spare = r * Math.sin(th);
    this.hasSpare = true;
    return r * Math.cos(th);
  }

  /** Fills `out` with standard normals. */
  normals(out: Float64Array): Float64Array {
    for (let i = 0; i < out.length; i++) out[i] = this.normal();
    return out;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
