/**
 * The spectral predictor (harness/predict/spectral.ts) and its cost vector (harness/model/cost-vector.ts) against
 * closed forms: the driver alone (b = 0), one spin (a 2 × 2 matrix), the large-b limit (first-order perturbation in
 * the driver) and the small-b limit (second-order Rayleigh–Schrödinger perturbation in the cost). The dense
 * cross-check lives in spectral-dense.test.ts.
 */
import { describe, expect, it } from "vitest";
import { cnfFromClauses, violatedBy } from "../harness/model/cnf.js";
import { COST_VECTOR_MAX, fillCostVector, walshHadamardInPlace } from "../harness/model/cost-vector.js";
import { isingEnergyOf, isingFromTerms } from "../harness/model/ising.js";
import type { Problem } from "../harness/model/problem.js";
import {
  DEFAULT_SPECTRAL_OPTIONS,
  type SpectralOptions,
  spectralPhaseFactor,
  spectralPredict,
  spectralScan,
} from "../harness/predict/spectral.js";
import { Rng, deriveSeed } from "../harness/random.js";
import { random3Sat, sk } from "./helpers/instances.js";

const TIGHT: SpectralOptions = { b: 0.7, eta: 0.5, tolerance: 1e-11, gapThreshold: 1e-6, seed: "spectral-test" };

/** Random fields and couplings: no flip symmetry, a unique optimum with probability 1. */
function fieldModel(n: number, seed: string): Problem {
  const rng = new Rng(deriveSeed("spectral-test", "field", seed));
  const terms: { spins: number[]; J: number }[] = [];
  for (let i = 0; i < n; i++) terms.push({ spins: [i], J: rng.normal() });
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) terms.push({ spins: [i, j], J: rng.normal() / Math.sqrt(n) });
  return { kind: "ising", ising: isingFromTerms(n, terms) };
}

function costsOf(problem: Problem): { costs: Float64Array; optimum: number } {
  const n = problem.kind === "cnf" ? problem.cnf.variables : problem.ising.spins;
  const costs = new Float64Array(2 ** n);
  fillCostVector(problem, costs);
  let optimum = Infinity;
  for (const c of costs) optimum = Math.min(optimum, c);
  return { costs, optimum };
}

/** g_η(x(z)) computed here from the definition in DESIGN.md §4. */
function filtered(costs: Float64Array, optimum: number, eta: number): Float64Array {
  let sum = 0;
  for (const c of costs) sum += c;
  const mean = sum / costs.length;
  const g = new Float64Array(costs.length);
  for (let z = 0; z < costs.length; z++) {
    const x = (costs[z] - mean) / Math.abs(optimum - mean);
    g[z] = Math.min(0, (x + eta) / (1 - eta));
  }
  return g;
}

describe("cost vector", () => {
  it("CNF: exact violated-clause counts, including repeated literals, tautologies and long clauses", () => {
    const p = random3Sat(11, "cv");
    if (p.kind !== "cnf") throw new Error("cnf expected");
    const extra = [[1, 1, -2], [3, -3, 4], [1, 2, 3, 4, 5, 6, 7, -8], [-9, -10, -11, 1, 2, 3, 4]];
    const clauses = [...Array.from({ length: p.cnf.offsets.length - 1 }, (_, c) =>
      Array.from(p.cnf.literals.subarray(p.cnf.offsets[c], p.cnf.offsets[c + 1])),
    ), ...extra];
    const cnf = cnfFromClauses(11, clauses);
    const costs = new Float64Array(2 ** 11);
    fillCostVector({ kind: "cnf", cnf }, costs);
    for (let z = 0; z < costs.length; z++) expect(costs[z]).toBe(violatedBy(cnf, z)); // reference: definition
  });

  it("Ising: energies within 1e-12 of Σ|J| (fields, couplings, 3-spin terms, a repeated spin, a constant)", () => {
    const rng = new Rng(deriveSeed("spectral-test", "cv-ising"));
    const n = 10;
    const terms: { spins: number[]; J: number }[] = [];
    for (let i = 0; i < n; i++) terms.push({ spins: [i], J: rng.normal() });
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) terms.push({ spins: [i, j], J: rng.normal() });
    for (let t = 0; t < 30; t++) terms.push({ spins: [rng.below(3), 3 + rng.below(3), 6 + rng.below(4)], J: rng.normal() });
    terms.push({ spins: [2, 2, 5], J: 0.75 }); // s_2² = 1: acts as a field on spin 5
    const model = isingFromTerms(n, terms, 3.25);
    let scale = 3.25;
    for (const t of terms) scale += Math.abs(t.J);
    const costs = new Float64Array(2 ** n);
    fillCostVector({ kind: "ising", ising: model }, costs);
    for (let z = 0; z < costs.length; z++) {
      expect(Math.abs(costs[z] - isingEnergyOf(model, z))).toBeLessThanOrEqual(1e-12 * scale); // reference: definition
    }
  });

  it("refuses n above COST_VECTOR_MAX, naming n and the limit", () => {
    const big: Problem = { kind: "cnf", cnf: cnfFromClauses(COST_VECTOR_MAX + 1, [[1]]) };
    expect(() => fillCostVector(big, new Float64Array(1))).toThrow(`n = ${COST_VECTOR_MAX + 1} exceeds the limit n ≤ ${COST_VECTOR_MAX}`);
  });

  it("the Walsh–Hadamard transform is its own inverse up to 2^n (H·H = N·I, closed form)", () => {
    const rng = new Rng(deriveSeed("spectral-test", "wht"));
    for (const n of [0, 1, 5, 13, 15]) {
      const a = new Float64Array(2 ** n).map(() => rng.nextDouble() - 0.5);
      const b = a.slice();
      walshHadamardInPlace(b, n);
      walshHadamardInPlace(b, n);
      for (let i = 0; i < a.length; i++) expect(b[i] / 2 ** n).toBeCloseTo(a[i], 12);
    }
  });
});

