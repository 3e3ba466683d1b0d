/**
 * out[i][j] += Σ_{a ∈ [from, to)} A[i][a]·B[j][a] (rows of stride P); only j <= i when `lower`.
 * Four output entries per pass over a row of A, so each load of A feeds four products.
 */
export function addGram(out: Float64Array, A: Float64Array, ra: number, B: Float64Array, rb: number, P: number, from: number, to: number, lower: boolean): void {
  for (let i = 0; i < ra; i++) {
    const ai = i * P;
    const oi = i * rb;
    const jEnd = lower ? i + 1 : rb;
    let j = 0;
    for (; j + 3 < jEnd; j += 4) {
      const b0 = j * P;
      const b1 = b0 + P;
      const b2 = b1 + P;
      const b3 = b2 + P;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      for (let a = from; a < to; a++) {
        const x = A[ai + a];
        if (x === 0) continue;
        s0 += x * B[b0 + a];
        s1 += x * B[b1 + a];
        s2 += x * B[b2 + a];
        s3 += x * B[b3 + a];
      }
      out[oi + j] += s0;
      out[oi + j + 1] += s1;
      out[oi + j + 2] += s2;
      out[oi + j + 3] += s3;
    }
    for (; j < jEnd; j++) {
      const bj = j * P;
      let s = 0;
      for (let a = from; a < to; a++) s += A[ai + a] * B[bj + a];
      out[oi + j] += s;
    }
  }
}
