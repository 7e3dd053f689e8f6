import { describe, expect, it } from "vitest";
import { groverKnown, groverSuccessProbability, groverTheta } from "../harness/predict/grover.js";
import { groverCurve } from "./helpers/statevector.js";

describe("groverKnown: published check values", () => {
  it("N = 4, M = 1: one iteration finds the marked item with certainty", () => {
    // BBHT arXiv:quant-ph/9605034, section 3: with t = N/4 a single iteration succeeds with certainty.
    const g = groverKnown(2, 1);
    expect(g.k_star).toBe(1);
    expect(g.success_probability).toBeCloseTo(1, 14);
    expect(g.queries_per_attempt).toBe(2); // 1 iteration + 1 check (our counting convention)
    expect(g.queries).toBeCloseTo(2, 12);
    expect(g.queries_log2).toBeCloseTo(1, 12);
  });

  it("N = 8, M = 1: two iterations succeed with probability 121/128", () => {
    // Closed form sin²(5θ) with sin θ = 1/√8: sin 5θ = s(16s⁴ − 20s² + 5) = 2.75·s, squared 7.5625/8 = 121/128
    // (BBHT arXiv:quant-ph/9605034, Lemma 1 formula; hand-computed).
    expect(groverSuccessProbability(2, groverTheta(3, 1))).toBeCloseTo(121 / 128, 14);
    const g = groverKnown(3, 1);
    expect(g.k_star).toBe(2); // ⌊π/(4·asin(1/√8))⌋ = ⌊2.17⌋ (closed form)
    expect(g.success_probability).toBeCloseTo(121 / 128, 14);
    expect(g.queries).toBeCloseTo(3 / (121 / 128), 12);
  });

  it("N = 4, M = 2: no gain, success stays 1/2", () => {
    // θ = π/4, sin²((2k+1)π/4) = 1/2 for every k (BBHT closed form; hand-computed).
    const theta = groverTheta(2, 2);
    for (let k = 0; k < 6; k++) expect(groverSuccessProbability(k, theta)).toBeCloseTo(0.5, 14);
    expect(groverKnown(2, 2).success_probability).toBeCloseTo(0.5, 14);
  });

  it("N = 2^20, M = 1: k* = 804", () => {
    // ⌊π/(4·asin(2^−10))⌋ = ⌊804.25⌋ = 804 (closed form, evaluated with Python's math module).
    expect(groverKnown(20, 1).k_star).toBe(804);
  });

  it("keeps precision at n = 60", () => {
    // ⌊π/(4·asin(2^−30))⌋ = 843314856 (closed form, evaluated with Python's math module).
    const g = groverKnown(60, 1);
    expect(g.k_star).toBe(843314856);
    expect(g.theta).toBeCloseTo(2 ** -30, 24);
    // BBHT: failure ≤ M/N = 2^−60 with k* = ⌊π/(4θ)⌋, far below double rounding near 1.
    expect(g.success_probability).toBeGreaterThanOrEqual(1 - 1e-15);
    expect(g.queries_log2).toBeCloseTo(Math.log2((843314856 + 1) / (g.success_probability as number)), 10);
  });

  it("M = 0 is not applicable; M > N/2 degenerates to sampling", () => {
    const none = groverKnown(10, 0);
    expect(none.queries).toBeNull();
    expect(none.queries_log2).toBeNull();
    expect(none.reason).not.toBe("");
    // θ > π/4 gives k* = 0 and P = M/N = 3/4: 1 check per attempt, 4/3 expected (closed form).
    const many = groverKnown(2, 3);
    expect(many.k_star).toBe(0);
    expect(many.queries).toBeCloseTo(4 / 3, 12);
    expect(() => groverKnown(3, 9)).toThrow(RangeError);
    expect(() => groverKnown(3.5, 1)).toThrow(RangeError);
  });
});

describe("groverKnown against an exact state-vector simulation", () => {
  // Several (n, marked sets) with n ≤ 10; the simulation is independent of the closed form.
  const cases: Array<[number, number[]]> = [
    [2, [1]],
    [3, [5]],
    [4, [0, 9, 15]],
    [5, [0, 17]],
    [6, [1, 2, 3]],
    [7, [100]],
    [8, [7, 8, 200, 255]],
    [9, [0]],
    [10, [42]],
    [10, [3, 500, 1000, 1023, 77, 12, 640, 901, 15, 16, 17, 18, 19, 20, 21, 22]],
  ];
  for (const [n, marked] of cases) {
    it(`n = ${n}, M = ${marked.length}: sin²((2k+1)θ) for every k ≤ 2k*`, () => {
      const theta = groverTheta(n, marked.length);
      const kStar = groverKnown(n, marked.length).k_star as number;
      const kMax = Math.max(2, 2 * kStar);
      const curve = groverCurve(n, marked, kMax);
      for (let k = 0; k <= kMax; k++) {
        expect(Math.abs(curve[k] - groverSuccessProbability(k, theta))).toBeLessThan(1e-12);
      }
      // k* = ⌊π/(4θ)⌋ fails with probability at most M/N (BBHT arXiv:quant-ph/9605034, section 3).
      expect(curve[kStar]).toBeGreaterThanOrEqual(1 - marked.length / 2 ** n - 1e-12);
    });
  }
});
