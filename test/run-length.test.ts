/**
 * Run-length distributions: success probability, TTS at a cut-off and the best cut-off, on RLDs computed by hand.
 * TTS_0.99(c) = max(c, 1)·ln(0.01)/ln(1 − p(c)) (Rønnow et al., Science 345 (2014) 420); the decimals below were
 * worked out by hand from that formula (ln 0.01 = −4.605170, ln 0.75 = −0.287682, ln 0.25 = −1.386294,
 * ln(5/6) = −0.182322, ln(1/3) = −1.098612, ln(1/6) = −1.791759, ln 0.5 = −0.693147).
 */
import { describe, expect, it } from "vitest";
import { bestCutoff, bestCutoffForSize, concatRunLengths, medianFlips, successAt, ttsAt, type RunLengths } from "../harness/stats/run-length.js";

const rld = (flips: number[], solved: number[], cap: number): RunLengths => ({ flips: Float64Array.from(flips), solved: Uint8Array.from(solved), cap });
// Four trials: solved after 2, 5 and 5 flips, one censored at the cap of 10.
const A = rld([2, 5, 5, 10], [1, 1, 1, 0], 10);
// Two trials solved after 1 and 8 flips.
const B = rld([1, 8], [1, 1], 10);

describe("run-length distribution", () => {
  it("success probability at a cut-off", () => {
    expect(successAt(A, 1)).toBe(0);
    expect(successAt(A, 2)).toBe(0.25);
    expect(successAt(A, 4.9)).toBe(0.25);
    expect(successAt(A, 5)).toBe(0.75);
    expect(successAt(A, 10)).toBe(0.75); // the censored trial never counts
    expect(() => successAt(A, 11)).toThrow(/cap/);
  });

  it("TTS at a cut-off", () => {
    expect(ttsAt(A, 2)).toBeCloseTo(2 * 16.007845, 4); // p = 1/4: ln 0.01/ln 0.75 = 16.007845
    expect(ttsAt(A, 5)).toBeCloseTo(5 * 3.321928, 4); // p = 3/4: ln 0.01/ln 0.25
    expect(ttsAt(A, 1)).toBe(Infinity);
    expect(ttsAt(rld([3, 3], [1, 1], 3), 3)).toBe(3); // p = 1: one run
    expect(ttsAt(rld([0], [1], 5), 0)).toBe(1); // solved at the start: a run costs at least one flip
  });

  it("best cut-off of one RLD", () => {
    const best = bestCutoff(A);
    expect(best?.cutoff).toBe(5);
    expect(best?.p).toBe(0.75);
    expect(best?.tts).toBeCloseTo(16.60964, 4);
    expect(bestCutoff(rld([7, 7], [0, 0], 7))).toBeNull();
  });

  it("best cut-off for a size, pooled and by the median over instances", () => {
    // Pooled (6 trials): c = 1: p = 1/6 → 25.2585; c = 2: 1/3 → 22.7155; c = 5: 2/3 → 20.9590; c = 8: 5/6 → 20.5617.
    const pooled = bestCutoffForSize([A, B], "pooled");
    expect(pooled?.cutoff).toBe(8);
    expect(pooled?.p).toBeCloseTo(5 / 6, 12);
    expect(pooled?.tts).toBeCloseTo(20.5617, 3);
    // Median of two = their mean: c = 2: (32.0157 + 13.2877)/2 = 22.6517; c = 5: (16.6096 + 33.2193)/2 = 24.9145;
    // c = 8: (26.5754 + 8)/2 = 17.2877; c = 1: A has p = 0 → infinite, skipped.
    const median = bestCutoffForSize([A, B], "median");
    expect(median?.cutoff).toBe(8);
    expect(median?.tts).toBeCloseTo(17.2877, 3);
  });

  it("median flips counts censored trials as infinite; concatenation keeps order and the smallest cap", () => {
    expect(medianFlips(A)).toBe(5);
    expect(medianFlips(rld([4, 9, 9], [1, 0, 0], 9))).toBe(Infinity);
    const both = concatRunLengths([A, rld([1], [1], 6)]);
    expect([...both.flips]).toEqual([2, 5, 5, 10, 1]);
    expect(both.cap).toBe(6);
  });
});
