/**
 * The one Walsh–Hadamard transform of the tool: a[z] ← Σ_S a[S]·(−1)^popcount(S & z), unnormalised, in place
 * (its own inverse up to a factor 2^n). Used by the cost vector (energies of all 2^n configurations from their
 * Walsh coefficients) and by the exhaustive spin kernel (energies of a block of low configurations).
 *
 * Levels are applied in ascending order, two at a time (radix 4: the same additions as two radix-2 levels,
 * in the same order, with half the passes over memory), so every caller gets bit-identical results.
 */

/** Block of the large transform done in cache before the wide levels: 2^12 doubles = 32 KiB (an L1 data cache). */
const BLOCK_BITS = 12;

/**
 * Two levels h and 2h at once over a[from .. to) (radix 4): the additions of two radix-2 levels, in their order.
 * One call per level pair, so the call costs nothing next to the loop.
 */
function radix4Level(a: Float64Array, from: number, to: number, h: number): void {
  const h2 = 2 * h;
  const h3 = 3 * h;
  for (let i = from; i < to; i += 4 * h) {
    for (let j = i; j < i + h; j++) {
      const a0 = a[j];
      const a1 = a[j + h];
      const a2 = a[j + h2];
      const a3 = a[j + h3];
      const s01 = a0 + a1;
      const d01 = a0 - a1;
      const s23 = a2 + a3;
      const d23 = a2 - a3;
      a[j] = s01 + s23;
      a[j + h] = d01 + d23;
      a[j + h2] = s01 - s23;
      a[j + h3] = d01 - d23;
    }
  }
}

/**
 * Transforms the 2^bits entries a[base .. base + 2^bits) in place (the kernel of {@link walshHadamard}; the
 * exhaustive spin kernel calls it on a small buffer with base 0).
 */
export function walshHadamardRange(a: Float64Array, base: number, bits: number): void {
  const end = base + (1 << bits);
  let h = 1;
  if (bits & 1) {
    for (let j = base; j < end; j += 2) {
      const x = a[j];
      const y = a[j + 1];
      a[j] = x + y;
      a[j + 1] = x - y;
    }
    h = 2;
  }
  for (; h < 1 << bits; h <<= 2) radix4Level(a, base, end, h);
}

/**
 * In-place unnormalised Walsh–Hadamard transform of a vector of length 2^n: cache-sized blocks first, then the
 * wide levels two at a time.
 * @param a - length 2^n.
 * @param n - number of bits.
 */
export function walshHadamard(a: Float64Array, n: number): void {
  const size = a.length;
  if (size !== 2 ** n) throw new Error(`Walsh–Hadamard transform: length ${size} is not 2^${n}`);
  const inner = Math.min(n, BLOCK_BITS);
  const block = 2 ** inner;
  // 1. The low levels inside cache-sized blocks.
  for (let base = 0; base < size; base += block) walshHadamardRange(a, base, inner);
  // 2. The wide levels two at a time (radix 4) to halve the passes over memory.
  let h = block;
  for (; h * 4 <= size; h *= 4) radix4Level(a, 0, size, h);
  if (h < size) {
    for (let j = 0; j < h; j++) {
      const x = a[j];
      const y = a[j + h];
      a[j] = x + y;
      a[j + h] = x - y;
    }
  }
}
