/**
 * Metropolis simulated annealing with single-spin flips (Kirkpatrick, Gelatt & Vecchi, "Optimization by
 * simulated annealing", Science 220 (1983) 671–680), for every problem kind the tool computes on.
 *
 * One trial: a uniformly random start, then `sweeps` sequential sweeps (variables 0..n−1 in order, one flip
 * attempt each); the inverse temperature β is constant within a sweep and follows the schedule from sweep to
 * sweep. A flip with cost change ΔE is accepted when ΔE ≤ 0, otherwise with probability exp(−βΔE).
 *
 * Success and work (our choice, stated once here): a trial succeeds when its cost reaches `target` (within
 * `tolerance`) at any point, the start included, and every trial runs its full length even after success, so
 * each trial costs exactly sweeps·n flip attempts. This keeps the per-trial cost fixed, which is what the
 * time-to-solution formula TTS = t_trial·ln(0.01)/ln(1−p) of Rønnow et al. ("Defining and detecting quantum
 * speedup", Science 345 (2014) 420) assumes, and what the search for the run length minimising TTS needs.
 *
 * Trial t draws only from `trialRng(seed, t)` (solvers/walk.ts), so any split of the trial range over calls
 * or workers gives the same counts. Draws of a trial: the start as in the walk (⌈n/32⌉ `nextU32` calls, bit b of
 * call i giving variable 32·i + b), then one `nextU32` = u per flip attempt in the CNF engine (accept when
 * ⌊u/2⌋ < 2^31·exp(−β·ΔE) and β·ΔE ≤ 32 ln 2; every attempt draws, so that the test is one integer compare
 * against a precomputed table) and one per uphill attempt with
 * β·ΔE ≤ 32 ln 2 in the Ising engines (accept when u < 2^32·exp(−β·ΔE); steeper uphill moves are rejected
 * without a draw, their probability being below the 2^−32 resolution of u).
 */
import { deriveSeed, Rng } from "../harness/random.js";
import type { Ising } from "../harness/model/ising.js";
import type { Problem } from "../harness/model/problem.js";
import { costTolerance } from "../harness/model/problem.js";
import type { StopFlag, TrialsResult, TrialsSolver } from "./types.js";
import { compileCnf } from "./compile-cnf.js";
import { ANNEAL_POLL_INTERVAL, type AnnealSchedule, type Engine, type Poll, betaSchedule, checkCount, fmt, pollStop, quantile } from "./anneal-setup.js";
import { CnfEngine } from "./anneal-cnf.js";
import { DENSE_MAX_SPINS, DenseEngine, TermEngine } from "./anneal-ising.js";
import { trialKey, trialRng } from "./trial-seeds.js";

export { ANNEAL_POLL_INTERVAL, betaSchedule, type AnnealSchedule } from "./anneal-setup.js";

/** Options of {@link annealTrials}. */
export interface AnnealOptions {
  /** Number of trials (independent anneals), an integer ≥ 0. */
  readonly trials: number;
  /** Sweeps per trial (n flip attempts each), an integer ≥ 0: the run length. */
  readonly sweeps: number;
  /** Inverse temperature of the first sweep (1/cost unit), finite, ≥ 0 (> 0 for "geometric"). */
  readonly betaStart: number;
  /** Inverse temperature of the last sweep (1/cost unit), finite, ≥ 0 (> 0 for "geometric"). */
  readonly betaEnd: number;
  /**
   * "linear": β_s = β_start + (β_end − β_start)·s/(S−1); "geometric": β_s = β_start·(β_end/β_start)^(s/(S−1)),
   * for sweep s = 0..S−1 (a single sweep runs at β_start).
   */
  readonly schedule: AnnealSchedule;
  /** Cost counted as success, normally the exact optimum from ground truth (violated clauses or energy). */
  readonly target: number;
  /** Absolute tolerance: success when cost ≤ target + tolerance, ≥ 0. */
  readonly tolerance: number;
  /** Index of the first trial (trial t draws from trialRng(seed, t) of solvers/walk.ts). Default 0. */
  readonly firstTrial?: number;
  /** Cell seed the trial generators are derived from. */
  readonly seed: string;
  /** Cooperative stop flag, polled between sweeps about every {@link ANNEAL_POLL_INTERVAL} flip attempts. */
  readonly stop: StopFlag;
}

