import { describe, expect, it } from "vitest";
import { crossoverClosedForm, findCrossover } from "../harness/stats/crossover.js";

describe("crossover size n*", () => {
  it("two exact exponentials cross at the closed-form n*", () => {
    // Classical 2^(0.8n − 20) s on one core, divided by S = 4; quantum 2^(0.5n + 3) queries × 2^(−12.4) s per
    // query. Equal when 0.8n − 20 − 2 = 0.5n + 3 − 12.4, i.e. n* = (3 − 12.4 + 20 + 2)/(0.8 − 0.5) = 42
    // (closed form, hand computation).
    const classical = { slope: 0.8, intercept: -20 };
    const quantum = { slope: 0.5, intercept: 3 };
    const log2T = -12.4;
    const closed = crossoverClosedForm(classical, quantum, log2T, 4);
    expect(closed).toBeCloseTo(42, 10);
    const x = findCrossover({ classical, quantum, parallelism: 4, secondsPerQuery: () => 2 ** log2T });
    expect(x.status).toBe("crossing");
    expect(x.n!).toBeCloseTo(closed, 6);
    // Time there: classical 2^(0.8·42 − 20 − 2) = 2^11.6 s (closed form).
    expect(x.log2Seconds!).toBeCloseTo(11.6, 6);
    expect(x.seconds!).toBeCloseTo(2 ** 11.6, 3);
  });

  it("a run of unrelated parameters agrees with the closed form", () => {
    // Closed form n* = (c_q + log₂T − c_c + log₂S)/(a_c − a_q) against the numerical search.
    const cases = [
      { ac: 0.29, cc: -28.1, aq: 0.15, cq: 2.2, log2T: Math.log2(170e-6 * 1e3), s: 1 },
      { ac: 1, cc: -30, aq: 0.5, cq: 0, log2T: Math.log2(4.26 * 170e-6 * 30), s: 64 },
      { ac: 0.41, cc: -25, aq: 0.2, cq: 3, log2T: -5, s: 1000 },
    ];
    for (const k of cases) {
      const classical = { slope: k.ac, intercept: k.cc };
      const quantum = { slope: k.aq, intercept: k.cq };
      const closed = crossoverClosedForm(classical, quantum, k.log2T, k.s);
      const x = findCrossover({ classical, quantum, parallelism: k.s, secondsPerQuery: () => 2 ** k.log2T });
      // Hand computation: n* ≈ 198.1, 61.0 and 157.0, all inside the default range [1, 1000].
      expect(closed).toBeGreaterThan(1);
      expect(closed).toBeLessThan(1000);
      expect(x.n!).toBeCloseTo(closed, 6);
    }
  });

  it("a seconds-per-query that grows with n moves n* to where the two times are equal", () => {
    // T(n) = 4.26·n Toffolis × 170 µs (a polynomial cost per query): at n* the two log₂ times agree
    // (definition of the crossover); before it the classical side is faster.
    const classical = { slope: 0.9, intercept: -31 };
    const quantum = { slope: 0.5, intercept: 1 };
    const T = (n: number): number => 4.26 * n * 170e-6;
    const x = findCrossover({ classical, quantum, secondsPerQuery: T });
    const diff = (n: number): number => classical.slope * n + classical.intercept - (quantum.slope * n + quantum.intercept + Math.log2(T(n)));
    expect(x.status).toBe("crossing");
    expect(Math.abs(diff(x.n!))).toBeLessThan(1e-8);
    expect(diff(x.n! - 0.5)).toBeLessThan(0);
    // A constant T equal to T(n*) gives the same n* through the closed form (closed form at the fixed point).
    expect(crossoverClosedForm(classical, quantum, Math.log2(T(x.n!)))).toBeCloseTo(x.n!, 6);
  });

  it("reports when the curves do not cross in the range", () => {
    // Quantum exponent not smaller and quantum slower at n = 1: never crosses (closed form gives a negative n*).
    const slower = findCrossover({
      classical: { slope: 0.5, intercept: -30 },
      quantum: { slope: 0.5, intercept: 0 },
      secondsPerQuery: () => 1e-4,
    });
    expect(slower.status).toBe("none in range");
    expect(slower.n).toBeNull();
    // Quantum faster from the range start: 2^(n − 1) s classical against 2^(0.5 n) × 1e−9 s.
    const faster = findCrossover({
      classical: { slope: 1, intercept: -1 },
      quantum: { slope: 0.5, intercept: 0 },
      secondsPerQuery: () => 1e-9,
    });
    expect(faster.status).toBe("quantum faster throughout");
    // Crossing beyond a narrower range: n* = 42 from the first case lies outside [1, 40].
    const narrow = findCrossover({
      classical: { slope: 0.8, intercept: -20 },
      quantum: { slope: 0.5, intercept: 3 },
      parallelism: 4,
      secondsPerQuery: () => 2 ** -12.4,
      range: [1, 40],
    });
    expect(narrow.status).toBe("none in range");
  });
});
