/**
 * Parallel tempering (replica-exchange Monte Carlo: R. H. Swendsen and J.-S. Wang, "Replica Monte Carlo
 * simulation of spin-glasses", Phys. Rev. Lett. 57 (1986) 2607; K. Hukushima and K. Nemoto, "Exchange Monte
 * Carlo method and application to spin glass simulations", J. Phys. Soc. Jpn. 65 (1996) 1604), for every
 * problem kind: energy = violated clauses for CNF, the Ising energy otherwise.
 *
 * One trial: R replicas, each a uniformly random start, at inverse temperatures β_0 < … < β_{R−1} geometric
 * between a hot and a cold end (β_r = β_hot·(β_cold/β_hot)^(r/(R−1)); one replica runs at β_cold). Each round is
 * one Metropolis sweep of every replica at its temperature (the annealer's engines, anneal-cnf.ts/anneal-ising.ts: sequential
 * sweep, single-spin flips), then exchange attempts between neighbouring temperatures r, r + 1, for r of one
 * parity, alternating even and odd from round to round (as Hukushima & Nemoto do), each accepted with probability
 * min(1, exp((β_r − β_{r+1})(E_r − E_{r+1}))). Exchanges swap which replica sits at which temperature, so no
 * configuration is copied.
 *
 * Success (as for the annealer): any replica reaches the target cost at any point of the trial; every trial runs
 * its full `sweeps` rounds, so it costs sweeps·R·n spin-update attempts (the `work`). Trial t draws only from
 * trialRng(seed, t) (solvers/trial-seeds.ts): the R starts in replica order, then each round the sweeps in temperature
 * order, then one `nextU32` = u per exchange attempt whose exponent x = (β_r − β_{r+1})(E_r − E_{r+1}) is negative
 * (accepted when u·2^−32 < exp(x)); x ≥ 0 accepts without a draw.
 *
 * Memory: one engine per replica; the read-only tables of the model (the dense coupling matrix, the term lists) are
 * shared by all of them (anneal-ising.ts), so a replica adds only its state.
 *
 * Temperature range: the annealer's instance-derived default (defaultBetaRange in anneal.ts, the acceptance-ratio
 * rule: a typical uphill move accepted with 0.6 at the hot end, the smallest escape from a local minimum with
 * 0.002 at the cold end), or `--tempering-temperature HOT:COLD`.
 */
import type { Problem } from "../harness/model/problem.js";
import type { Rng } from "../harness/random.js";
import { defaultBetaRange, makeEngine } from "./anneal.js";
import { ANNEAL_POLL_INTERVAL, pollStop, type Engine, type Poll } from "./anneal-setup.js";
import type { TrialsResult, StopFlag, TrialsSolver } from "./types.js";
import { trialKey, trialRng } from "./trial-seeds.js";

/** Options of {@link temperingTrials}. */
export interface TemperingOptions {
  /** Independent trials, an integer ≥ 0. */
  readonly trials: number;
  /** Rounds (a sweep of every replica, then exchanges) per trial, an integer ≥ 0: the run length. */
  readonly sweeps: number;
  /** Replicas R, an integer ≥ 1. */
  readonly replicas: number;
  /** Hot-end inverse temperature, finite, > 0. */
  readonly betaHot: number;
  /** Cold-end inverse temperature, finite, ≥ betaHot. */
  readonly betaCold: number;
  /** Success: cost ≤ target + tolerance. */
  readonly target: number;
  readonly tolerance: number;
  readonly firstTrial?: number;
  readonly seed: string;
  readonly stop: StopFlag;
}

/** Trial counts plus the exchange diagnostics. */
export interface TemperingResult extends TrialsResult {
  /** The temperature ladder, hot to cold. */
  readonly betas: Float64Array;
  /** Exchange attempts between temperatures r and r + 1 (length R − 1), over finished trials. */
  readonly exchangeAttempts: Float64Array;
  /** Accepted exchanges between temperatures r and r + 1. */
  readonly exchangeAccepts: Float64Array;
}

