/**
 * The adiabatic predictor (harness/predict/adiabatic.ts): minimum gap of H(s) = (1 − s)·Σ(1 − X_i)/2 + s·C(z)
 * (Farhi et al., Science 292, 472 (2001)) against
 * - one spin: a 2 × 2 matrix with gap(s) = √(s² + (1 − s)²), minimum 1/√2 at s = 1/2 (closed form, by hand);
 * - the flat-cost "needle" (C = 0 at one marked string, 1 elsewhere; the Grover-like problem of Roland & Cerf,
 *   arXiv:quant-ph/0107015, and Farhi et al., arXiv:quant-ph/0001106 §4.2) and random instances with a unique optimum,
 *   all at n ≤ 7 (kept small: dense solves dominate the test time), against ml-matrix's dense EigenvalueDecomposition of the explicit 2^n × 2^n matrix, built here from
 *   the reference cost evaluation costOf (independent of the cost vector, the sector code and Lanczos), minimised on
 *   a fine grid then by golden-section search: the gap minimum to 1e-6;
 * - the symmetric sector against the full space: the dense reference keeps the full space and lifts the odd-parity
 *   states by a penalty M·(1 − Π X_i)/2, so its two lowest levels are the two lowest symmetric ones.
 */
import { EigenvalueDecomposition, Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { cnfFromClauses } from "../harness/model/cnf.js";
import { ksatFamily } from "../harness/families/ksat.js";
import { isingFromTerms } from "../harness/model/ising.js";
import { type Problem, costOf, sizeOf } from "../harness/model/problem.js";
import { DEFAULT_ADIABATIC_OPTIONS, adiabaticGap, type AdiabaticResult } from "../harness/predict/adiabatic.js";
import { buildSectorCost } from "../harness/predict/numerics/sector-cost.js";
import { Rng, deriveSeed } from "../harness/random.js";
import { random3Sat, sk } from "./helpers/instances.js";

function run(problem: Problem): AdiabaticResult {
  const cost = buildSectorCost(problem);
  return adiabaticGap(problem, cost, cost.min, DEFAULT_ADIABATIC_OPTIONS);
}

const costCache = new WeakMap<Problem, number[]>();

/** Dense H(s) with C − C*, optionally with the odd-parity penalty; returns the two lowest eigenvalues. */
function denseLevels(problem: Problem, s: number, symmetric: boolean): [number, number] {
  const n = sizeOf(problem);
  const dim = 2 ** n;
  let costs = costCache.get(problem);
  if (costs === undefined) {
    costs = Array.from({ length: dim }, (_, z) => costOf(problem, z));
    costCache.set(problem, costs);
  }
  const opt = Math.min(...costs);
  const h = Matrix.zeros(dim, dim);
  for (let z = 0; z < dim; z++) {
    h.set(z, z, ((1 - s) * n) / 2 + s * (costs[z] - opt));
    for (let i = 0; i < n; i++) h.set(z, z ^ (1 << i), h.get(z, z ^ (1 << i)) - (1 - s) / 2);
  }
  if (symmetric) {
    const penalty = 100; // far above every level of H(s) at these sizes
    for (let z = 0; z < dim; z++) {
      h.set(z, z, h.get(z, z) + penalty / 2);
      h.set(z, dim - 1 - z, h.get(z, dim - 1 - z) - penalty / 2);
    }
  }
  const ev = new EigenvalueDecomposition(h, { assumeSymmetric: true }).realEigenvalues.slice().sort((a, b) => a - b);
  return [ev[0], ev[1]];
}

/** Dense minimum gap: a grid of `points` on [0, 1], then golden-section search to width 1e-10. */
function denseMinimum(problem: Problem, symmetric: boolean, points: number): { s: number; gap: number; e0: number } {
  const gap = (s: number): number => {
    const [a, b] = denseLevels(problem, s, symmetric);
    return b - a;
  };
  let best = 0;
  let bestGap = Infinity;
  for (let i = 0; i < points; i++) {
    const g = gap(i / (points - 1));
    if (g < bestGap) {
      bestGap = g;
      best = i;
    }
  }
  let a = Math.max(0, best - 1) / (points - 1);
  let b = Math.min(points - 1, best + 1) / (points - 1);
  const r = (Math.sqrt(5) - 1) / 2;
  let c = b - r * (b - a);
  let d = a + r * (b - a);
  let fc = gap(c);
  let fd = gap(d);
  while (b - a > 1e-10) {
    if (fc < fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - r * (b - a);
      fc = gap(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + r * (b - a);
      fd = gap(d);
    }
  }
  const s = 0.5 * (a + b);
  return { s, gap: gap(s), e0: denseLevels(problem, s, symmetric)[0] };
}

/** C = 0 at `marked`, 1 elsewhere, as an Ising polynomial: 1 − Π_i (1 + σ_i s_i)/2 (σ_i = +1 for bit 0). */
function needle(n: number, marked: number): Problem {
  const terms: { spins: number[]; J: number }[] = [];
  for (let subset = 1; subset < 1 << n; subset++) {
    const spins: number[] = [];
    let sign = 1;
    for (let i = 0; i < n; i++) {
      if ((subset >>> i) & 1) {
        spins.push(i);
        if ((marked >>> i) & 1) sign = -sign;
      }
    }
    terms.push({ spins, J: sign * 2 ** -n }); // E = constant − Σ J·Π s
  }
  return { kind: "ising", ising: isingFromTerms(n, terms, 1 - 2 ** -n) };
}

/** Random fields and couplings: no flip symmetry, a unique optimum with probability 1. */
function fieldModel(n: number, seed: string): Problem {
  const rng = new Rng(deriveSeed("adiabatic-test", seed));
  const terms: { spins: number[]; J: number }[] = [];
  for (let i = 0; i < n; i++) terms.push({ spins: [i], J: rng.normal() });
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) terms.push({ spins: [i, j], J: rng.normal() / Math.sqrt(n) });
  return { kind: "ising", ising: isingFromTerms(n, terms) };
}

describe("adiabatic minimum gap", () => {
  it("one spin: gap √(s² + (1 − s)²), minimum 1/√2 at s = 1/2, E0 = 1/2 − 1/(2√2)", () => {
    const r = run({ kind: "cnf", cnf: cnfFromClauses(1, [[-1]]) });
    expect(r.status).toBe("ok");
    expect(r.gap_min as number).toBeCloseTo(Math.SQRT1_2, 12);
    expect(Math.abs((r.s_star as number) - 0.5)).toBeLessThan(1e-6);
    expect(r.e0 as number).toBeCloseTo(0.5 - Math.SQRT1_2 / 2, 12);
    expect(r.runtime_scale as number).toBeCloseTo(2, 10);
    expect(r.edge).toBe(false);
    expect(r.solves).toBeGreaterThan(0);
  });

  const cases: [string, Problem, boolean][] = [
    ["needle n = 7", needle(7, 0b1011001), false],
    ["unique 3-SAT n = 7", ksatFamily.generate("adiabatic-test", { k: 3, density: 4.26, planted: false, satisfiable: true, unique: true }, 7, 0).problem, false],
    ["random-field Ising n = 6", fieldModel(6, "a"), false],
    ["SK n = 7 (symmetric sector vs full space)", sk(7, "adiabatic-test"), true],
  ];
  for (const [label, problem, symmetric] of cases) {
    it(`${label}: s*, gap_min and E0(s*) against dense diagonalisation`, () => {
      const r = run(problem);
      expect(r.status).toBe("ok");
      expect(r.sector).toBe(symmetric ? "symmetric" : "all");
      expect(r.converged).toBe(true);
      const ref = denseMinimum(problem, symmetric, 51);
      expect(Math.abs((r.gap_min as number) - ref.gap)).toBeLessThan(1e-6);
      expect(Math.abs((r.s_star as number) - ref.s)).toBeLessThan(1e-3);
      const [e0] = denseLevels(problem, r.s_star as number, symmetric);
      expect(Math.abs((r.e0 as number) - e0)).toBeLessThan(1e-9);
    });
  }

  it("the needle's gap falls like 2^(−n/2) (Grover-like): gap·2^(n/2) stays within a factor 2 from n = 6 to 10", () => {
    // Roland & Cerf, arXiv:quant-ph/0107015: g_min ≈ 2/√N for the flat-cost problem (common practice to check the trend).
    const scaled = [6, 8, 10].map((n) => (run(needle(n, 1)).gap_min as number) * 2 ** (n / 2));
    expect(Math.max(...scaled) / Math.min(...scaled)).toBeLessThan(2);
  });

  it("skips an instance whose optimum is not unique, saying why", () => {
    const r = run(random3Sat(10, "adiabatic-many", 1.5));
    expect(r.status).toBe("skipped");
    expect(r.optima).toBeGreaterThan(1);
    expect(r.reason).toMatch(/configurations reach the optimum; the minimum gap needs a unique optimum/);
    expect(r.gap_min).toBeNull();
    expect(r.solves).toBe(0);
  });
});
