/**
 * Parallel tempering (Swendsen & Wang, PRL 57 (1986) 2607; Hukushima & Nemoto, J. Phys. Soc. Jpn. 65 (1996) 1604).
 * Outside references: the exact Boltzmann distribution of the energy, P_β(E) ∝ g(E)·exp(−βE), from enumerating
 * all 2^n states of tiny systems; the χ² goodness-of-fit test with critical values from the table shipped in
 * simple-statistics (Hines & Montgomery, "Probability and Statistics in Engineering and Management Science",
 * Wiley 1980, Table III); exact SK ground states from the tool's exhaustive enumeration (itself tested against
 * published SK ground-state energies in test/sk-ground-energy.test.ts).
 */
import { chiSquaredDistributionTable } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { cnfFromClauses } from "../harness/model/cnf.js";
import { isingFromTerms } from "../harness/model/ising.js";
import { costOf, costTolerance, type Problem } from "../harness/model/problem.js";
import { deriveSeed, Rng } from "../harness/random.js";
import { annealTrials, defaultBetaRange } from "../solvers/anneal.js";
import { exhaustiveSlice, mergeExact, planSlices } from "../solvers/exhaustive.js";
import { ReplicaLadder, temperingLadder, temperingTrials } from "../solvers/tempering.js";
import { trialRng } from "../solvers/trial-seeds.js";
import { sk } from "./helpers/instances.js";

/** Energy levels of all 2^n states (levels within 1e−9 merged) and their degeneracies. */
function levels(problem: Problem, n: number): { energy: number[]; count: number[] } {
  const all: number[] = [];
  for (let z = 0; z < 2 ** n; z++) all.push(costOf(problem, z));
  all.sort((a, b) => a - b);
  const energy: number[] = [];
  const count: number[] = [];
  for (const e of all) {
    if (energy.length > 0 && Math.abs(e - energy[energy.length - 1]) < 1e-9) count[count.length - 1]++;
    else {
      energy.push(e);
      count.push(1);
    }
  }
  return { energy, count };
}

/**
 * Samples the energy at every temperature of a ladder (burn-in 1000 rounds, then every 20th round, 10 000
 * samples) and returns, per temperature, Pearson's χ² against the exact Boltzmann weights and its degrees of
 * freedom (levels with expected count < 5 pooled into one bin, as the χ² test requires).
 */
function chiSquares(problem: Problem, n: number, betas: Float64Array, seed: string, betaScale = 1): { chi2: number; df: number }[] {
  const { energy, count } = levels(problem, n);
  const ladder = new ReplicaLadder(problem, betas);
  ladder.start(trialRng(seed, 0), -Infinity);
  const poll = { stop: null, since: 0 };
  const samples = 10_000;
  const histograms = Array.from(betas, () => new Float64Array(energy.length));
  for (let round = 0; round < 1000; round++) ladder.step(poll);
  for (let s = 0; s < samples; s++) {
    for (let k = 0; k < 20; k++) ladder.step(poll);
    for (let r = 0; r < betas.length; r++) {
      const e = ladder.energyAt(r);
      let best = 0;
      for (let l = 1; l < energy.length; l++) if (Math.abs(energy[l] - e) < Math.abs(energy[best] - e)) best = l;
      expect(Math.abs(energy[best] - e)).toBeLessThan(1e-6); // the running energy is a real level
      histograms[r][best]++;
    }
  }
  return Array.from(betas, (beta, r) => {
    const w = energy.map((e, l) => count[l] * Math.exp(-beta * betaScale * (e - energy[0])));
    const z = w.reduce((a, b) => a + b, 0);
    let chi2 = 0;
    let bins = 0;
    let pooledObserved = 0;
    let pooledExpected = 0;
    for (let l = 0; l < energy.length; l++) {
      const expected = (samples * w[l]) / z;
      if (expected < 5) {
        pooledObserved += histograms[r][l];
        pooledExpected += expected;
        continue;
      }
      chi2 += (histograms[r][l] - expected) ** 2 / expected;
      bins++;
    }
    if (pooledExpected >= 5) {
      chi2 += (pooledObserved - pooledExpected) ** 2 / pooledExpected;
      bins++;
    }
    return { chi2, df: bins - 1 };
  });
}

/** χ² critical value at significance 0.005 (table of simple-statistics). */
function critical(df: number): number {
  return (chiSquaredDistributionTable as unknown as Record<number, Record<number, number>>)[df][0.005];
}

