import { describe, expect, it } from "vitest";
import { ttsFromCounts, ttsTrials, wilsonInterval, Z95 } from "../harness/stats/tts.js";

describe("ttsTrials", () => {
  it("matches TTS_0.99 = ln(0.01)/ln(1 − p) (Rønnow et al., Science 345, 420 (2014))", () => {
    // Check values from issue 3, recomputed here from the formula: ln 0.01 / ln 0.5 = 6.6439,
    // ln 0.01 / ln 0.9 = 43.709, ln 0.01 / ln 0.99 = 458.21.
    expect(ttsTrials(0.5)).toBeCloseTo(6.644, 3);
    expect(ttsTrials(0.1)).toBeCloseTo(43.71, 2);
    expect(ttsTrials(0.01)).toBeCloseTo(458.2, 1);
  });

  it("needs one trial when p ≥ target and infinitely many when p = 0 (the formula's limits)", () => {
    expect(ttsTrials(0.99)).toBe(1);
    expect(ttsTrials(1)).toBe(1);
    expect(ttsTrials(0.995)).toBe(1);
    expect(ttsTrials(0)).toBe(Infinity);
    // Continuous at p = target: just below, the formula gives just above one trial,
    // ln 0.01 / ln 0.0101 = 4.60517/4.59522 = 1.00217 (by hand).
    expect(ttsTrials(0.9899)).toBeCloseTo(1.00217, 5);
  });

  it("stays accurate for tiny p: ln(0.01)/ln(1 − p) → −ln(0.01)/p (first-order expansion)", () => {
    // For p = 1e−12, ln(1 − p) = −p − p²/2 − …, so the result is 4.60517…e12 to 12 digits.
    expect(ttsTrials(1e-12) / (-Math.log(0.01) / 1e-12)).toBeCloseTo(1, 10);
  });

  it("honours another target: ln(1 − 0.5)/ln(1 − 0.5) = 1 trial for a 50% target at p = 0.5 (closed form)", () => {
    expect(ttsTrials(0.5, 0.5)).toBe(1);
    expect(ttsTrials(0.25, 0.5)).toBeCloseTo(Math.log(0.5) / Math.log(0.75), 12);
  });

  it("rejects p outside [0, 1] and targets outside (0, 1)", () => {
    expect(() => ttsTrials(-0.1)).toThrow(RangeError);
    expect(() => ttsTrials(1.1)).toThrow(RangeError);
    expect(() => ttsTrials(Number.NaN)).toThrow(RangeError);
    expect(() => ttsTrials(0.5, 1)).toThrow(RangeError);
  });
});

describe("wilsonInterval", () => {
  it("gives [0.4902, 0.9433] for 8 of 10 (worked textbook value, from memory; verified by the closed form)", () => {
    // Closed form by hand, z = 1.96: z²/N = 0.38415, centre = (0.8 + 0.19207)/1.38415 = 0.71674,
    // half-width = (1.96/1.38415)·√(0.016 + 0.0096037) = 0.22658 → [0.49016, 0.94332].
    const w = wilsonInterval(8, 10);
    expect(w.p).toBe(0.8);
    expect(w.low).toBeCloseTo(0.4902, 4);
    expect(w.high).toBeCloseTo(0.9433, 4);
  });

  it("reproduces Newcombe's score-interval examples (Stat. Med. 17 (1998) 857, Table II, from memory; agree with the closed form to 4 decimals)", () => {
    const cases: Array<[number, number, number, number]> = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
    ];
    for (const [s, n, low, high] of cases) {
      const w = wilsonInterval(s, n);
      expect(w.low).toBeCloseTo(low, 4);
      expect(w.high).toBeCloseTo(high, 4);
    }
  });

  it("has end points that solve Wilson's defining equation (p̂ − p)² = z²·p(1 − p)/N (Wilson, JASA 22 (1927) 209)", () => {
    for (const [s, n] of [[3, 17], [50, 100], [999, 1000], [1, 1_000_000]] as const) {
      const w = wilsonInterval(s, n);
      const phat = s / n;
      for (const p of [w.low, w.high]) {
        const lhs = (phat - p) ** 2;
        const rhs = (Z95 * Z95 * p * (1 - p)) / n;
        expect(Math.abs(lhs - rhs)).toBeLessThan(1e-12 * Math.max(rhs, 1e-300) + 1e-18);
      }
      expect(w.low).toBeLessThan(phat);
      expect(w.high).toBeGreaterThan(phat);
    }
  });

  it("pins the ends: 0 successes → low 0, all successes → high 1, no trials → [0, 1] (the interval's limits)", () => {
    expect(wilsonInterval(0, 50).low).toBe(0);
    expect(wilsonInterval(50, 50).high).toBe(1);
    // Upper end for 0 of N is z²/(N + z²) (closed form with p̂ = 0).
    expect(wilsonInterval(0, 50).high).toBeCloseTo((Z95 * Z95) / (50 + Z95 * Z95), 12);
    const none = wilsonInterval(0, 0);
    expect([none.low, none.high]).toEqual([0, 1]);
    expect(Number.isNaN(none.p)).toBe(true);
  });

  it("narrows with a smaller z: the one-sided 95% bound (z = 1.644854) lies inside the two-sided 95% interval", () => {
    const two = wilsonInterval(7, 40);
    const one = wilsonInterval(7, 40, 1.644854);
    expect(one.high).toBeLessThan(two.high);
    expect(one.low).toBeGreaterThan(two.low);
  });

  it("rejects impossible counts", () => {
    expect(() => wilsonInterval(5, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(-1, 4)).toThrow(RangeError);
    expect(() => wilsonInterval(1.5, 4)).toThrow(RangeError);
  });
});

describe("ttsFromCounts", () => {
  it("scales trials by the cost per trial and carries the interval from p (low p → high TTS)", () => {
    const s = ttsFromCounts(5, 10, 100);
    const w = wilsonInterval(5, 10);
    expect(s.p).toBe(0.5);
    expect(s.tts).toBeCloseTo(100 * (Math.log(0.01) / Math.log(0.5)), 9);
    expect(s.tts_low).toBeCloseTo(100 * ttsTrials(w.high), 9);
    expect(s.tts_high).toBeCloseTo(100 * ttsTrials(w.low), 9);
    expect(s.tts_low!).toBeLessThan(s.tts!);
    expect(s.tts_high!).toBeGreaterThan(s.tts!);
    expect(s.lower_bound_only).toBe(false);
  });

  it("reports only a lower bound, from p_high, when nothing succeeded (our convention: null for unknown)", () => {
    const s = ttsFromCounts(0, 200, 3);
    expect(s.p).toBe(0);
    expect(s.tts).toBeNull();
    expect(s.tts_high).toBeNull();
    expect(s.lower_bound_only).toBe(true);
    expect(s.tts_low).toBeCloseTo(3 * ttsTrials(wilsonInterval(0, 200).high), 9);
  });

  it("costs one trial when p ≥ 0.99, and knows nothing without trials", () => {
    const all = ttsFromCounts(1000, 1000, 7);
    expect(all.tts).toBe(7);
    expect(all.tts_low).toBe(7);
    const none = ttsFromCounts(0, 0, 7);
    expect(none.p).toBeNull();
    expect(none.tts).toBeNull();
    expect(none.tts_low).toBe(7); // p_high = 1 → one trial is the only bound
    expect(none.lower_bound_only).toBe(true);
  });

  it("rejects a negative or non-finite cost per trial", () => {
    expect(() => ttsFromCounts(1, 2, -1)).toThrow(RangeError);
    expect(() => ttsFromCounts(1, 2, Infinity)).toThrow(RangeError);
  });
});