/** Geometric ladder of R inverse temperatures from hot to cold (R = 1: the cold end alone). */
export function temperingLadder(betaHot: number, betaCold: number, replicas: number): Float64Array {
  if (!(betaHot > 0) || !Number.isFinite(betaHot) || !(betaCold >= betaHot) || !Number.isFinite(betaCold)) {
    throw new RangeError(`tempering needs finite 0 < beta_hot ≤ beta_cold, got ${betaHot}, ${betaCold}`);
  }
  if (!Number.isSafeInteger(replicas) || replicas < 1) throw new RangeError(`replicas must be an integer ≥ 1, got ${replicas}`);
  const betas = new Float64Array(replicas);
  for (let r = 0; r < replicas; r++) betas[r] = replicas === 1 ? betaCold : betaHot * Math.pow(betaCold / betaHot, r / (replicas - 1));
  return betas;
}

/**
 * A ladder of replicas on one problem: the state of one tempering trial. Exported so that tests can sample the
 * replicas' energies round by round (detailed balance); {@link temperingTrials} is the solver.
 */
export class ReplicaLadder {
  readonly betas: Float64Array;
  readonly n: number;
  /** Exchange attempts / acceptances per neighbour pair since construction. */
  readonly attempts: Float64Array;
  readonly accepts: Float64Array;
  private readonly engines: Engine[];
  /** slot[r] = index of the engine at temperature r. */
  private readonly slot: Int32Array;
  private rng: Rng | null = null;
  private round = 0;

  constructor(problem: Problem, betas: Float64Array) {
    this.betas = betas;
    const R = betas.length;
    this.engines = [];
    for (let r = 0; r < R; r++) {
      const e = makeEngine(problem);
      e.prepare(betas);
      this.engines.push(e);
    }
    this.n = this.engines[0].n;
    this.slot = Int32Array.from({ length: R }, (_, r) => r);
    this.attempts = new Float64Array(Math.max(R - 1, 0));
    this.accepts = new Float64Array(Math.max(R - 1, 0));
  }

  /** New random starts for every replica from `rng` (kept for the rounds); success threshold = target + tolerance. */
  start(rng: Rng, threshold: number): void {
    this.rng = rng;
    this.round = 0;
    for (let r = 0; r < this.engines.length; r++) {
      this.slot[r] = r;
      this.engines[r].start(rng, threshold);
    }
  }

  /** One round: a sweep of every replica, then the exchanges of this round's parity. False when stopped. */
  step(poll: Poll): boolean {
    const R = this.engines.length;
    const slot = this.slot;
    for (let r = 0; r < R; r++) if (!this.engines[slot[r]].run(poll, r, r + 1)) return false;
    const rng = this.rng as Rng;
    const betas = this.betas;
    for (let r = this.round & 1; r + 1 < R; r += 2) {
      const a = slot[r];
      const b = slot[r + 1];
      const x = (betas[r] - betas[r + 1]) * (this.engines[a].current() - this.engines[b].current());
      this.attempts[r]++;
      if (x >= 0 || rng.nextU32() * 2.3283064365386963e-10 < Math.exp(x)) {
        slot[r] = b;
        slot[r + 1] = a;
        this.accepts[r]++;
      }
    }
    this.round++;
    return true;
  }

  /** Energy of the replica at temperature r. */
  energyAt(r: number): number {
    return this.engines[this.slot[r]].current();
  }

  /** True when any replica reached the threshold during this trial. */
  hit(): boolean {
    return this.engines.some((e) => e.hit);
  }

  /** Lowest cost any replica saw during this trial. */
  best(): number {
    return Math.min(...this.engines.map((e) => e.best));
  }
}

/**
 * Runs tempering trials `firstTrial .. firstTrial + trials − 1`. `work` = sweeps·R·n per finished trial; `best` =
 * lowest cost of any replica in any finished trial. A stop drops the trial in progress and marks `censored`.
 */
