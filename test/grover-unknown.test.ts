import { describe, expect, it } from "vitest";
import {
  averagedSuccessProbability,
  groverSuccessProbability,
  groverTheta,
  groverUnknown,
} from "../harness/predict/grover.js";
import { minFinding } from "../harness/predict/min-finding.js";
import { deriveSeed, Rng } from "../harness/random.js";

/** Direct average of sin²((2j+1)θ) over j = 0..c−1 (the definition in BBHT's Lemma 2). */
function directAverage(c: number, theta: number): number {
  let s = 0;
  for (let j = 0; j < c; j++) s += Math.sin((2 * j + 1) * theta) ** 2;
  return s / c;
}

describe("averaged success probability P_m (BBHT Lemma 2)", () => {
  it("N = 1024, M = 1, m = 10 gives 0.1201949909", () => {
    // 1/2 − sin(40θ)/(40 sin 2θ), sin²θ = 1/1024: 0.12019499087502 (closed form of BBHT arXiv:quant-ph/9605034
    // Lemma 2, evaluated numerically and matched by direct averaging).
    const theta = groverTheta(10, 1);
    expect(averagedSuccessProbability(10, theta)).toBeCloseTo(0.1201949909, 10);
    expect(averagedSuccessProbability(10, theta)).toBeCloseTo(directAverage(10, theta), 14);
    expect(0.5 - Math.sin(40 * theta) / (40 * Math.sin(2 * theta))).toBeCloseTo(0.1201949909, 10);
  });

  it("agrees with direct averaging on both evaluation paths (series and direct) and tiny angles", () => {
    // Definition of P_m in BBHT Lemma 2 (direct sums computed here).
    const cases: Array<[number, number, number]> = [
      [40, 1, 1000], // 2ca ≈ 0.004: series path
      [40, 1, 65], // just above the direct-sum threshold
      [24, 3, 5000], // 2ca ≈ 8.5: closed-form path
      [20, 1, 250], // 2ca ≈ 0.98: series path near its limit
      [20, 1, 260], // 2ca ≈ 1.02: closed-form path just past it
      [12, 4000, 100], // large θ
    ];
    for (const [n, M, c] of cases) {
      const theta = groverTheta(n, M);
      const direct = directAverage(c, theta);
      expect(Math.abs(averagedSuccessProbability(c, theta) - direct)).toBeLessThan(1e-12 * Math.max(direct, 1e-300) + 1e-16);
    }
    // n = 60, c = 100: P ≈ (4c² − 1)θ²/3 ≈ 1.16e−14 (leading Taylor term; hand-derived), relative precision kept.
    const t60 = groverTheta(60, 1);
    const p60 = averagedSuccessProbability(100, t60);
    expect(p60 / (((4 * 100 * 100 - 1) * t60 * t60) / 3)).toBeCloseTo(1, 10);
  });
});

