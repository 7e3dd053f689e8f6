/**
 * Schöning's random walk for k-SAT (U. Schöning, "A probabilistic algorithm for k-SAT based on limited local
 * search and restart", Algorithmica 32 (2002) 615–623).
 *
 * One trial: a uniformly random assignment, then at most `maxFlips` steps (default 3n), each flipping a
 * uniformly chosen variable of a uniformly chosen violated clause; the trial succeeds as soon as no clause is
 * violated (the start included). Trials are independent restarts; trial t draws only from
 * {@link trialRng}(seed, t), so any split of the trial range over calls or workers gives the same counts.
 * Every trial records its flips to solution, censored at `maxFlips` (its run-length distribution, as breakwalk's:
 * success and TTS at any shorter cut-off follow without rerunning, harness/stats/run-length.ts). With
 * `restartFlips` below `maxFlips` one trial is the restarting algorithm itself (a fresh random start every
 * `restartFlips` flips, up to `maxFlips` flips in all), whose run-length distribution the benches and tests set
 * beside breakwalk's flip for flip.
 *
 * The violated-clause set is maintained incrementally: per-clause true-literal counts, literal occurrence
 * lists in compressed-row typed arrays, and an indexed list of violated clauses with O(1) insert and delete.
 * A step costs O(occurrences of the flipped variable); nothing is ever rescanned.
 */
import { compileCnf, type CompiledCnf } from "./compile-cnf.js";
import { randomAssignment, trialKey, trialRng } from "./trial-seeds.js";
import { RunLengthTally } from "./run-length-tally.js";
import type { Cnf } from "../harness/model/cnf.js";
import type { RunLengths } from "../harness/types.js";
import { stepsToSolution, stopRequested, type StopFlag, type TrialsResult, type TrialsSolver } from "./types.js";

/** Options of {@link walkTrials}. */
export interface WalkOptions {
  /** Number of trials to run (restarts), an integer ≥ 0. */
  readonly trials: number;
  /** Maximum flips per trial (the cap of its run-length distribution), an integer ≥ 0. Default 3n (Schöning's run length). */
  readonly maxFlips?: number;
  /**
   * Flips before a fresh random start inside a trial, an integer ≥ 1. Default: none (a trial is one start of at
   * most `maxFlips` flips). Schöning's restarting algorithm run to a cap is `restartFlips: 3n, maxFlips: cap`.
   */
  readonly restartFlips?: number;
  /** Index of the first trial (trial t draws from {@link trialRng}(seed, t)). Default 0. */
  readonly firstTrial?: number;
  /** Cell seed the trial generators are derived from. */
  readonly seed: string;
  /** Cooperative stop flag, polled every {@link WALK_POLL_INTERVAL} steps and at the start of a trial. */
  readonly stop: StopFlag;
}

/** Steps (flips or trial starts) between two polls of the stop flag. */
export const WALK_POLL_INTERVAL = 4096;

/** Trial counts plus the run-length distribution. */
export interface WalkResult extends TrialsResult {
  /** Flips to solution per finished trial, censored at `maxFlips` (an unsolved trial: the flips it ran). */
  readonly runLengths: RunLengths;
}

/**
 * Runs Schöning's walk trials `firstTrial .. firstTrial + trials − 1` on a formula.
 *
 * Counts: `work` = flips over the finished trials (the start assignment is not a flip), `best` = fewest
 * violated clauses seen at any point of any finished trial (+Infinity when none finished), success = no
 * violated clause. A clause of any length is handled; an empty clause makes success impossible (the walk
 * still runs on the other clauses and stops early once only empty clauses are violated). When the stop
 * flag is raised the trial in progress is dropped and `censored` is true. `runLengths` gives each finished trial's
 * flips and whether it was solved (an unsolved trial ran `maxFlips` flips, fewer only with an empty clause).
 */
export function walkTrials(cnf: Cnf, options: WalkOptions): WalkResult {
  return walkCompiled(compileCnf(cnf), options);
}

/**
 * {@link walkTrials} on an already compiled formula (for callers that run many cells on one instance).
 *
 * The draws of trial t, all from {@link trialRng}(seed, t), in this order (fixed so that results are
 * reproducible, and checked draw for draw against a plain transcription in test/walk.test.ts):
 * 1. the start: ⌈n/32⌉ calls of `nextU32`, bit b of call i giving variable 32·i + b;
 * 2. each step, with U violated clauses listed as described below: when all kept clauses have one length k,
 *    one `below(U·k)` = j picks entry ⌊j/k⌋ of the list and literal j mod k of that clause (a uniform clause and
 *    an independent uniform literal, as two draws would, for one draw); otherwise `below(U)` picks the entry
 *    and `below(length)` the literal;
 * 3. with `restartFlips`, after every `restartFlips` flips of a trial still unsolved below `maxFlips`: 1 and 2
 *    again, on the same generator.
 *
 * The violated list: after the start, the violated clauses in increasing index. A flip of v first visits
 * the clauses where v's literal became true, in increasing index, and removes each that was violated by
 * moving the list's last entry into its place; then the clauses where v's literal became false, in
 * increasing index, appending each that became violated.
 */
