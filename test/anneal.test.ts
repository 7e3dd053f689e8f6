import { describe, expect, it } from "vitest";
import { deriveSeed, Rng } from "../harness/random.js";
import { cnfFromClauses } from "../harness/model/cnf.js";
import { isingFromTerms } from "../harness/model/ising.js";
import { costOf, costTolerance, sizeOf, type Problem } from "../harness/model/problem.js";
import type { TrialsResult } from "../solvers/types.js";
import { annealTrials, betaSchedule, defaultBetaRange, type AnnealOptions } from "../solvers/anneal.js";
import { trialRng } from "../solvers/trial-seeds.js";

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

/**
 * Metropolis annealing transcribed plainly from the TSDoc of solvers/anneal.ts, every cost recomputed from
 * scratch with the reference evaluator costOf (n ≤ 30): trial t draws from trialRng(seed, t); the start is
 * the low n bits of the first draws; CNF draws u on every attempt and accepts when ⌊u/2⌋ < 2^31·exp(−β·ΔE)
 * and β·ΔE ≤ 32 ln 2 (ΔE ≤ 0 always); Ising accepts ΔE ≤ 0 without a draw, rejects β·ΔE > 32 ln 2 without a
 * draw, and otherwise accepts when u < 2^32·exp(−β·ΔE). Used on integer costs (CNF, ±1 couplings, a ±0.5 field),
 * where the engines' incremental ΔE is exact, so the two must agree draw for draw.
 */
function referenceAnneal(problem: Problem, o: AnnealOptions): { result: TrialsResult; uphill: number; rejected: number } {
  const n = sizeOf(problem);
  const betas = betaSchedule(o.betaStart, o.betaEnd, o.sweeps, o.schedule);
  const maxExponent = 32 * Math.LN2;
  let successes = 0;
  let best = Infinity;
  let uphill = 0; // accepted moves with ΔE > 0
  let rejected = 0;
  for (let t = o.firstTrial ?? 0; t < (o.firstTrial ?? 0) + o.trials; t++) {
    const rng = trialRng(o.seed, t);
    let z = 0;
    for (let v = 0; v < n; v += 32) {
      const bits = rng.nextU32();
      for (let b = 0; b < 32 && v + b < n; b++) z += ((bits >>> b) & 1) * 2 ** (v + b);
    }
    let cost = costOf(problem, z);
    let trialBest = cost;
    for (const beta of betas) {
      for (let v = 0; v < n; v++) {
        const flipped = z ^ (1 << v);
        const delta = costOf(problem, flipped) - cost;
        let accept: boolean;
        if (problem.kind === "cnf") {
          const u = rng.nextU32();
          accept = delta <= 0 || (beta * delta <= maxExponent && u >>> 1 < Math.exp(-beta * delta) * 2 ** 31);
        } else {
          accept = delta <= 0 || (beta * delta <= maxExponent && rng.nextU32() < Math.exp(-beta * delta) * 2 ** 32);
        }
        if (accept) {
          z = flipped;
          cost += delta;
          trialBest = Math.min(trialBest, cost);
          if (delta > 0) uphill++;
        } else {
          rejected++;
        }
      }
    }
    if (trialBest <= o.target + o.tolerance) successes++;
    best = Math.min(best, trialBest);
  }
  return { result: { trials: o.trials, successes, work: o.trials * o.sweeps * n, best, censored: false }, uphill, rejected };
}