/**
 * Runs annealing trials `firstTrial .. firstTrial + trials − 1` on a problem.
 *
 * `work` = flip attempts over finished trials (sweeps·n each); `best` = lowest cost seen at any point of any
 * finished trial (+Infinity when none finished; for Ising energies an incrementally updated value, exact to
 * rounding, and recomputed from scratch whenever it is taken as success). When the stop flag is raised the
 * trial in progress is dropped and `censored` is true.
 *
 * Cost bookkeeping: CNF (cost = violated clauses) keeps true-literal counts and, per variable, the integer
 * ΔE of flipping it, so an attempt is O(1) and an accepted flip O(occurrences × clause length); acceptance
 * thresholds come from a table of ⌈2^31·exp(−β_s·d)⌉ for every sweep s and integer d, computed once per call. Ising models of order ≤ 2 whose
 * couplings fill at least a quarter of the pairs (and n ≤ 2048) keep a dense coupling matrix and local fields
 * (attempt O(1), accepted flip O(n)); all other models (sparse graphs, higher orders) keep term products and
 * per-spin sums over the terms containing the spin (attempt O(1), accepted flip O(Σ sizes of its terms)).
 */
export function annealTrials(problem: Problem, options: AnnealOptions): TrialsResult {
  const { trials, sweeps, betaStart, betaEnd, schedule, target, tolerance } = options;
  const firstTrial = options.firstTrial ?? 0;
  checkCount("trials", trials);
  checkCount("sweeps", sweeps);
  checkCount("firstTrial", firstTrial);
  if (!Number.isFinite(target)) throw new RangeError(`target must be finite, got ${target}`);
  if (!(tolerance >= 0) || !Number.isFinite(tolerance)) throw new RangeError(`tolerance must be finite and ≥ 0, got ${tolerance}`);
  const betas = betaSchedule(betaStart, betaEnd, sweeps, schedule);

  const engine = makeEngine(problem);
  const n = engine.n;
  engine.prepare(betas);
  const threshold = target + tolerance;
  const key = trialKey(options.seed);
  const poll: Poll = { stop: options.stop, since: ANNEAL_POLL_INTERVAL }; // poll before the first trial
  let done = 0;
  let successes = 0;
  let best = Infinity;
  let censored = false;

  for (let t = firstTrial; t < firstTrial + trials; t++) {
    if (pollStop(poll)) {
      censored = true;
      break;
    }
    engine.start(trialRng(key, t), threshold);
    poll.since += 1;
    // The whole trial runs inside the engine, so the sweep loop keeps its arrays in locals (the stop flag is
    // still polled between sweeps, through `poll`).
    if (!engine.run(poll)) {
      censored = true; // the trial in progress is dropped
      break;
    }
    done++;
    if (engine.hit) successes++;
    if (engine.best < best) best = engine.best;
  }
  return { trials: done, successes, work: done * sweeps * n, best, censored };
}

/**
 * Acceptance probability of a typical (median) uphill single flip from a random state at the hot end. At a
 * random state about half of all single flips go uphill, so with 0.6 for them about 0.5 + 0.5·0.6 = 80% of all
 * attempts are accepted: the first sweeps wander almost freely and forget the start.
 */
export const HOT_UPHILL_ACCEPTANCE = 0.6;

/**
 * Acceptance probability of the smallest uphill step out of a greedy local minimum at the cold end. With it, a
 * sweep of n = 25 attempts at such a minimum escapes with probability at most 1 − (1 − 0.002)^25 ≈ 5%, so the
 * last sweeps are practically a greedy descent and a trial ends in (near) a local minimum.
 */