describe("b = 0: the driver alone, −(1/n)Σ X_i (eigenvalues −1 + 2|w|/n over Hadamard weights |w|, closed form)", () => {
  it("3-SAT (full space): e0 = −1, ψ = |+⟩, gap = 2/n, overlap_opt = M/2^n", () => {
    const n = 10;
    const p = random3Sat(n, "b0");
    const { costs, optimum } = costsOf(p);
    const r = spectralPredict(p, costs, optimum, { ...TIGHT, b: 0 });
    expect(r.sector).toBe("all");
    expect(r.e0).toBeCloseTo(-1, 12); // closed form: |w| = 0
    expect(r.gap).toBeCloseTo(2 / n, 10); // closed form: |w| = 1
    expect(r.overlap_start).toBeCloseTo(1, 12); // ψ = |+⟩
    expect(r.overlap_opt).toBeCloseTo(r.optima / 2 ** n, 12); // |⟨z|+⟩|² = 2^−n for each optimum
    expect(r.residual).toBeLessThanOrEqual(1e-11);
  });

  it("SK (symmetric sector): the first symmetric excitation has |w| = 2, so gap = 4/n", () => {
    const n = 10;
    const p = sk(n, "b0");
    const { costs, optimum } = costsOf(p);
    const r = spectralPredict(p, costs, optimum, { ...TIGHT, b: 0 });
    expect(r.sector).toBe("symmetric");
    expect(r.e0).toBeCloseTo(-1, 12); // closed form
    expect(r.gap).toBeCloseTo(4 / n, 10); // closed form: Π X_i = (−1)^|w| on |w⟩
    expect(r.overlap_start).toBeCloseTo(1, 12);
    const all = spectralPredict(p, costs, optimum, { ...TIGHT, b: 0, sector: "all" });
    expect(all.gap).toBeCloseTo(2 / n, 10); // closed form, full space
  });
});

describe("one spin: H = −X + b·diag(g(0), g(1)), closed-form 2 × 2 spectrum", () => {
  // Clause (x1): C(0) = 1, C(1) = 0, C̄ = 1/2, so x = (1, −1) and g = (0, −1) for any η.
  // [[0, −1], [−1, −b]]: E = −b/2 ∓ √(1 + b²/4); ground vector ∝ (1, −E0).
  for (const b of [0.3, 1, 4]) {
    it(`b = ${b}`, () => {
      const p: Problem = { kind: "cnf", cnf: cnfFromClauses(1, [[1]]) };
      const { costs, optimum } = costsOf(p);
      const r = spectralPredict(p, costs, optimum, { ...TIGHT, b, eta: 0.3 });
      const root = Math.sqrt(1 + (b * b) / 4);
      const e0 = -b / 2 - root;
      const e1 = -b / 2 + root;
      const a1 = -e0; // amplitude on z = 1 (the optimum) relative to z = 0
      expect(r.e0).toBeCloseTo(e0, 12);
      expect(r.e1).toBeCloseTo(e1, 12);
      expect(r.gap).toBeCloseTo(2 * root, 12);
      expect(r.overlap_opt).toBeCloseTo((a1 * a1) / (1 + a1 * a1), 12);
      expect(r.overlap_start).toBeCloseTo((1 + a1) ** 2 / (2 * (1 + a1 * a1)), 12);
    });
  }

  it("an Ising field −h·s with h > 0 puts the optimum at z = 0 (mirror image of the clause case)", () => {
    const p: Problem = { kind: "ising", ising: isingFromTerms(1, [{ spins: [0], J: 0.8 }]) };
    const { costs, optimum } = costsOf(p);
    const b = 1.3;
    const r = spectralPredict(p, costs, optimum, { ...TIGHT, b });
    const root = Math.sqrt(1 + (b * b) / 4);
    const a0 = b / 2 + root; // amplitude on z = 0 relative to z = 1
    expect(r.sector).toBe("all");
    expect(r.e0).toBeCloseTo(-b / 2 - root, 12);
    expect(r.overlap_opt).toBeCloseTo((a0 * a0) / (1 + a0 * a0), 12);
  });
});

