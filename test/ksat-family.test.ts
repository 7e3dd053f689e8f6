// The ksat generator: determinism, clause shape, the planted/satisfiable/unique filters, and the mean model
// count against the first-moment formula.
import { describe, expect, it } from "vitest";
import { ksatFamily, THRESHOLD_DENSITY } from "../harness/families/ksat.js";
import { writeDimacs } from "../harness/formats/dimacs.js";
import { clausesOf, violatedBy, type Cnf } from "../harness/model/cnf.js";

const params = (extra: Record<string, number | boolean> = {}) => ({ k: 3, density: 4.26, planted: false, satisfiable: false, unique: false, ...extra });

function cnfOf(n: number, index: number, p = params(), seed = "7"): { cnf: Cnf; meta: Record<string, unknown> } {
  const inst = ksatFamily.generate(seed, p, n, index);
  if (inst.problem.kind !== "cnf") throw new Error("ksat must give CNF");
  return { cnf: inst.problem.cnf, meta: inst.meta };
}

function modelCount(cnf: Cnf): number {
  let count = 0;
  for (let z = 0; z < 2 ** cnf.variables; z++) if (violatedBy(cnf, z) === 0) count++;
  return count;
}

describe("ksat family", () => {
  it("is a pure function of (seed, parameters, n, index): identical DIMACS bytes on every call", () => {
    const a = writeDimacs(cnfOf(20, 3).cnf);
    const b = writeDimacs(cnfOf(20, 3).cnf);
    expect(a).toBe(b);
    expect(writeDimacs(cnfOf(20, 4).cnf)).not.toBe(a);
    expect(writeDimacs(cnfOf(20, 3, params(), "8").cnf)).not.toBe(a);
    expect(writeDimacs(cnfOf(20, 3, params({ density: 4.3 })).cnf)).not.toBe(a);
  });

  it("draws m = round(α·n) clauses of k distinct variables", () => {
    const { cnf, meta } = cnfOf(25, 0);
    expect(cnf.offsets.length - 1).toBe(Math.round(4.26 * 25));
    expect(meta.clauses).toBe(Math.round(4.26 * 25));
    for (const c of clausesOf(cnf)) {
      expect(c).toHaveLength(3);
      expect(new Set(c.map(Math.abs)).size).toBe(3);
      for (const lit of c) expect(Math.abs(lit)).toBeGreaterThanOrEqual(1);
      for (const lit of c) expect(Math.abs(lit)).toBeLessThanOrEqual(25);
    }
  });

  it("uses the cavity-method threshold 4.267 as the 3-SAT default (Mertens, Mézard, Zecchina 2006)", () => {
    expect(THRESHOLD_DENSITY[3]).toBe(4.267);
  });

  it("planted instances are always satisfiable and count their rejected clauses", () => {
    let rejected = 0;
    for (let i = 0; i < 20; i++) {
      const { cnf, meta } = cnfOf(12, i, params({ planted: true, density: 6 }));
      expect(modelCount(cnf)).toBeGreaterThan(0);
      rejected += meta.rejected_clauses as number;
    }
    // Each clause is violated by the hidden assignment with probability 1/8, so about 72·20/7 ≈ 206 redraws.
    expect(rejected).toBeGreaterThan(100);
  });

  it("--satisfiable keeps only satisfiable draws and --unique only single-model draws, counting rejections", () => {
    let rejections = 0;
    for (let i = 0; i < 10; i++) {
      const sat = cnfOf(10, i, params({ satisfiable: true, density: 5 }));
      expect(modelCount(sat.cnf)).toBeGreaterThan(0);
      const uniq = cnfOf(10, i, params({ satisfiable: true, unique: true, density: 5 }));
      expect(modelCount(uniq.cnf)).toBe(1);
      rejections += uniq.meta.rejected_draws as number;
    }
    expect(rejections).toBeGreaterThan(0);
  });

  it("mean model count matches the first moment 2^n (1 − 2^−k)^m", () => {
    // First-moment formula: each of the 2^n assignments satisfies each independent clause with probability
    // 1 − 2^−k (e.g. Achlioptas & Peres, "The threshold for random k-SAT is 2^k log 2 − O(k)", JAMS 2004).
    // n = 10, α = 3 → m = 30: expectation 1024·(7/8)^30 ≈ 18.6. Tolerance: 4 empirical standard errors
    // (common practice; a correct generator fails this about once in 16 000 seeds).
    const n = 10;
    const draws = 1500;
    const counts: number[] = [];
    for (let i = 0; i < draws; i++) counts.push(modelCount(cnfOf(n, i, params({ density: 3 }), "first-moment").cnf));
    const mean = counts.reduce((a, b) => a + b, 0) / draws;
    const variance = counts.reduce((a, b) => a + (b - mean) ** 2, 0) / (draws - 1);
    const expected = 2 ** n * (7 / 8) ** 30;
    expect(Math.abs(mean - expected)).toBeLessThan(4 * Math.sqrt(variance / draws));
  });
});