describe("annealTrials against a plain transcription", () => {
  const ints = new Rng(deriveSeed("anneal-test", "reference"));
  const pm1 = (spinsOf: number[][]) => spinsOf.map((spins) => ({ spins, J: ints.bit() === 1 ? 1 : -1 }));
  const pairs = (n: number) => Array.from({ length: n }, (_, i) => Array.from({ length: n - i - 1 }, (_, d) => [i, i + 1 + d])).flat();
  const triples = (n: number) => pairs(n).flatMap(([i, j]) => Array.from({ length: n - j - 1 }, (_, d) => [i, j, j + 1 + d]));
  const mixed: Problem = {
    kind: "cnf",
    cnf: cnfFromClauses(10, [[1, -2], [2, 3, -4, 5], [-1], [4, 4, -6], [6, 7, 8, 9, -10], [], [-3, 10], [2, -2, 7], [5, -8, 9]]),
  };
  const problems: Array<[string, Problem]> = [
    ["3-SAT n=12, m=52 (CNF engine, one clause length)", ksat(ints, 12, 52)],
    ["mixed lengths, repeats, a tautology and an empty clause (CNF engine)", mixed],
    ["one variable: x1 ∧ x1 ∧ ¬x1 (CNF engine, smallest layout)", { kind: "cnf", cnf: cnfFromClauses(1, [[1], [1, 1], [-1]]) }],
    ["±1 SK n=11 (dense engine)", { kind: "ising", ising: isingFromTerms(11, pm1(pairs(11))) }],
    ["±1 ring n=12 with a ±0.5 field and a constant (term engine)", ring(ints, 12)],
    ["±1 3-spin n=7 (term engine)", { kind: "ising", ising: isingFromTerms(7, pm1(triples(7))) }],
  ];

  it.each(problems)("%s: same successes, best and work, draw for draw", (_name, problem) => {
    const optimum = bruteOptimum(problem);
    for (const schedule of ["linear", "geometric"] as const) {
      // firstTrial > 0 checks the trial indexing too.
      const o = options(problem, optimum, { trials: 30, sweeps: 8, firstTrial: 5, schedule, seed: `reference-${schedule}` });
      const { result, uphill, rejected } = referenceAnneal(problem, o);
      expect(annealTrials(problem, o)).toEqual(result);
      // The comparison covers accepted uphill moves and rejections, not only descents.
      expect(uphill).toBeGreaterThan(10);
      expect(rejected).toBeGreaterThan(10);
    }
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
    expect(r.rule).toMatch(/T_hot = median uphill dE.*ln\(1\/0\.6\).*T_cold.*ln\(1\/0\.002\)/);
    expect(r.temperatureHot).toBeCloseTo(1 / r.betaStart, 12);
    expect(r.temperatureCold).toBeCloseTo(1 / r.betaEnd, 12);
    expect(defaultBetaRange(problem)).toEqual(r); // deterministic
  });

  it("gives T_cold = 1/ln 500 for CNF, whose smallest uphill step at a local minimum is one clause (the rule)", () => {
    // Hand computation: δ = 1 clause, accepted with probability 0.002 ⇒ T_cold = 1/ln(1/0.002), β_end = ln 500.
    expect(defaultBetaRange(cases[1][1]).betaEnd).toBeCloseTo(Math.log(500), 12);
  });

  it("matches a hand computation on the one-clause formula (x1): every uphill step is 1 clause", () => {
    // Random states: the flip of x1 goes uphill (0 → 1 violated) exactly when x1 is true, by 1; the median
    // uphill step is 1, so T_hot = 1/ln(1/0.6) and β_start = ln(1/0.6) = 0.5108…; at the local minimum
    // (x1 true) the only uphill step is 1, so β_end = max(ln 500, (ln 500/ln(1/0.6))·β_start) = ln 500.
    const one: Problem = { kind: "cnf", cnf: { variables: 1, offsets: Int32Array.of(0, 1), literals: Int32Array.of(1) } };
    const r = defaultBetaRange(one);
    expect(r.betaStart).toBeCloseTo(Math.log(1 / 0.6), 14);
    expect(r.betaEnd).toBeCloseTo(Math.log(500), 12);
    expect(r.temperatureHot).toBeCloseTo(1 / Math.log(1 / 0.6), 12);
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
    // Scale 1 at both ends: β_start = ln(1/0.6), β_end = ln(1/0.002) = ln 500.
    expect(r.betaStart).toBeCloseTo(Math.log(1 / 0.6), 15);
    expect(r.betaEnd).toBeCloseTo(Math.log(500), 12);
  });
});
