import { describe, expect, it } from "vitest";
import { amplifyTrial, schoeningAmplifiedExponent } from "../harness/predict/amplify.js";

/** Expected runs (2m+1)/sin²((2m+1)θ), m = ⌊π/(4θ)⌋, written out independently of amplify.ts. */
function runsAt(p: number): number {
  const t = Math.asin(Math.sqrt(p));
  const r = 2 * Math.floor(Math.PI / (4 * t)) + 1;
  return r / Math.sin(r * t) ** 2;
}

describe("amplifyTrial", () => {
  it("p = 1/4: one round succeeds with certainty", () => {
    // BHMT arXiv:quant-ph/0005055: with a = 1/4, θ = π/6 and one round gives sin²(3θ) = 1.
    const a = amplifyTrial(0.25);
    expect(a.rounds).toBe(1);
    expect(a.trial_runs).toBe(3);
    expect(a.success_probability).toBeCloseTo(1, 14);
    expect(a.queries).toBeCloseTo(3, 12);
  });

  it("m* for p = 1e-1 … 1e-8 matches ⌊π/(4 arcsin √p)⌋", () => {
    // Closed form ⌊π/(4 arcsin √p)⌋, evaluated with Python's math module: 2.441, 7.841, 24.83, 78.54, 248.4,
    // 785.398, 2483.6, 7853.98.
    const expected = [2, 7, 24, 78, 248, 785, 2483, 7853];
    for (let e = 1; e <= 8; e++) {
      const a = amplifyTrial(10 ** -e);
      expect(a.rounds).toBe(expected[e - 1]);
      expect(a.trial_runs).toBe(2 * expected[e - 1] + 1);
    }
  });

  it("one attempt succeeds with probability at least max(1 − p, p)", () => {
    // BHMT arXiv:quant-ph/0005055, Theorem 2: m = ⌊π/(4θ_a)⌋ rounds succeed with probability ≥ max(1 − a, a).
    for (let i = 1; i < 400; i++) {
      const p = 10 ** (-8 * (i / 400)) * 0.999;
      const a = amplifyTrial(p);
      expect(a.success_probability as number).toBeGreaterThanOrEqual(Math.max(1 - p, p) - 1e-12);
    }
  });

  it("handles p ≥ 1/4 (m* = 1 or 0) and p = 1", () => {
    expect(amplifyTrial(0.3).rounds).toBe(1); // π/(4 arcsin √0.3) = 1.35 (closed form)
    expect(amplifyTrial(0.7).rounds).toBe(0); // θ > π/4 (closed form)
    expect(amplifyTrial(0.7).queries).toBeCloseTo(1 / 0.7, 12); // plain sampling
    expect(amplifyTrial(1).queries).toBeCloseTo(1, 12);
  });

  it("p = 0 is not applicable, with a reason", () => {
    const a = amplifyTrial(0, 0, 1e-3, 100);
    expect(a.queries).toBeNull();
    expect(a.queries_log2).toBeNull();
    expect(a.queries_high).toBeNull();
    expect(a.steps).toBeNull();
    expect(a.reason).not.toBe("");
    expect(() => amplifyTrial(-0.1)).toThrow(RangeError);
    expect(() => amplifyTrial(0.5, 0.6, 0.7)).toThrow(RangeError);
  });

  it("carries p's interval exactly (a sawtooth, not monotone) and scales steps by the work per trial", () => {
    // Dense-grid extremes of the independently written runsAt(p) must lie inside [queries_low, queries_high]
    // and come close to them (the exact extremes sit at piece boundaries the grid can only approach).
    const intervals: Array<[number, number, number]> = [
      [1e-3, 8e-4, 1.3e-3],
      [0.3, 0.2, 0.45],
      [1e-5, 9.9e-6, 1.01e-5],
      [0.05, 0.01, 0.2],
    ];
    for (const [p, lo, hi] of intervals) {
      const a = amplifyTrial(p, lo, hi, 250);
      let gMin = Infinity;
      let gMax = 0;
      const steps = 200_000;
      for (let i = 0; i <= steps; i++) {
        const q = runsAt(lo + ((hi - lo) * i) / steps);
        gMin = Math.min(gMin, q);
        gMax = Math.max(gMax, q);
      }
      const low = a.queries_low as number;
      const high = a.queries_high as number;
      expect(low).toBeLessThanOrEqual(gMin * (1 + 1e-9));
      expect(high).toBeGreaterThanOrEqual(gMax * (1 - 1e-9));
      expect(gMin / low).toBeLessThan(1.002);
      expect(high / gMax).toBeLessThan(1.002);
      expect(low).toBeLessThanOrEqual(a.queries as number);
      expect(high).toBeGreaterThanOrEqual(a.queries as number);
      expect(a.steps).toBeCloseTo(250 * (a.queries as number), 6);
      expect(a.steps_high).toBeCloseTo(250 * high, 6);
    }
  });

  it("amplified runs over p = c·(3/4)^n grow like (4/3)^{n/2}", () => {
    // Schöning's 3-SAT trial succeeds with p ≈ c·(3/4)^n (Schöning, FOCS 1999); amplification needs
    // ≈ (4/3)^{n/2} runs: exponent (1/2)·log₂(4/3) = 0.2075187496 a variable (closed form; Ambainis
    // arXiv:quant-ph/0504012, BHMT arXiv:quant-ph/0005055).
    expect(schoeningAmplifiedExponent(3)).toBeCloseTo(0.2075187496394219, 14);
    expect(schoeningAmplifiedExponent(4)).toBeCloseTo(0.2924812503605781, 14); // (1/2)·log₂(3/2), closed form
    for (const c of [0.05, 0.3, 1]) {
      const xs: number[] = [];
      const ys: number[] = [];
      for (let n = 20; n <= 80; n++) {
        xs.push(n);
        ys.push(amplifyTrial(c * 0.75 ** n).queries_log2 as number);
      }
      const mx = xs.reduce((s, x) => s + x, 0) / xs.length;
      const my = ys.reduce((s, y) => s + y, 0) / ys.length;
      let sxy = 0;
      let sxx = 0;
      for (let i = 0; i < xs.length; i++) {
        sxy += (xs[i] - mx) * (ys[i] - my);
        sxx += (xs[i] - mx) ** 2;
      }
      expect(Math.abs(sxy / sxx - schoeningAmplifiedExponent(3))).toBeLessThan(0.002);
    }
  });
});
