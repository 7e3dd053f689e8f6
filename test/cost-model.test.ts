import { describe, expect, it } from "vitest";
import {
  annealStepToffolis,
  breakEvenSeconds,
  classicalSeconds,
  COST_MODEL_DEFAULTS,
  describeCostModel,
  diffusionToffolis,
  quantumSeconds,
  toffolisPerQuery,
  walkStepToffolis,
} from "../harness/predict/cost-model.js";

const PAPER = "Babbush et al., PRX Quantum 2, 010103 (2021), arXiv:2011.04149";

describe("cost model defaults and break-even", () => {
  it("defaults to one Toffoli every 170 µs, one factory, S = 1", () => {
    // One Toffoli every ≈ 170 µs with one factory (Babbush et al., arXiv:2011.04149).
    expect(COST_MODEL_DEFAULTS.toffoliSeconds).toBe(170e-6);
    expect(COST_MODEL_DEFAULTS.factories).toBe(1);
    expect(COST_MODEL_DEFAULTS.classicalParallelism).toBe(1);
  });

  it("reproduces the paper's worked result: 100 Toffolis against 33 ns breaks even after about 2.4 hours", () => {
    // t_Q = 100 × 170 µs = 17 ms, t_C = 33 ns, S = 1: T* = S·t_Q²/t_C ≈ 2.4 h (PRX Quantum 2, 010103 (2021)).
    const hours = breakEvenSeconds(100, 33e-9, COST_MODEL_DEFAULTS) / 3600;
    expect(hours).toBeGreaterThan(2.35);
    expect(hours).toBeLessThan(2.45);
    // T* scales linearly with S and with 1/t_C (T* = S·t_Q²/t_C).
    expect(breakEvenSeconds(100, 33e-9, { ...COST_MODEL_DEFAULTS, classicalParallelism: 1000 }) / 3600).toBeCloseTo(hours * 1000, 6);
    // Two factories halve t_Q and quarter T*.
    expect(breakEvenSeconds(100, 33e-9, { ...COST_MODEL_DEFAULTS, factories: 2 }) / 3600).toBeCloseTo(hours / 4, 9);
  });

  it("degree-d break-even equalises N·t_Q and N^d·t_C/S", () => {
    // Definition of the break-even point (Babbush et al., arXiv:2011.04149): at T*, N = T*/t_Q calls.
    const options = { ...COST_MODEL_DEFAULTS, classicalParallelism: 16 };
    const tQ = 100 * 170e-6;
    for (const d of [2, 3, 4]) {
      const T = breakEvenSeconds(100, 33e-9, options, d);
      const N = T / tQ;
      expect((N ** d * 33e-9) / 16 / T).toBeCloseTo(1, 9);
    }
  });

  it("quantum and classical times follow the stated formulas", () => {
    // queries × Toffolis × Toffoli time / factories = 10 × 100 × 170 µs / 2 = 0.085 s (hand-computed).
    expect(quantumSeconds(10, 100, { ...COST_MODEL_DEFAULTS, factories: 2 })).toBeCloseTo(0.085, 15);
    // wall / S = 10 / 4 (hand-computed).
    expect(classicalSeconds(10, { ...COST_MODEL_DEFAULTS, classicalParallelism: 4 })).toBe(2.5);
    expect(() => quantumSeconds(1, 1, { ...COST_MODEL_DEFAULTS, factories: 0 })).toThrow(RangeError);
  });
});

describe("Toffoli counts per query and per step", () => {
  it("k-SAT, n = 100, m = 427, k = 3: 2mk − 3 + 2n − 3 = 2756", () => {
    // Derivation in cost-model.ts (hand-computed): 2·427·3 − 3 = 2559, diffusion 2·100 − 3 = 197.
    const c = toffolisPerQuery("ksat", { n: 100, clauses: 427, k: 3 });
    expect(c.toffolis).toBe(2756);
    expect(c.derivation).toContain("2559");
    expect(diffusionToffolis(100)).toBe(197);
  });

  it("k-SAT comparison oracle for minimum finding", () => {
    // c = ⌈log₂ 428⌉ = 9; 2(854 + 3843) + 17 = 9411; + 197 = 9608 (hand-computed from the stated derivation).
    expect(toffolisPerQuery("ksat", { n: 100, clauses: 427, k: 3, comparison: true }).toffolis).toBe(9608);
  });

  it("Ising, SK n = 100 (T = 4950), b = 8: w = 22, 2w(T+1) − 1 + 197 = 218040", () => {
    // w = ⌈log₂ 4950⌉ + 8 + 1 = 13 + 9 = 22; 2·22·4951 − 1 = 217843 (hand-computed from the stated derivation).
    const c = toffolisPerQuery("ising", { n: 100, terms: 4950, order: 2 });
    expect(c.toffolis).toBe(218040);
    // Fewer coefficient bits, narrower register: b = 0 gives w = 14 (hand-computed).
    expect(toffolisPerQuery("ising", { n: 100, terms: 4950 }, { ...COST_MODEL_DEFAULTS, couplingBits: 0 }).toffolis).toBe(
      2 * 14 * 4951 - 1 + 197,
    );
  });

  it("Schöning step and Metropolis update, derived and overridable", () => {
    // 2(854 + 3843 + 427) + 100 = 2·5124 + 100 = 10348 (hand-computed from the stated derivation).
    expect(walkStepToffolis({ n: 100, clauses: 427, k: 3 }).toffolis).toBe(10348);
    // d = ⌈4950·2/100⌉ = 99, w = 22: 2(99·22 + 22 + 256) = 4912 (hand-computed from the stated derivation).
    expect(annealStepToffolis({ n: 100, terms: 4950, order: 2 }).toffolis).toBe(4912);
    const o = { ...COST_MODEL_DEFAULTS, walkStepToffolis: 77, annealStepToffolis: 88, oracleToffolisOverride: 99 };
    expect(walkStepToffolis({ n: 100, clauses: 427, k: 3 }, o).toffolis).toBe(77);
    expect(annealStepToffolis({ n: 100, terms: 4950 }, o).toffolis).toBe(88);
    expect(toffolisPerQuery("ksat", { n: 100, clauses: 427, k: 3 }, o).toffolis).toBe(99);
    expect(toffolisPerQuery("ising", { n: 100, terms: 4950 }, o).derivation).toContain("given");
    expect(() => toffolisPerQuery("ksat", { n: 100, k: 3 })).toThrow(RangeError);
  });
});

describe("describeCostModel", () => {
  it("lists the assumptions with sources and the 3-SAT n = 100 worked example", () => {
    const rows = describeCostModel();
    for (const r of rows) {
      expect(r.quantity).not.toBe("");
      expect(r.value).not.toBe("");
      expect(r.source).not.toBe("");
    }
    const toffoli = rows.find((r) => r.quantity.startsWith("Toffoli time"));
    expect(toffoli?.value).toBe("170 us");
    expect(toffoli?.source).toContain(PAPER);
    const perQuery = rows.find((r) => r.quantity === "example: Toffolis per query");
    expect(perQuery?.value).toBe("2756"); // m = round(4.267·100) = 427, as above
    // 2756 × 170 µs = 0.46852 s a query (hand-computed).
    expect(rows.find((r) => r.quantity === "example: time per query")?.value).toBe("0.4685 s");
    const changed = describeCostModel({ ...COST_MODEL_DEFAULTS, toffoliSeconds: 10e-6 });
    expect(changed.find((r) => r.quantity.startsWith("Toffoli time"))?.source).toBe("--toffoli-us");
  });
});