export const COLD_ESCAPE_ACCEPTANCE = 0.002;

/** Quantile of the uphill steps at local minima that stands for "the smallest" (robust for continuous couplings). */
const SMALLEST_STEP_QUANTILE = 0.05;

/**
 * Default temperature range of a problem: the acceptance-ratio rule, from the instance's own energy scale
 * (deterministic: the sample comes from a fixed seed, so the range is a pure function of the instance).
 * A Metropolis flip uphill by ΔE > 0 is accepted with probability exp(−ΔE/T), so the temperature at which a
 * step ΔE is accepted with probability P is T = ΔE / ln(1/P).
 *
 * 1. Draw R = min(64, max(4, ⌈4096/n⌉)) uniformly random states; record the uphill ΔE of all n single flips of
 *    each. Hot end: T_hot = median uphill ΔE / ln(1/{@link HOT_UPHILL_ACCEPTANCE}).
 * 2. From each state descend greedily (sequential sweeps flipping every variable whose flip lowers the cost,
 *    until a sweep flips none) and record the uphill ΔE of all single flips at the local minimum reached. Cold
 *    end: T_cold = δ / ln(1/{@link COLD_ESCAPE_ACCEPTANCE}), δ = the smallest of these steps, read as their 5%
 *    quantile (nearest rank): for integer costs (CNF) that is the smallest step, 1; for continuous couplings
 *    (SK) the sample minimum would sit arbitrarily close to zero and the quantile stands in for it.
 * 3. T_cold is lowered, if need be, so that T_cold ≤ T_hot·ln(1/0.6)/ln(1/0.002) (the typical uphill move is
 *    then accepted with probability 0.002 at the cold end), so the range always cools. Without any uphill step
 *    (no clauses, all J = 0) both steps are taken as 1.
 *
 * "Uphill" means ΔE above 0.5 for CNF and above the problem's cost tolerance for Ising models.
 * @returns the range as inverse temperatures β = 1/T (β_start = 1/T_hot, β_end = 1/T_cold; 1/cost unit), the
 *   same range as temperatures, and the rule in words, for the manifest.
 */
export function defaultBetaRange(problem: Problem): { betaStart: number; betaEnd: number; temperatureHot: number; temperatureCold: number; rule: string } {
  const engine = makeEngine(problem);
  const n = engine.n;
  const eps = problem.kind === "cnf" ? 0.5 : costTolerance(problem);
  const samples = Math.min(64, Math.max(4, Math.ceil(4096 / Math.max(n, 1))));
  const rng = new Rng(deriveSeed("speedbound", "anneal", "default-beta-range"));
  const random: number[] = [];
  const minima: number[] = [];
  for (let r = 0; r < samples; r++) {
    engine.start(rng, -Infinity);
    for (let i = 0; i < n; i++) {
      const d = engine.delta(i);
      if (d > eps) random.push(d);
    }
    // Every flip lowers the cost by more than eps, so the descent ends; the sweep cap only guards the loop.
    for (let sweep = 0, improved = true; improved && sweep < 10 * n + 100; sweep++) {
      improved = false;
      for (let i = 0; i < n; i++) {
        if (engine.delta(i) < -eps) {
          engine.flip(i);
          improved = true;
        }
      }
    }
    for (let i = 0; i < n; i++) {
      const d = engine.delta(i);
      if (d > eps) minima.push(d);
    }
  }
  const typical = random.length > 0 ? quantile(random, 0.5) : 1;
  const smallest = minima.length > 0 ? quantile(minima, SMALLEST_STEP_QUANTILE) : typical;
  const hotLog = Math.log(1 / HOT_UPHILL_ACCEPTANCE);
  const coldLog = Math.log(1 / COLD_ESCAPE_ACCEPTANCE);
  const betaStart = hotLog / typical;
  const betaEnd = Math.max(coldLog / smallest, (coldLog / hotLog) * betaStart);
  const rule =
    `acceptance ratios: T_hot = median uphill dE from ${samples} random states (${fmt(typical)}) / ln(1/${HOT_UPHILL_ACCEPTANCE}); ` +
    `T_cold = min(5% quantile of uphill dE at their greedy local minima (${fmt(smallest)}) / ln(1/${COLD_ESCAPE_ACCEPTANCE}), ` +
    `T_hot*ln(1/${HOT_UPHILL_ACCEPTANCE})/ln(1/${COLD_ESCAPE_ACCEPTANCE}))`;
  return { betaStart, betaEnd, temperatureHot: 1 / betaStart, temperatureCold: 1 / betaEnd, rule };
}

