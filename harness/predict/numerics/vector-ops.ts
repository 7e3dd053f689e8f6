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

/**
 * Tile of {@link sweepRange}: two accumulators of 2^13 doubles (128 KiB) stay in the L2 cache while the vectors
 * stream through, four at a time. Measured on 48 vectors of 2^22 amplitudes into y0 and y1, one thread, the 2-core
 * test machine: tiles of 4096–16384 within the noise; four vectors a pass beat two and eight (by 1.1–1.4×, with
 * the sums reassociated); as written (each vector added in turn) 3.5–4.9 GB/s of stored vectors read, against
 * 2.2–2.5 GB/s for the one-vector-at-a-time loop this replaced, in the same runs.
 */
export const SWEEP_TILE = 8192;

/**
 * y0 = Σ_j c0[j]·x_j and, with y1, y1 = Σ_j c1[j]·x_j over the first `count` vectors, on [from, to) (y0 and y1
 * overwritten there): the Ritz vectors from stored Lanczos vectors. Per tile, four vectors at a time, so the
 * accumulators are loaded and stored once per four vectors instead of once per vector; the additions are still made
 * one vector at a time in increasing j, so each amplitude's sum is the one {@link combineRange} gives vector by
 * vector (bit for bit): the result depends neither on the split between threads nor on how many Lanczos vectors
 * were stored and how many regenerated (lean-lanczos.ts), hence not on the memory allowance.
 */
export function sweepRange(
  xs: readonly Float64Array[],
  count: number,
  c0: Float64Array,
  y0: Float64Array,
  c1: Float64Array | null,
  y1: Float64Array | null,
  from: number,
  to: number,
): void {
  for (let t = from; t < to; t += SWEEP_TILE) {
    const end = Math.min(to, t + SWEEP_TILE);
    y0.fill(0, t, end);
    if (y1 !== null) y1.fill(0, t, end);
    let j = 0;
    for (; j + 4 <= count; j += 4) {
      if (y1 === null || c1 === null) accumulate4(xs[j], xs[j + 1], xs[j + 2], xs[j + 3], c0[j], c0[j + 1], c0[j + 2], c0[j + 3], y0, t, end);
      else accumulate4Pair(xs[j], xs[j + 1], xs[j + 2], xs[j + 3], c0, c1, j, y0, y1, t, end);
    }
    for (; j < count; j++) combineRange(xs[j], y0, c0[j], y1, c1 !== null ? c1[j] : 0, t, end);
  }
}

/** y += a0·x0, then += a1·x1, += a2·x2, += a3·x3 on [from, to) (in that order, as four combines would). */
function accumulate4(
  x0: Float64Array, x1: Float64Array, x2: Float64Array, x3: Float64Array,
  a0: number, a1: number, a2: number, a3: number,
  y: Float64Array, from: number, to: number,
): void {
  for (let z = from; z < to; z++) {
    let t = y[z];
    t += a0 * x0[z];
    t += a1 * x1[z];
    t += a2 * x2[z];
    t += a3 * x3[z];
    y[z] = t;
  }
}

/** y0 += c0[j+i]·x_i and y1 += c1[j+i]·x_i for i = 0..3 in turn on [from, to), reading each x once. */
function accumulate4Pair(
  x0: Float64Array, x1: Float64Array, x2: Float64Array, x3: Float64Array,
  c0: Float64Array, c1: Float64Array, j: number,
  y0: Float64Array, y1: Float64Array, from: number, to: number,
): void {
  const a0 = c0[j], a1 = c0[j + 1], a2 = c0[j + 2], a3 = c0[j + 3];
  const b0 = c1[j], b1 = c1[j + 1], b2 = c1[j + 2], b3 = c1[j + 3];
  for (let z = from; z < to; z++) {
    const p = x0[z];
    const q = x1[z];
    const r = x2[z];
    const s = x3[z];
    let t = y0[z];
    let u = y1[z];
    t += a0 * p;
    u += b0 * p;
    t += a1 * q;
    u += b1 * q;
    t += a2 * r;
    u += b2 * r;
    t += a3 * s;
    u += b3 * s;
    y0[z] = t;
    y1[z] = u;
  }
}
