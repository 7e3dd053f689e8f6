/**
 * Trial seeding, shared by every randomised solver: trial t of a cell draws only from trialRng(seed, t), so any
 * split of a cell's trials over calls or workers gives the same counts. The only place trial seeding is defined.
 */
import { deriveSeed, Rng } from "../harness/random.js";

/** The per-cell key of {@link trialRng}: four 32-bit words, computed once per call by {@link trialKey}. */
export type TrialKey = Int32Array;

/**
 * The key of a cell seed for {@link trialRng}: the first 128 bits of SHA-256 of the canonical JSON
 * `[seed, "trial"]` (that is, `deriveSeed(seed, "trial")`), read as four big-endian 32-bit words k0..k3.
 * Costs one SHA-256 (≈ 1.5 µs), so callers compute it once per cell and pass it to {@link trialRng}.
 */
export function trialKey(seed: string): TrialKey {
  const hex = deriveSeed(seed, "trial");
  const key = new Int32Array(4);
  for (let i = 0; i < 4; i++) key[i] = parseInt(hex.slice(8 * i, 8 * i + 8), 16);
  return key;
}

/** Odd increments of the four Weyl sequences in {@link trialRng} (fractional parts of √2, √3, √5, √7 × 2^32, made odd). */
const TRIAL_GAMMA = Int32Array.of(0x6a09e667, 0xbb67ae85 | 0, 0x3c6ef373, 0xa54ff53b | 0);

/**
 * The generator of trial t of a cell, shared by the walk and the annealer; the only place trial seeding is
 * defined. Trial t of a cell: write t = 2^32·t_hi + t_lo; with the key words k0..k3 of {@link trialKey}(seed),
 * state word i = fmix32((k_i XOR fmix32(t_hi)) + (t_lo + 1)·γ_i mod 2^32), i = 0..3, with γ the odd constants
 * 0x6a09e667, 0xbb67ae85, 0x3c6ef373, 0xa54ff53b and fmix32 the 32-bit finaliser of MurmurHash3 (x ^= x >>> 16;
 * x ·= 0x85ebca6b; x ^= x >>> 13; x ·= 0xc2b2ae35; x ^= x >>> 16, products mod 2^32); the generator is
 * `Rng.fromWords` of these words (xoshiro128**; an all-zero state is replaced there). Each word is thus the
 * output of a SplitMix-style generator (a Weyl sequence through a bijective mixer: Steele, Lea & Flood, "Fast
 * splittable pseudorandom number generators", OOPSLA 2014) at step t, keyed by the cell, following the advice
 * of xoshiro's authors to fill its state from such a generator. Depends on nothing but (seed, t), so trial
 * counts do not depend on how a range of trials is split. Cost: about 70 ns with a precomputed key, against
 * 1.7 µs for the SHA-256 per trial of the derivation it replaced (`new Rng(deriveSeed(seed, "trial", t))`, an
 * eighth of a 3n-flip walk trial at n = 28 then).
 * @param seed - the cell seed, or its {@link trialKey} (what the solvers pass, hashing once per call).
 * @param t - trial index, a safe integer ≥ 0.
 */
export function trialRng(seed: string | TrialKey, t: number): Rng {
  const key = typeof seed === "string" ? trialKey(seed) : seed;
  const hi = fmix32((t / 4294967296) >>> 0); // t_hi (t < 2^53)
  const step = (t + 1) | 0; // t_lo + 1 mod 2^32
  return Rng.fromWords(
    fmix32((key[0] ^ hi) + Math.imul(step, TRIAL_GAMMA[0])),
    fmix32((key[1] ^ hi) + Math.imul(step, TRIAL_GAMMA[1])),
    fmix32((key[2] ^ hi) + Math.imul(step, TRIAL_GAMMA[2])),
    fmix32((key[3] ^ hi) + Math.imul(step, TRIAL_GAMMA[3])),
  );
}

/** MurmurHash3's 32-bit finaliser (a bijection of 32-bit words with full avalanche), on int32 values. */
function fmix32(x: number): number {
  x ^= x >>> 16;
  x = Math.imul(x, 0x85ebca6b);
  x ^= x >>> 13;
  x = Math.imul(x, 0xc2b2ae35);
  return x ^ (x >>> 16);
}

/**
 * Uniform integer in [0, bound) for 1 ≤ bound ≤ 2^32, by the same rejection method as `Rng.below`
 * (Lemire, ACM TOMACS 29 (2019)) and drawing the same numbers. This was the walk's fast draw while `Rng.below`
 * used floating-point modulo; `Rng.below` now works the same way and the walk calls it, and this stays as a
 * second implementation the tests compare it with.
 */
export function uniformBelow(rng: Rng, bound: number): number {
  let x = rng.nextU32();
  let low = Math.imul(x, bound) >>> 0;
  if (low < bound) {
    const threshold = (4294967296 - bound) % bound;
    while (low < threshold) {
      x = rng.nextU32();
      low = Math.imul(x, bound) >>> 0;
    }
  }
  if (bound <= 2097152) return Math.floor((x * bound) / 4294967296);
  // x·bound exceeds 2^53 here: form the high word from 16-bit halves so it stays exact.
  const xh = x >>> 16;
  const xl = x & 0xffff;
  const mid = xl * bound;
  return Math.floor((xh * bound + Math.floor(mid / 65536)) / 65536);
}

/**
 * A trial's uniformly random start, the same draws for every solver: ⌈n/32⌉ calls of `nextU32`, bit b of call i
 * giving variable 32·i + b (out[v] = 0 or 1, n = out.length; an Int32Array view lets a solver keep other state in
 * the entries' higher bits, written over here).
 */
export function randomAssignment(rng: Rng, out: Uint8Array | Int32Array): void {
  const n = out.length;
  for (let v = 0; v < n; v += 32) {
    const bits = rng.nextU32();
    const top = Math.min(32, n - v);
    for (let b = 0; b < top; b++) out[v + b] = (bits >>> b) & 1;
  }
}
