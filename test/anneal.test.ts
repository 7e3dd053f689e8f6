import { describe, expect, it } from "vitest";
import { deriveSeed, Rng } from "../harness/random.js";
import { cnfFromClauses } from "../harness/model/cnf.js";
import { isingFromTerms } from "../harness/model/ising.js";
import { costOf, costTolerance, sizeOf, type Problem } from "../harness/model/problem.js";
import { annealTrials, betaSchedule, defaultBetaRange, type AnnealOptions } from "../solvers/anneal.js";
import { trialRng } from "../solvers/walk.js";

/** Exact optimum by evaluating every configuration (costOf is the reference evaluator of the model). */
function bruteOptimum(problem: Problem): number {
  let best = Infinity;
  for (let z = 0; z < 2 ** sizeOf(problem); z++) best = Math.min(best, costOf(problem, z));
  return best;
}

function ksat(rng: Rng, n: number, m: number): Problem {
  const clauses: number[][] = [];
  for (let c = 0; c < m; c++) {
    const vars: number[] = [];
    while (vars.length < 3) {
      const v = 1 + rng.below(n);
      if (!vars.includes(v)) vars.push(v);
    }
    clauses.push(vars.map((v) => (rng.bit() === 1 ? v : -v)));
  }
  return { kind: "cnf", cnf: cnfFromClauses(n, clauses) };
}

/** SK couplings J ~ N(0, 1/n), optionally with random local fields and a constant (dense engine). */
function sk(rng: Rng, n: number, fields: boolean): Problem {
  const terms: { spins: number[]; J: number }[] = [];
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) terms.push({ spins: [i, j], J: rng.normal() / Math.sqrt(n) });
  if (fields) for (let i = 0; i < n; i++) terms.push({ spins: [i], J: 0.3 * rng.normal() });
  return { kind: "ising", ising: isingFromTerms(n, terms, fields ? 1.25 : 0) };
}

/** A ring with random ±1 couplings and fields: sparse pairs, so the term-list engine runs. */
function ring(rng: Rng, n: number): Problem {
  const terms: { spins: number[]; J: number }[] = [];
  for (let i = 0; i < n; i++) terms.push({ spins: [i, (i + 1) % n], J: rng.bit() === 1 ? 1 : -1 });
  terms.push({ spins: [0], J: 0.5 }, { spins: [], J: 2 }); // a field and an order-0 term (a constant −2)
  return { kind: "ising", ising: isingFromTerms(n, terms) };
}

/** Dense 3-spin model with Gaussian couplings, plus a few pairs: mixed orders through the term lists. */
function pspin(rng: Rng, n: number): Problem {
  const terms: { spins: number[]; J: number }[] = [];
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) for (let k = j + 1; k < n; k++) terms.push({ spins: [i, j, k], J: rng.normal() });
  terms.push({ spins: [1, 4], J: 0.7 }, { spins: [2], J: -0.4 });
  return { kind: "ising", ising: isingFromTerms(n, terms) };
}

function options(problem: Problem, target: number, extra: Partial<AnnealOptions> = {}): AnnealOptions {
  const { betaStart, betaEnd } = defaultBetaRange(problem);
  return {
    trials: 40,
    sweeps: 200,
    betaStart,
    betaEnd,
    schedule: "geometric",
    target,
    tolerance: costTolerance(problem),
    seed: "anneal-test",
    stop: null,
    ...extra,
  };
}

const rng = new Rng(deriveSeed("anneal-test", "instances"));
const cases: Array<[string, Problem]> = [
  ["3-SAT n=10, m=60 (likely unsatisfiable)", ksat(rng, 10, 60)],
  ["3-SAT n=12, m=40", ksat(rng, 12, 40)],
  ["SK n=10 (dense engine)", sk(rng, 10, false)],
  ["SK n=11 with fields and a constant (dense engine)", sk(rng, 11, true)],
  ["±1 ring n=12 with a field and an order-0 term (term engine)", ring(rng, 12)],
  ["3-spin n=8 with extra pair and field (term engine)", pspin(rng, 8)],
];

