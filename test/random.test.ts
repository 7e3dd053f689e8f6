// The seeded generator: published check values of xoshiro128**, exact uniformity of below() for bounds of any
// size, and stable seed derivation.
import { describe, expect, it } from "vitest";
import { Rng, deriveSeed } from "../harness/random.js";

describe("Rng", () => {
  it("matches the reference xoshiro128** output for state (1, 2, 3, 4)", () => {
    // Reference algorithm xoshiro128starstar.c (Blackman & Vigna, "Scrambled linear pseudorandom number
    // generators", ACM TOMS 47 (2021)); values produced by a C transcription of it compiled with gcc here, seeded
    // with s = {1, 2, 3, 4}. The first is also checkable by hand: rotl(2·5, 7)·9 = 1280·9 = 11520.
    const rng = new Rng("00000001000000020000000300000004");
    const out = Array.from({ length: 6 }, () => rng.nextU32());
    expect(out).toEqual([11520, 0, 5927040, 70819200, 2031721883, 1637235492]);
  });

  it("below(bound) equals the exact 64-bit multiply-high of x·bound, for small and large bounds", () => {
    // Lemire's method (ACM TOMACS 29, 2019): result = floor(x·bound / 2^32), checked with BigInt arithmetic.
    for (const bound of [1, 2, 3, 7, 1000, 2 ** 21, 2 ** 21 + 1, 3_000_000_007, 2 ** 32 - 1]) {
      const a = new Rng(deriveSeed("below", bound));
      const b = new Rng(deriveSeed("below", bound));
      for (let i = 0; i < 2000; i++) {
        const got = a.below(bound);
        let x = BigInt(b.nextU32());
        let product = x * BigInt(bound);
        const threshold = (2n ** 32n - BigInt(bound)) % BigInt(bound);
        while (product % 2n ** 32n < threshold) {
          x = BigInt(b.nextU32());
          product = x * BigInt(bound);
        }
        expect(got).toBe(Number(product / 2n ** 32n));
        expect(got).toBeLessThan(bound);
      }
    }
  });

  it("fromWords(1, 2, 3, 4) gives the reference stream of state (1, 2, 3, 4); words are taken modulo 2^32", () => {
    // Same reference values as above (C transcription of xoshiro128starstar.c).
    const out = (rng: Rng) => Array.from({ length: 6 }, () => rng.nextU32());
    expect(out(Rng.fromWords(1, 2, 3, 4))).toEqual([11520, 0, 5927040, 70819200, 2031721883, 1637235492]);
    expect(out(Rng.fromWords(1 + 2 ** 32, 2 - 2 ** 32, 3, 4))).toEqual([11520, 0, 5927040, 70819200, 2031721883, 1637235492]);
    expect(out(Rng.fromWords(-1, 0x89abcdef, 7, 8))).toEqual(out(new Rng("ffffffff89abcdef0000000700000008")));
  });

  it("replaces the all-zero state, the generator's only fixed point, in both constructors alike", () => {
    // The state update is linear over GF(2) (shifts, rotations, XORs), so zero maps to zero and every output,
    // 9·rotl(5·0, 7), is 0: the reason the authors' code must never be seeded with it (closed form).
    const fromWords = Rng.fromWords(0, 0, 0, 0);
    const fromHex = new Rng("00000000000000000000000000000000");
    const draws = Array.from({ length: 8 }, () => fromWords.nextU32());
    expect(draws.some((x) => x !== 0)).toBe(true);
    expect(Array.from({ length: 8 }, () => fromHex.nextU32())).toEqual(draws);
  });

  it("exposes its state words: the documented xoshiro128** update on them reproduces nextU32", () => {
    // The update as in xoshiro128starstar.c (Blackman & Vigna 2021), on a copy of the words.
    const rng = new Rng(deriveSeed("state"));
    let [s0, s1, s2, s3] = Array.from(rng.state);
    const rotl = (x: number, k: number) => (x << k) | (x >>> (32 - k));
    for (let i = 0; i < 1000; i++) {
      const expected = Math.imul(rotl(Math.imul(s1, 5), 7), 9) >>> 0;
      const t = s1 << 9;
      s2 ^= s0;
      s3 ^= s1;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= t;
      s3 = rotl(s3, 11);
      expect(rng.nextU32()).toBe(expected);
    }
    expect(Array.from(rng.state)).toEqual([s0, s1, s2, s3]);
  });

  it("derives seeds as stable SHA-256 hex strings", () => {
    expect(deriveSeed("7", "ksat", 20, 3)).toMatch(/^[0-9a-f]{32}$/);
    expect(deriveSeed("7", "ksat", 20, 3)).toBe(deriveSeed("7", "ksat", 20, 3));
    expect(deriveSeed("7", "ksat", 20, 3)).not.toBe(deriveSeed("7", "ksat", 20, 4));
  });
});