describe("large b: first-order perturbation in the driver", () => {
  it("b²(1 − overlap_opt) → Σ_i 1/(n(1 + g_i))² over the optimum's neighbours, with an O(1/b²) error", () => {
    // H = b·diag(g) + V, V = −(1/n)ΣX_i: the unique optimum z* has energy −b; first order gives amplitude
    // (1/n)/(b(1 + g_i)) on z* ⊕ e_i (Rayleigh–Schrödinger, first order). The hypercube is bipartite, so the
    // second-order corrections to those amplitudes vanish (⟨z*|V|z*⟩ = 0 and no two-step path joins neighbours of
    // z* to z*) and 1 − P_opt = Σ_i a_i² + O(b^−4): the relative error of the limit falls as b^−2.
    const n = 8;
    const p = fieldModel(n, "large-b");
    const { costs, optimum } = costsOf(p);
    const eta = 0.5;
    const g = filtered(costs, optimum, eta);
    const star = costs.indexOf(optimum);
    let limit = 0;
    for (let i = 0; i < n; i++) limit += 1 / (n * (1 + g[star ^ (1 << i)])) ** 2;
    const errors: number[] = [];
    let previous = 0;
    for (const b of [50, 200, 800]) {
      const r = spectralPredict(p, costs, optimum, { ...TIGHT, b, eta, tolerance: 1e-9 });
      expect(r.optima).toBe(1);
      expect(r.overlap_opt).toBeGreaterThan(previous);
      previous = r.overlap_opt;
      errors.push(Math.abs(b * b * (1 - r.overlap_opt) - limit) / limit);
    }
    expect(errors[2]).toBeLessThan(0.01);
    expect(errors[0] / errors[1]).toBeGreaterThan(12); // O(b^−2): ×4 in b gives ≈ ×16 smaller error
    expect(errors[0] / errors[1]).toBeLessThan(20);
    expect(errors[1] / errors[2]).toBeGreaterThan(12);
    expect(errors[1] / errors[2]).toBeLessThan(20);
    expect(1 - previous).toBeLessThan(1e-4); // overlap_opt → 1
  });
});

describe("small b: second-order Rayleigh–Schrödinger perturbation theory in b·g", () => {
  // e0(b) = −1 + b⟨g⟩ − b² Σ_{w≠0} ĝ(w)²·n/(2|w|) + O(b³), with ĝ(w) = 2^−n Σ_z (−1)^{w·z} g(z) = ⟨w|g|+⟩ (the
  // driver's excited states are the Hadamard states |w⟩ with energy −1 + 2|w|/n), computed here by a direct
  // O(N·n) Walsh–Hadamard transform.
  function secondOrder(g: Float64Array, n: number): { first: number; second: number } {
    const a = Float64Array.from(g);
    for (let bit = 1; bit < a.length; bit <<= 1) {
      for (let z = 0; z < a.length; z++) {
        if ((z & bit) === 0) {
          const x = a[z];
          const y = a[z | bit];
          a[z] = x + y;
          a[z | bit] = x - y;
        }
      }
    }
    let second = 0;
    for (let w = 1; w < a.length; w++) {
      let weight = 0;
      for (let v = w; v !== 0; v &= v - 1) weight++;
      const gw = a[w] / a.length;
      second += (gw * gw * n) / (2 * weight);
    }
    return { first: a[0] / a.length, second };
  }

  for (const [name, p] of [
    ["3-SAT n = 9", random3Sat(9, "small-b")],
    ["SK n = 10 (symmetric sector)", sk(10, "small-b")],
  ] as const) {
    it(`${name}: the error of the second-order formula shrinks as b³`, () => {
      const n = p.kind === "cnf" ? p.cnf.variables : p.ising.spins;
      const { costs, optimum } = costsOf(p);
      const eta = 0.5;
      const { first, second } = secondOrder(filtered(costs, optimum, eta), n);
      const err: number[] = [];
      for (const b of [0.04, 0.02, 0.01]) {
        const r = spectralPredict(p, costs, optimum, { ...TIGHT, b, eta });
        err.push(Math.abs(r.e0 - (-1 + b * first - b * b * second)));
      }
      // Third order: halving b divides the error by ≈ 8.
      expect(err[0] / err[1]).toBeGreaterThan(6.5);
      expect(err[0] / err[1]).toBeLessThan(9.5);
      expect(err[1] / err[2]).toBeGreaterThan(6.5);
      expect(err[1] / err[2]).toBeLessThan(9.5);
    });
  }
});

