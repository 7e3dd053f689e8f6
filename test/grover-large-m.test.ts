/**
 * Grover predictions from exact counts at the sizes counting reaches (issue 16): n up to 200 and M beyond 2^53,
 * where M reaches the predictors as the nearest double (relative error ≤ 2^−53, far below any figure they print).
 */
import { describe, expect, it } from "vitest";
import { groverKnown, groverUnknown } from "../harness/predict/grover.js";
import { minFinding } from "../harness/predict/min-finding.js";

describe("Grover predictions at counted sizes", () => {
  it("n = 100, M = 2^80 + 12345: θ = asin(√(M/N)) ≈ 2^−10, k* = ⌊π/(4θ)⌋ = 804", () => {
    // sin²θ = M/N ≈ 2^−20 (BBHT arXiv:quant-ph/9605034); π/(4·asin(2^−10)) = 804.2475… (hand-computed).
    const m = Number(2n ** 80n + 12345n);
    const g = groverKnown(100, m);
    expect(g.theta).toBeCloseTo(Math.asin(2 ** -10), 15);
    expect(g.k_star).toBe(804);
    expect(g.success_probability).toBeGreaterThan(0.999);
    expect(g.queries_log2).toBeCloseTo(Math.log2(805 / (g.success_probability as number)), 12);
  });

  it("n = 100, M = 4.7·10^7 (a planted 3-SAT count): queries ≈ (π/4)√(N/M), finite and above the proven bound's floor", () => {
    const m = 47_000_000;
    const g = groverKnown(100, m);
    const approx = (Math.PI / 4) * Math.sqrt(2 ** 100 / m); // large-N limit of k* + 1 (BBHT; hand-computed)
    expect((g.queries as number) / approx).toBeCloseTo(1, 6);
    const u = groverUnknown(100, m);
    expect(Number.isFinite(u.queries as number)).toBe(true);
    expect(u.queries as number).toBeGreaterThan(g.queries as number);
    expect(u.queries as number).toBeLessThan(u.bound_queries as number);
  });

  it("min-finding at n = 200 stays finite: (45/4)·2^100 + 0.7·200² (arXiv:quant-ph/9607014)", () => {
    expect(minFinding(200).queries).toBeCloseTo((45 / 4) * 2 ** 100 + 0.7 * 200 * 200, -20);
  });
});