/** The fastest engine for a problem (see {@link annealTrials}); tempering (solvers/tempering.ts) runs one per replica. */
export function makeEngine(problem: Problem): Engine {
  if (problem.kind === "cnf") return new CnfEngine(compileCnf(problem.cnf));
  return isingEngineKind(problem.ising) === "dense" ? new DenseEngine(problem.ising) : new TermEngine(problem.ising);
}

/** Engine kind per model, decided once (a tempering call builds R engines on one model). */
const ENGINE_KIND = new WeakMap<Ising, "dense" | "term">();

function isingEngineKind(model: Ising): "dense" | "term" {
  let kind = ENGINE_KIND.get(model);
  if (kind === undefined) {
    const n = model.spins;
    let order = 0;
    let pairs = 0;
    for (let t = 0; t + 1 < model.termOffsets.length; t++) {
      const size = model.termOffsets[t + 1] - model.termOffsets[t];
      order = Math.max(order, size);
      if (size === 2) pairs++;
    }
    kind = order <= 2 && n <= DENSE_MAX_SPINS && 4 * pairs >= (n * (n - 1)) / 2 ? "dense" : "term";
    ENGINE_KIND.set(model, kind);
  }
  return kind;
}

/** Settings of the annealer on the registry. */
export interface AnnealSettings {
  /** Cooling law across sweeps. */
  readonly schedule: AnnealSchedule;
  /** Inverse-temperature range [β_start, β_end] (1/cost unit), or null for the instance-derived default. */
  readonly beta: readonly [number, number] | null;
}

/** Simulated annealing on the solver registry (solvers/registry.ts). Run length = sweeps per trial. */
export const annealSolver: TrialsSolver<AnnealSettings> = {
  name: "anneal",
  kind: "trials",
  description: "Metropolis simulated annealing with single flips, one run per sweep count",
  options: ["anneal-sweeps", "anneal-cooling", "anneal-temperature", "trials"],
  runLengthUnit: "sweeps",
  defaultFor: ["cnf", "ising"],
  appliesTo: () => null,
  skipReason: () => null,
  runLengths: (_n, study) => [...(study.options["anneal-sweeps"] as ReadonlyArray<number>)],
  settings: (study) => ({
    schedule: study.options["anneal-cooling"] as AnnealSchedule,
    beta: (study.options["anneal-beta"] as readonly [number, number] | null) ?? null,
  }),
  prepare(problem, settings) {
    if (settings.beta !== null) return settings;
    const r = defaultBetaRange(problem);
    return { schedule: settings.schedule, beta: [r.betaStart, r.betaEnd] };
  },
  run(problem, input) {
    const range = input.settings.beta ?? annealSolver.prepare!(problem, input.settings).beta!;
    const result = annealTrials(problem, {
      trials: input.trials, sweeps: input.runLength, betaStart: range[0], betaEnd: range[1], schedule: input.settings.schedule,
      target: input.target, tolerance: input.tolerance, seed: input.seed, stop: input.stop, firstTrial: 0,
    });
    return { ...result, extra: { beta_start: range[0], beta_end: range[1] } };
  },
};