describe("tempering: detailed balance against exact Boltzmann weights (χ², significance 0.005 per temperature)", () => {
  const rng = new Rng(deriveSeed("tempering-balance"));
  const gauss = (): number => Math.sqrt(-2 * Math.log(1 - rng.nextU32() / 4294967296)) * Math.cos(2 * Math.PI * rng.nextU32() / 4294967296);

  it("dense Ising, 4 spins with all pairs and fields", () => {
    const terms: { spins: number[]; J: number }[] = [];
    for (let i = 0; i < 4; i++) for (let j = i + 1; j < 4; j++) terms.push({ spins: [i, j], J: gauss() });
    for (let i = 0; i < 4; i++) terms.push({ spins: [i], J: 0.5 * gauss() });
    const problem: Problem = { kind: "ising", ising: isingFromTerms(4, terms) };
    for (const { chi2, df } of chiSquares(problem, 4, temperingLadder(0.2, 1.5, 4), "dense")) expect(chi2).toBeLessThan(critical(df));
  });

  it("the test has power: against weights at 1.25·β the colder temperatures fail it", () => {
    const terms: { spins: number[]; J: number }[] = [];
    for (let i = 0; i < 4; i++) for (let j = i + 1; j < 4; j++) terms.push({ spins: [i, j], J: gauss() });
    for (let i = 0; i < 4; i++) terms.push({ spins: [i], J: 0.5 * gauss() });
    const problem: Problem = { kind: "ising", ising: isingFromTerms(4, terms) };
    const results = chiSquares(problem, 4, temperingLadder(0.2, 1.5, 4), "power", 1.25);
    expect(results.filter(({ chi2, df }) => chi2 > critical(df)).length).toBeGreaterThanOrEqual(2);
  });

  it("3-spin terms (term engine), 4 spins, 4 random triples and a pair", () => {
    const terms: { spins: number[]; J: number }[] = [];
    for (const [i, j, k] of [[0, 1, 2], [1, 2, 3], [0, 2, 3], [0, 1, 3]]) terms.push({ spins: [i, j, k], J: gauss() });
    terms.push({ spins: [0, 2], J: 0.5 * gauss() });
    const problem: Problem = { kind: "ising", ising: isingFromTerms(4, terms) };
    for (const { chi2, df } of chiSquares(problem, 4, temperingLadder(0.2, 1.5, 4), "terms")) expect(chi2).toBeLessThan(critical(df));
  });

  it("CNF, energy = violated clauses, 6 variables", () => {
    const clauses = [[1, -2, 3], [-1, 4, 5], [2, -5, 6], [-3, -4, -6], [1, 2, -6], [-2, 3, 4], [5, -1, -3], [6, 4, -5], [-4, -2, 1], [3, 5, 6]];
    const problem: Problem = { kind: "cnf", cnf: cnfFromClauses(6, clauses) };
    for (const { chi2, df } of chiSquares(problem, 6, temperingLadder(0.3, 2.5, 4), "cnf")) expect(chi2).toBeLessThan(critical(df));
  });
});

describe("tempering finds SK ground states better than annealing at the same work", () => {
  it("SK n = 30, three instances: R = 8 replicas × 8 rounds against 64-sweep annealing, 400 trials each", () => {
    let ptSuccesses = 0;
    let saSuccesses = 0;
    const trials = 400;
    for (const seed of ["a", "b", "c"]) {
      const problem = sk(30, `pt-${seed}`);
      const tolerance = costTolerance(problem);
      const truth = mergeExact(planSlices(problem, 1).map((s) => exhaustiveSlice(problem, s, null)), tolerance);
      const { betaStart, betaEnd } = defaultBetaRange(problem);
      const pt = temperingTrials(problem, { trials, sweeps: 8, replicas: 8, betaHot: betaStart, betaCold: betaEnd, target: truth.optimum, tolerance, seed, stop: null });
      const sa = annealTrials(problem, { trials, sweeps: 64, betaStart, betaEnd, schedule: "geometric", target: truth.optimum, tolerance, seed, stop: null });
      expect(pt.work).toBe(sa.work); // the same spin-update attempts per trial
      expect(pt.successes).toBeGreaterThan(0);
      expect(pt.best).toBeCloseTo(truth.optimum, 9);
      expect(pt.exchangeAttempts.length).toBe(7);
      for (let r = 0; r < 7; r++) expect(pt.exchangeAccepts[r]).toBeGreaterThan(0);
      ptSuccesses += pt.successes;
      saSuccesses += sa.successes;
    }
    // Measured (seeded): the pooled success probabilities and the TTS ratio at equal work per trial,
    // TTS_anneal / TTS_tempering = ln(1 − p_PT)/ln(1 − p_SA); printed for the report.
    const pPt = ptSuccesses / (3 * trials);
    const pSa = saSuccesses / (3 * trials);
    console.log(`SK n=30: p_tempering = ${pPt.toFixed(3)}, p_anneal = ${pSa.toFixed(3)}, TTS ratio anneal/tempering = ${(Math.log1p(-pPt) / Math.log1p(-pSa)).toFixed(2)}`);
    expect(pPt).toBeGreaterThan(pSa);
  });
});