export function walkCompiled(f: CompiledCnf, options: WalkOptions): WalkResult {
  const n = f.variables;
  const trials = options.trials;
  const maxFlips = options.maxFlips ?? 3 * n;
  const firstTrial = options.firstTrial ?? 0;
  checkCount("trials", trials);
  checkCount("maxFlips", maxFlips);
  checkCount("firstTrial", firstTrial);
  const restartFlips = options.restartFlips ?? maxFlips;
  if (options.restartFlips !== undefined && !(Number.isSafeInteger(restartFlips) && restartFlips >= 1)) {
    throw new RangeError(`restartFlips must be an integer ≥ 1, got ${restartFlips}`);
  }

  const m = f.clauses;
  const { clauseStart, clauseLiterals, occurrenceStart, occurrences } = f;
  const k = f.clauseLength;
  // ⌊j/k⌋ = ⌊j·invK⌋ exactly for 0 ≤ j < 2^39: invK exceeds 1/k by a relative 2^−40 (± rounding 2^−51),
  // which can neither lift j/k = q + r/k, r ≤ k − 1, to q + 1 nor leave an exact quotient below q.
  // Measured: 1.13 → 1.20e7 steps/s against Math.floor(j / k) (3-SAT n = 28, m = 119, 3n flips a trial; all
  // figures in this file are per CPU-second on that formula, node 20, the shared 2-core test machine).
  const invK = k > 0 ? (1 / k) * (1 + 2 ** -40) : 0;
  const empty = f.emptyClauses;
  const value = new Uint8Array(n);
  const trueCount = new Int32Array(m);
  // The violated list is violated[1 .. unsat] with position[c] its slot; slots 0 and unsat + 1 are scratch for
  // the branch-free updates below.
  const violated = new Int32Array(m + 2);
  const position = new Int32Array(m);
  const removed = new Int32Array(f.maxOccurrences + 1);
  const key = trialKey(options.seed);
  const stop = options.stop;
  const tally = new RunLengthTally(trials);
  let censored = false;
  let sincePoll = WALK_POLL_INTERVAL; // poll before the first trial

  trialLoop: for (let t = firstTrial; t < firstTrial + trials; t++) {
    if (++sincePoll >= WALK_POLL_INTERVAL) {
      sincePoll = 0;
      if (stopRequested(stop)) {
        censored = true;
        break;
      }
    }
    const rng = trialRng(key, t);
    let flips = 0;
    let unsat = 0;
    let trialBest = Infinity;
    // One pass a start: a single one unless restartFlips < maxFlips.
    for (;;) {
      // 1. Uniform random start, 32 variables per draw.
      randomAssignment(rng, value);

      // 2. True-literal counts and the violated list, built once per start. Branch-free: (value ^ code ^ 1) & 1 is 1
      // when the literal is true, and every clause is written to the slot after the list, which advances only
      // when the clause is violated (a branch mispredicts on a random start; this rebuild was 22% of a 3n-flip
      // trial at n = 28). 3-SAT gets an unrolled copy: measured 950 → 585 ns a rebuild, 1.14 → 1.20e7 steps/s.
      unsat = 0;
      if (k === 3) {
        for (let c = 0, i = 0; c < m; c++, i += 3) {
          const a = clauseLiterals[i];
          const b = clauseLiterals[i + 1];
          const d = clauseLiterals[i + 2];
          const count = ((value[a >> 1] ^ a ^ 1) & 1) + ((value[b >> 1] ^ b ^ 1) & 1) + ((value[d >> 1] ^ d ^ 1) & 1);
          trueCount[c] = count;
          violated[unsat + 1] = c;
          position[c] = unsat + 1;
          unsat += (count - 1) >>> 31;
        }
      } else {
        for (let c = 0; c < m; c++) {
          let count = 0;
          for (let i = clauseStart[c]; i < clauseStart[c + 1]; i++) {
            const code = clauseLiterals[i];
            count += (value[code >> 1] ^ code ^ 1) & 1;
          }
          trueCount[c] = count;
          violated[unsat + 1] = c;
          position[c] = unsat + 1;
          unsat += (count - 1) >>> 31;
        }
      }

      // 3. The walk, up to the next restart or the cap. A stopped trial is dropped.
      if (unsat < trialBest) trialBest = unsat;
      const limit = Math.min(flips + restartFlips, maxFlips);
      while (unsat > 0 && flips < limit) {
        if (++sincePoll >= WALK_POLL_INTERVAL) {
          sincePoll = 0;
          if (stopRequested(stop)) {
            censored = true;
            break trialLoop;
          }
        }
        let code: number;
        if (k > 0) {
          // One draw for clause and literal: half the generator calls (measured 1.12 → 1.20e7 steps/s).
          const j = rng.below(unsat * k);
          const q = (j * invK) | 0;
          code = clauseLiterals[k * violated[q + 1] + j - k * q];
        } else {
          const c = violated[rng.below(unsat) + 1];
          const from = clauseStart[c];
          code = clauseLiterals[from + rng.below(clauseStart[c + 1] - from)];
        }
        const v = code >> 1;
        const now = value[v] ^ 1;
        value[v] = now;
        // Literals of v with the new value became true, the others false. Both loops are branch-free: the
        // first only counts and collects the clauses that stop being violated (at least the chosen one), which
        // are then removed in that order; the second writes every clause to the slot after the list and
        // advances it when the clause became violated. Measured against the branching version with the same
        // draws: 0.88 → 1.20e7 steps/s.
        const up = 2 * v + now;
        let nRemoved = 0;
        for (let i = occurrenceStart[up], end = occurrenceStart[up + 1]; i < end; i++) {
          const d = occurrences[i];
          const count = trueCount[d];
          trueCount[d] = count + 1;
          removed[nRemoved] = d;
          nRemoved += (count - 1) >>> 31;
        }
        for (let r = 0; r < nRemoved; r++) {
          const d = removed[r];
          const last = violated[unsat--];
          const p = position[d];
          violated[p] = last;
          position[last] = p;
        }
        const down = up ^ 1;
        for (let i = occurrenceStart[down], end = occurrenceStart[down + 1]; i < end; i++) {
          const d = occurrences[i];
          const count = trueCount[d] - 1;
          trueCount[d] = count;
          violated[unsat + 1] = d;
          position[d] = unsat + 1;
          unsat += (count - 1) >>> 31;
        }
        flips++;
        if (unsat < trialBest) trialBest = unsat;
      }
      if (unsat === 0 || flips >= maxFlips) break;
    }
    const solved = unsat === 0 && empty === 0;
    tally.add(flips, solved, trialBest + empty);
  }
  return {
    trials: tally.done, successes: tally.successes, work: tally.work, best: tally.best, censored,
    runLengths: tally.runLengths(maxFlips),
  };
}