export function temperingTrials(problem: Problem, options: TemperingOptions): TemperingResult {
  const { trials, sweeps, replicas, target, tolerance } = options;
  const firstTrial = options.firstTrial ?? 0;
  for (const [name, v] of [["trials", trials], ["sweeps", sweeps], ["firstTrial", firstTrial]] as const) {
    if (!Number.isSafeInteger(v) || v < 0) throw new RangeError(`${name} must be an integer ≥ 0, got ${v}`);
  }
  if (!Number.isFinite(target)) throw new RangeError(`target must be finite, got ${target}`);
  if (!(tolerance >= 0) || !Number.isFinite(tolerance)) throw new RangeError(`tolerance must be finite and ≥ 0, got ${tolerance}`);
  const betas = temperingLadder(options.betaHot, options.betaCold, replicas);
  const ladder = new ReplicaLadder(problem, betas);
  const key = trialKey(options.seed);
  const poll: Poll = { stop: options.stop, since: ANNEAL_POLL_INTERVAL };
  const threshold = target + tolerance;
  const attempts = new Float64Array(ladder.attempts.length);
  const accepts = new Float64Array(ladder.accepts.length);
  let done = 0;
  let successes = 0;
  let best = Infinity;
  let censored = false;
  for (let t = firstTrial; t < firstTrial + trials && !censored; t++) {
    if (pollStop(poll)) {
      censored = true;
      break;
    }
    ladder.attempts.fill(0);
    ladder.accepts.fill(0);
    ladder.start(trialRng(key, t), threshold);
    poll.since += 1;
    for (let s = 0; s < sweeps; s++) {
      if (!ladder.step(poll)) {
        censored = true; // the trial in progress is dropped, with its exchange counts
        break;
      }
    }
    if (censored) break;
    done++;
    for (let r = 0; r < attempts.length; r++) {
      attempts[r] += ladder.attempts[r];
      accepts[r] += ladder.accepts[r];
    }
    if (ladder.hit()) successes++;
    best = Math.min(best, ladder.best());
  }
  return { trials: done, successes, work: done * sweeps * replicas * ladder.n, best, censored, betas, exchangeAttempts: attempts, exchangeAccepts: accepts };
}

/** Settings of tempering on the registry. */
export interface TemperingSettings {
  /** Replicas R. */
  readonly replicas: number;
  /** Inverse temperatures [β_hot, β_cold] (1/cost unit), or null for the annealer's instance-derived range. */
  readonly beta: readonly [number, number] | null;
}

/**
 * Parallel tempering on the solver registry (solvers/registry.ts). Run length = rounds per trial; work = spin-update
 * attempts (rounds·R·n). Reports the exchange acceptance rate of each neighbouring pair, hot end first
 * (`exchangeAcceptance`; NaN for a pair never attempted), and the ladder's ends and size in `extra`.
 */
export const temperingSolver: TrialsSolver<TemperingSettings> = {
  name: "tempering",
  kind: "trials",
  description: "parallel tempering (replica exchange): R Metropolis replicas on a geometric temperature ladder, neighbour swaps",
  options: ["tempering-sweeps", "tempering-replicas", "tempering-temperature", "trials"],
  runLengthUnit: "sweeps",
  defaultFor: ["ising"],
  appliesTo: () => null,
  skipReason: () => null,
  runLengths: (_n, study) => [...(study.options["tempering-sweeps"] as ReadonlyArray<number>)],
  settings: (study) => ({
    replicas: Number(study.options["tempering-replicas"]),
    beta: (study.options["tempering-beta"] as readonly [number, number] | null) ?? null,
  }),
  prepare(problem, settings) {
    if (settings.beta !== null) return settings;
    const r = defaultBetaRange(problem);
    return { replicas: settings.replicas, beta: [r.betaStart, r.betaEnd] };
  },
  run(problem, input) {
    const s = input.settings.beta === null ? temperingSolver.prepare!(problem, input.settings) : input.settings;
    const range = s.beta!;
    const r = temperingTrials(problem, {
      trials: input.trials, sweeps: input.runLength, replicas: s.replicas, betaHot: range[0], betaCold: range[1],
      target: input.target, tolerance: input.tolerance, seed: input.seed, stop: input.stop, firstTrial: 0,
    });
    const rates = Array.from(r.exchangeAttempts, (a, i) => (a > 0 ? r.exchangeAccepts[i] / a : NaN));
    return {
      trials: r.trials, successes: r.successes, work: r.work, best: r.best, censored: r.censored,
      exchangeAcceptance: rates, extra: { beta_start: range[0], beta_end: range[1], replicas: s.replicas },
    };
  },
};
