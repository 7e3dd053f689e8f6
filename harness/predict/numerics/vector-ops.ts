/**
 * The Lanczos recurrence's vector passes besides the product, over a range of amplitudes, so the calling thread and
 * the product team's helpers (product-team.ts) can each take a share of one large vector.
 */

/**
 * w = w − a·u over [from, to); out[0] += Σ x², and with `locked`, out[1] += Σ locked·x (x the new w).
 */
export function updateRange(w: Float64Array, u: Float64Array, a: number, locked: Float64Array | null, from: number, to: number, out: Float64Array): void {
  let nn = 0;
  let c = 0;
  if (locked === null) {
    for (let z = from; z < to; z++) {
      const x = w[z] - a * u[z];
      w[z] = x;
      nn += x * x;
    }
  } else {
    for (let z = from; z < to; z++) {
      const x = w[z] - a * u[z];
      w[z] = x;
      nn += x * x;
      c += locked[z] * x;
    }
  }
  out[0] += nn;
  out[1] += c;
}

/** y0 += c0·x and, with y1, y1 += c1·x over [from, to). */
export function combineRange(x: Float64Array, y0: Float64Array, c0: number, y1: Float64Array | null, c1: number, from: number, to: number): void {
  if (y1 === null) {
    for (let z = from; z < to; z++) y0[z] += c0 * x[z];
  } else {
    for (let z = from; z < to; z++) {
      const t = x[z];
      y0[z] += c0 * t;
      y1[z] += c1 * t;
    }
  }
}