describe("groverUnknown: exact expectation of the exponential-search schedule", () => {
  it("stays below BBHT's bound (9/2)/sin 2θ for N up to 2^24 and M in {1, 4, 16}", () => {
    // Bound: expected Grover iterations ≤ (9/2)·m₀, m₀ = 1/sin 2θ, for λ = 6/5 and 0 < M ≤ 3N/4
    // (BBHT arXiv:quant-ph/9605034, proof of Theorem 3; constant from memory). We check iterations alone and
    // iterations + checks.
    for (const M of [1, 4, 16]) {
      for (let n = 1; n <= 24; n++) {
        if (M > 0.75 * 2 ** n) continue;
        const g = groverUnknown(n, M);
        expect(g.bound_queries).not.toBeNull();
        expect(g.iterations as number).toBeLessThan(g.bound_queries as number);
        expect(g.queries as number).toBeLessThan(g.bound_queries as number);
        expect(g.queries as number).toBeCloseTo((g.iterations as number) + (g.checks as number), 9);
        // Sanity from below (common practice): Θ(√(N/M)) scaling, not a vanishing count.
        expect(g.iterations as number).toBeGreaterThan(0.1 * Math.sqrt(2 ** n / M) - 1);
      }
    }
  });

  it("reports the bound only inside its hypotheses; M = 0 is not applicable", () => {
    expect(groverUnknown(4, 13).bound_queries).toBeNull(); // M > 3N/4
    expect(groverUnknown(10, 1, 1.1).bound_queries).toBeNull(); // constant stated for λ = 6/5 only
    const none = groverUnknown(10, 0);
    expect(none.queries).toBeNull();
    expect(none.reason).not.toBe("");
    expect(() => groverUnknown(10, 1, 1)).toThrow(RangeError);
  });

  it("counts stages to saturation at √N", () => {
    // m_s = 1.2^s reaches √N = 32 when 1.2^s ≥ 32: s = ⌈ln 32 / ln 1.2⌉ = ⌈19.01⌉ = 20 (hand-computed).
    expect(groverUnknown(10, 1).stages_to_saturation).toBe(20);
    // N = 4: m = 1, 1.2, 1.44, 1.728, then min(2.0736, 2) = 2: four stages before saturation (hand-computed).
    expect(groverUnknown(2, 1).stages_to_saturation).toBe(4);
  });

  it("stays finite and in proportion at n = 60", () => {
    const g = groverUnknown(60, 1);
    expect(Number.isFinite(g.queries as number)).toBe(true);
    const ratio = (g.iterations as number) / (g.m0 as number);
    expect(ratio).toBeGreaterThan(2);
    expect(ratio).toBeLessThan(4.5);
  });

  it("agrees with a seeded Monte-Carlo run of the schedule", () => {
    // Simulates BBHT's Theorem 3 algorithm step by step: j uniform among the ⌈m⌉ integers below m, success with
    // the exact probability sin²((2j+1)θ) (Lemma 1), j + 1 queries a stage, m ← min(λm, √N).
    const cases: Array<[number, number]> = [
      [10, 1],
      [12, 4],
      [7, 3],
      [3, 1],
    ];
    for (const [n, M] of cases) {
      const rng = new Rng(deriveSeed("grover-unknown-montecarlo", n, M));
      const theta = groverTheta(n, M);
      const root = Math.sqrt(2 ** n);
      const runs = 40_000;
      let sum = 0;
      let sumSq = 0;
      for (let r = 0; r < runs; r++) {
        let m = 1;
        let q = 0;
        for (;;) {
          const j = rng.below(Math.ceil(m));
          q += j + 1;
          if (rng.nextDouble() < groverSuccessProbability(j, theta)) break;
          m = Math.min(1.2 * m, root);
        }
        sum += q;
        sumSq += q * q;
      }
      const mean = sum / runs;
      const se = Math.sqrt((sumSq / runs - mean * mean) / runs);
      const exact = groverUnknown(n, M).queries as number;
      expect(Math.abs(mean - exact)).toBeLessThan(4 * se);
    }
  });
});

describe("minFinding: Dürr–Høyer bound built on the unknown-count search", () => {
  it("is (45/4)√N + (7/10)(log₂N)², reported as a bound", () => {
    // arXiv:quant-ph/9607014: (45/4)·2^10 + (7/10)·20² = 11520 + 280 = 11800 for n = 20 (hand-computed).
    const f = minFinding(20);
    expect(f.queries).toBeCloseTo(11800, 9);
    expect(f.search_queries).toBeCloseTo(11520, 9);
    expect(f.update_queries).toBeCloseTo(280, 9);
    expect(f.queries_log2).toBeCloseTo(Math.log2(11800), 12);
    expect(f.queries_half_success).toBeCloseTo(23600, 9); // Markov: twice the expectation bound
    expect(f.is_bound).toBe(true);
    // n = 60: (45/4)·2^30 + 0.7·3600 = 12079595520 + 2520 (hand-computed).
    expect(minFinding(60).queries).toBe(12079598040);
    expect(() => minFinding(-1)).toThrow(RangeError);
  });
});