describe("cost columns and the b scan", () => {
  it("rounds, phase_factor and queries follow their stated formulas", () => {
    const p = random3Sat(10, "columns");
    const { costs, optimum } = costsOf(p);
    const r = spectralPredict(p, costs, optimum, { ...DEFAULT_SPECTRAL_OPTIONS });
    expect(r.b).toBe(0.7);
    expect(r.eta).toBe(0.5);
    // Definitions in spectral.ts (our model, stated there): rounds = 1/(|⟨+|ψ⟩|·√P_opt), phase = ⌈π n/gap⌉.
    expect(r.rounds).toBeCloseTo(1 / Math.sqrt(r.overlap_start * r.overlap_opt), 10);
    expect(r.phase_factor).toBe(Math.ceil((Math.PI * 10) / r.gap));
    expect(r.phase_factor).toBe(spectralPhaseFactor(10, r.gap));
    expect(r.queries).toBeCloseTo((r.rounds as number) * (r.phase_factor as number), 6);
    expect(r.queries_log2).toBeCloseTo(Math.log2(r.queries as number), 12);
    expect(r.gap_ok).toBe(true);
    expect(r.residual).toBeLessThanOrEqual(1e-9);
    expect(r.iterations).toBeGreaterThan(0);
  });

  it("one row per b; best = fewest queries among rows with gap_ok; −1 when no gap passes", () => {
    const p = sk(10, "scan");
    const { costs, optimum } = costsOf(p);
    const bs = [0.2, 0.6, 1.0, 1.6, 3.0];
    const scan = spectralScan(p, costs, optimum, bs, { ...TIGHT, tolerance: 1e-9 });
    expect(scan.rows.map((r) => r.b)).toEqual(bs);
    let best = -1;
    scan.rows.forEach((r, i) => {
      if (r.gap_ok && (best < 0 || (r.queries as number) < (scan.rows[best].queries as number))) best = i;
    });
    expect(scan.best).toBe(best);
    expect(scan.best).toBeGreaterThanOrEqual(0);
    // A scan row equals the lone prediction at the same b (the workspace only changes where vectors live).
    const lone = spectralPredict(p, costs, optimum, { ...TIGHT, tolerance: 1e-9, b: 1.0 });
    expect(scan.rows[2].e0).toBeCloseTo(lone.e0, 12);
    expect(scan.rows[2].overlap_opt).toBeCloseTo(lone.overlap_opt, 9);
    const none = spectralScan(p, costs, optimum, bs, { ...TIGHT, tolerance: 1e-9, gapThreshold: 10 });
    expect(none.rows.every((r) => !r.gap_ok)).toBe(true);
    expect(none.best).toBe(-1);
  });

  it("rejects a constant cost, η outside [0, 1), b < 0, and an optimum that is not the minimum", () => {
    const constant: Problem = { kind: "ising", ising: isingFromTerms(3, [], 2) };
    const { costs, optimum } = costsOf(constant);
    expect(() => spectralPredict(constant, costs, optimum, TIGHT)).toThrow(/constant/);
    const p = random3Sat(6, "errors");
    const c = costsOf(p);
    expect(() => spectralPredict(p, c.costs, c.optimum, { ...TIGHT, eta: 1 })).toThrow(/eta/);
    expect(() => spectralPredict(p, c.costs, c.optimum, { ...TIGHT, b: -0.1 })).toThrow(/b = -0.1/);
    expect(() => spectralPredict(p, c.costs, c.optimum + 1, TIGHT)).toThrow(/not the minimum/);
  });
});
