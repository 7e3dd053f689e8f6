/**
 * Seeded randomness for speedbound.
 *
 * Every random choice in the tool flows from a seed string derived by hashing the parts that identify it
 * (master seed, family parameters, n, instance index, solver, trial). A result therefore never depends on
 * worker count, order or shard. The generator is xoshiro128** (Blackman & Vigna, "Scrambled linear
 * pseudorandom number generators", ACM TOMS 47 (2021)), chosen because it needs only 32-bit integer
 * arithmetic, which V8 runs without boxing, so the same bytes come out on every machine.
 */
import { createHash } from "node:crypto";

/** A seed: 32 lowercase hex digits (128 bits), as written to the CSV files. */
export type Seed = string;

/**
 * Derives a seed from an ordered list of parts by SHA-256 of their canonical JSON.
 * @param parts - master seed first, then whatever identifies the consumer; numbers and strings only.
 */
export function deriveSeed(...parts: ReadonlyArray<string | number | boolean>): Seed {
  return createHash("sha256").update(JSON.stringify(parts)).digest("hex").slice(0, 32);
}

/** xoshiro128** generator. Methods are monomorphic and allocation-free so solvers may call them per step. */
export class Rng {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spare = 0;
  private hasSpare = false;

  /** @param seed - a {@link Seed} (32 hex digits); shorter hex strings are hashed first. */
  constructor(seed: Seed) {
    const hex = /^[0-9a-f]{32}$/.test(seed) ? seed : deriveSeed(seed);
    this.s0 = parseInt(hex.slice(0, 8), 16) | 0;
    this.s1 = parseInt(hex.slice(8, 16), 16) | 0;
    this.s2 = parseInt(hex.slice(16, 24), 16) | 0;
    this.s3 = parseInt(hex.slice(24, 32), 16) | 0;
    // The all-zero state is the generator's only fixed point.
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 0x9e3779b9 | 0;
  }

  /** Next 32 random bits as an unsigned integer in [0, 2^32). */
  nextU32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5), 7), 9);
    const t = this.s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
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
   * interval", ACM TOMACS 29 (2019)), for bound in [1, 2^32].
   */
  below(bound: number): number {
    // x·bound needs up to 64 bits; split x into 16-bit halves so every product stays exact in a double.
    // For bound ≤ 2^21 this gives exactly the draws of the plain product (which is then exact too).
    let x = this.nextU32();
    let hi = (x >>> 16) * bound;
    let mid = (hi % 65536) * 65536 + (x & 0xffff) * bound;
    let l = mid % 4294967296;
    if (l < bound) {
      const threshold = (4294967296 - bound) % bound;
      while (l < threshold) {
        x = this.nextU32();
        hi = (x >>> 16) * bound;
        mid = (hi % 65536) * 65536 + (x & 0xffff) * bound;
        l = mid % 4294967296;
      }
    }
    return Math.floor(hi / 65536) + Math.floor(mid / 4294967296);
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
