/**
 * Seeded randomness for speedbound.
 *
 * Every random choice in the tool flows from a seed string derived by hashing the parts that identify it
 * (master seed, family parameters, n, instance index, solver, trial). A result therefore never depends on
 * worker count, order or shard. The generator is xoshiro128** (Blackman & Vigna, "Scrambled linear
 * pseudorandom number generators", ACM TOMS 47 (2021)), chosen because it needs only 32-bit integer
 * arithmetic, which V8 runs without boxing, so the same bytes come out on every machine.
 */

/** A seed: 32 lowercase hex digits (128 bits), as written to the CSV files. */
export type Seed = string;

/**
 * node:crypto, loaded with the first seed derived rather than with this module: `solve` derives none, and loading
 * it took about 5 ms of the command's start-up (issue 16).
 */
let nodeCrypto: typeof import("node:crypto") | null = null;

/**
 * Derives a seed from an ordered list of parts by SHA-256 of their canonical JSON.
 * @param parts - master seed first, then whatever identifies the consumer; numbers and strings only.
 */
export function deriveSeed(...parts: ReadonlyArray<string | number | boolean>): Seed {
  nodeCrypto ??= process.getBuiltinModule("node:crypto");
  return nodeCrypto.createHash("sha256").update(JSON.stringify(parts)).digest("hex").slice(0, 32);
}

/** Scratch words for {@link Rng.fromWords}; the constructor copies them. */
const WORDS = new Int32Array(4);

/** xoshiro128** generator. Methods are monomorphic and allocation-free so solvers may call them per step. */
export class Rng {
  /**
   * The four 32-bit state words s0..s3 of xoshiro128**, never all zero. Exposed so that a hot loop may copy them
   * into local variables, run the same update as {@link Rng.nextU32} there and store them back; such a loop must
   * reproduce `nextU32` exactly (the solvers' tests check theirs draw for draw). In a typed array rather than four
   * fields because V8 keeps int32 fields above 2^30 boxed as doubles: measured 2.9 → 1.5 ns a `nextU32` call
   * (20 million calls, node 20 on the 2-core test machine).
   */
  readonly state = new Int32Array(4);
  private spare = 0;
  private hasSpare = false;

  /**
   * @param seed - a {@link Seed} (32 hex digits: the state words in order, 8 digits each); other strings are
   * hashed first with {@link deriveSeed}. An Int32Array of four words is copied as the state instead (that form is
   * for {@link Rng.fromWords}).
   */
  constructor(seed: Seed | Int32Array) {
    const s = this.state;
    if (typeof seed === "string") {
      const hex = /^[0-9a-f]{32}$/.test(seed) ? seed : deriveSeed(seed);
      s[0] = parseInt(hex.slice(0, 8), 16);
      s[1] = parseInt(hex.slice(8, 16), 16);
      s[2] = parseInt(hex.slice(16, 24), 16);
      s[3] = parseInt(hex.slice(24, 32), 16);
    } else {
      s.set(seed.subarray(0, 4));
    }
    // The all-zero state is the generator's only fixed point.
    if ((s[0] | s[1] | s[2] | s[3]) === 0) s[0] = 0x9e3779b9 | 0;
  }

  /**
   * A generator with the given state words (each taken modulo 2^32), without hashing or parsing a string
   * (measured: 0.1 µs, against 0.6 µs from a hex Seed and 1.7 µs through {@link deriveSeed}). The all-zero state
   * is replaced, as in the constructor. `Rng.fromWords(1, 2, 3, 4)` equals `new Rng("00000001000000020000000300000004")`.
   */
  static fromWords(s0: number, s1: number, s2: number, s3: number): Rng {
    WORDS[0] = s0;
    WORDS[1] = s1;
    WORDS[2] = s2;
    WORDS[3] = s3;
    return new Rng(WORDS);
  }

  /** Next 32 random bits as an unsigned integer in [0, 2^32). */
  nextU32(): number {
    const s = this.state;
    const s0 = s[0];
    const s1 = s[1];
    const s2 = s[2] ^ s0;
    const s3 = s[3] ^ s1;
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9);
    s[0] = s0 ^ s3;
    s[1] = s1 ^ s2;
    s[2] = s2 ^ (s1 << 9);
    s[3] = rotl(s3, 11);
    return result >>> 0;
  }

  /** Uniform double in [0, 1) with 53 random bits. */
  nextDouble(): number {
    const hi = this.nextU32() >>> 5; // 27 bits
    const lo = this.nextU32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Uniform double in [0, 1) with 32 random bits: enough for acceptance tests, half the cost. */
  nextFloat32(): number {
    return this.nextU32() / 4294967296;
  }

  /**
   * Uniform integer in [0, bound) without modulo bias (Lemire, "Fast random integer generation in an
   * interval", ACM TOMACS 29 (2019)), for bound in [1, 2^32]: ⌊x·bound/2^32⌋ for the first 32-bit draw x whose
   * low product word x·bound mod 2^32 is not below 2^32 mod bound.
   */
  below(bound: number): number {
    // The low word comes from Math.imul (exact mod 2^32); the high word from one double product while
    // x·bound < 2^53 (bound ≤ 2^21), else from 16-bit halves. Same draws as the all-double version this
    // replaced (checked against BigInt in test/random.test.ts); measured 24 → 3 ns a call for bounds near 1000,
    // 84 → 12 ns for bound 3·10^9.
    let x = this.nextU32();
    let low = Math.imul(x, bound) >>> 0;
    if (low < bound) {
      const threshold = (4294967296 - bound) % bound;
      while (low < threshold) {
        x = this.nextU32();
        low = Math.imul(x, bound) >>> 0;
      }
    }
    if (bound <= 2097152) return Math.floor((x * bound) / 4294967296);
    const mid = (x & 0xffff) * bound;
    return Math.floor(((x >>> 16) * bound + Math.floor(mid / 65536)) / 65536);
  }

  /** Standard normal deviate (Marsaglia polar method; the second deviate is kept for the next call). */
  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spare;
    }
    let u = 0;
    let v = 0;
    let s = 0;
    do {
      u = 2 * this.nextDouble() - 1;
      v = 2 * this.nextDouble() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const f = Math.sqrt((-2 * Math.log(s)) / s);
    this.spare = v * f;
    this.hasSpare = true;
    return u * f;
  }

  /** Fair coin. */
  bit(): number {
    return this.nextU32() >>> 31;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