describe("annealTrials", () => {
  it.each(cases)("%s: reaches the brute-force optimum and never reports a cost below it", (_name, problem) => {
    // Source of truth: exhaustive evaluation with the model's reference evaluator.
    const optimum = bruteOptimum(problem);
    const tol = costTolerance(problem);
    for (const schedule of ["linear", "geometric"] as const) {
      const r = annealTrials(problem, options(problem, optimum, { schedule }));
      expect(r.trials).toBe(40);
      expect(r.work).toBe(40 * 200 * sizeOf(problem));
      expect(r.successes).toBeGreaterThan(0);
      expect(r.best).toBeGreaterThanOrEqual(optimum - tol);
      expect(r.best).toBeLessThanOrEqual(optimum + tol);
    }
  });

  it.each(cases)("%s: a target below the optimum is never reached", (_name, problem) => {
    const optimum = bruteOptimum(problem);
    const below = optimum - (problem.kind === "cnf" ? 1 : 1e-6);
    const r = annealTrials(problem, options(problem, below, { trials: 20, sweeps: 100 }));
    expect(r.successes).toBe(0);
    expect(r.best).toBeGreaterThanOrEqual(optimum - costTolerance(problem));
  });

  it.each(cases)("%s: with no sweeps, best is the energy of the random start (bit i of the first draw)", (_name, problem) => {
    // Pins the start-state convention and the from-scratch energy against the reference evaluator:
    // trial t starts from the low n bits of trialRng(seed, t).nextU32() (n ≤ 32 here).
    const n = sizeOf(problem);
    for (let t = 0; t < 8; t++) {
      const r = annealTrials(problem, options(problem, -1e9, { trials: 1, sweeps: 0, firstTrial: t, seed: "start" }));
      const z = n === 32 ? trialRng("start", t).nextU32() : trialRng("start", t).nextU32() % 2 ** n;
      expect(r.best).toBeCloseTo(costOf(problem, z), 9);
      expect(r.work).toBe(0);
    }
  });

  it("is deterministic and splits over trial ranges: [0,T) = [0,a) + [a,T)", () => {
    const problem = sk(new Rng(deriveSeed("anneal-test", "split")), 12, false);
    const optimum = bruteOptimum(problem);
    const base = options(problem, optimum, { trials: 60, sweeps: 20, schedule: "linear" });
    const whole = annealTrials(problem, base);
    expect(annealTrials(problem, base)).toEqual(whole);
    const a = annealTrials(problem, { ...base, trials: 23 });
    const b = annealTrials(problem, { ...base, trials: 37, firstTrial: 23 });
    expect(a.trials + b.trials).toBe(whole.trials);
    expect(a.successes + b.successes).toBe(whole.successes);
    expect(a.work + b.work).toBe(whole.work);
    expect(Math.min(a.best, b.best)).toBe(whole.best);
    // 20 short sweeps leave room for failures, so the split is tested on a mixed outcome.
    expect(whole.successes).toBeGreaterThan(0);
    expect(whole.successes).toBeLessThan(60);
  });

  it("returns at once, censored, when the stop flag is already raised", () => {
    const stop = new Int32Array(new SharedArrayBuffer(4));
    Atomics.store(stop, 0, 1);
    const problem = cases[0][1];
    expect(annealTrials(problem, options(problem, 0, { stop }))).toEqual({ trials: 0, successes: 0, work: 0, best: Infinity, censored: true });
  });

  it("rejects bad options", () => {
    const problem = cases[2][1];
    expect(() => annealTrials(problem, options(problem, 0, { trials: -1 }))).toThrow(RangeError);
    expect(() => annealTrials(problem, options(problem, 0, { tolerance: -1 }))).toThrow(RangeError);
    expect(() => annealTrials(problem, options(problem, Number.NaN))).toThrow(RangeError);
    expect(() => annealTrials(problem, options(problem, 0, { betaStart: 0, schedule: "geometric" }))).toThrow(RangeError);
    expect(() => annealTrials(problem, options(problem, 0, { betaEnd: Infinity }))).toThrow(RangeError);
  });
});

describe("betaSchedule", () => {
  it("runs from betaStart to betaEnd, linearly or with a constant ratio (the schedules' definitions)", () => {
    const lin = betaSchedule(0.5, 4.5, 5, "linear");
    expect(Array.from(lin)).toEqual([0.5, 1.5, 2.5, 3.5, 4.5]);
    const geo = betaSchedule(0.25, 4, 3, "geometric");
    expect(geo[0]).toBeCloseTo(0.25, 15);
    expect(geo[1]).toBeCloseTo(1, 15); // geometric mean of 0.25 and 4
    expect(geo[2]).toBeCloseTo(4, 15);
    expect(Array.from(betaSchedule(0.7, 3, 1, "linear"))).toEqual([0.7]);
  });
});

describe("defaultBetaRange", () => {
  it.each(cases)("%s: finite, positive, betaEnd > betaStart, with its rule stated", (_name, problem) => {
    const r = defaultBetaRange(problem);
    expect(Number.isFinite(r.betaStart) && r.betaStart > 0).toBe(true);
    expect(Number.isFinite(r.betaEnd)).toBe(true);
    expect(r.betaEnd).toBeGreaterThan(r.betaStart);
    expect(r.rule).toMatch(/ln2.*ln1000/);
    expect(defaultBetaRange(problem)).toEqual(r); // deterministic
  });

  it("gives betaEnd = ln 1000 for CNF, whose smallest uphill step at a local minimum is one clause (the rule)", () => {
    expect(defaultBetaRange(cases[1][1]).betaEnd).toBeCloseTo(Math.log(1000), 12);
  });

  it("scales inversely with the energy scale: couplings × 4 give β / 4 exactly (ΔE scale exactly by a power of 2)", () => {
    const base = sk(new Rng(deriveSeed("anneal-test", "scale")), 14, true);
    if (base.kind !== "ising") throw new Error("unreachable");
    const scaled: Problem = {
      kind: "ising",
      ising: { ...base.ising, coefficients: base.ising.coefficients.map((j) => 4 * j), constant: 4 * base.ising.constant },
    };
    const a = defaultBetaRange(base);
    const b = defaultBetaRange(scaled);
    expect(b.betaStart).toBe(a.betaStart / 4);
    expect(b.betaEnd).toBe(a.betaEnd / 4);
  });

  it("falls back to scale 1 when nothing can change the cost (no couplings)", () => {
    const flat: Problem = { kind: "ising", ising: isingFromTerms(5, [{ spins: [0, 1], J: 0 }]) };
    const r = defaultBetaRange(flat);
    expect(r.betaStart).toBeCloseTo(Math.LN2, 15);
    expect(r.betaEnd).toBeCloseTo(Math.log(1000), 12);
  });
});