function checkCount(name: string, value: number): void {
  if (!Number.isSafeInteger(value) || value < 0) throw new RangeError(`${name} must be an integer ≥ 0, got ${value}`);
}

/** Settings of the walk on the registry: none beyond the run length (flips per trial). */
export type WalkSettings = Readonly<Record<string, never>>;

/**
 * Schöning's walk on the solver registry (solvers/registry.ts). Run length = maximum flips per trial
 * (`--walk-flips` K·n, default 3n); every trial reports its flips to solution (`stepsToSolution`, −1 when censored
 * at that cap), so success and TTS at any shorter cut-off follow from one cell (harness/stats/run-length.ts).
 */
export const walkSolver: TrialsSolver<WalkSettings> = {
  name: "walk",
  kind: "trials",
  description: "Schöning's random walk: random start, up to K·n flips of a variable of a violated clause, restart; records flips to solution per trial",
  options: ["walk-flips", "trials"],
  runLengthUnit: "flips",
  defaultFor: ["cnf"],
  appliesTo: (target) => (target.kind === "cnf" ? null : `walk (Schöning) applies to k-SAT/CNF families only, not '${target.family}'`),
  skipReason: (truth) => (truth.optimum > 0 ? "not applicable: unsatisfiable, and Schöning's walk only finds models" : null),
  runLengths: (n, study) => [Number(study.options["walk-flips"]) * n],
  settings: () => ({}),
  run(problem, input) {
    if (problem.kind !== "cnf") throw new Error("walk applies to CNF instances only");
    const r = walkTrials(problem.cnf, { trials: input.trials, maxFlips: input.runLength, seed: input.seed, stop: input.stop, firstTrial: 0 });
    return { trials: r.trials, successes: r.successes, work: r.work, best: r.best, censored: r.censored, stepsToSolution: stepsToSolution(r.runLengths) };
  },
};
