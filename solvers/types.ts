/**
 * The interface every classical solver shares. Solvers are pure: no clock, console, file or Math.random;
 * they get a seed and a stop flag and return counts. The worker measures wall time around them.
 */
import type { Problem } from "../harness/model/problem.js";
import type { RunLengths } from "../harness/types.js";

/**
 * Cooperative stop flag for budgets: an Int32Array view of a SharedArrayBuffer (length ≥ 1). Element 0
 * non-zero means "stop now"; solvers poll it with Atomics.load every few thousand steps and return what
 * they have, marked censored. `null` = never stop.
 */
export type StopFlag = Int32Array | null;

/** True when the stop flag has been raised. */
export function stopRequested(stop: StopFlag): boolean {
  return stop !== null && Atomics.load(stop, 0) !== 0;
}

/** Result of exact enumeration over all (or a slice of the) 2^n configurations. */
export interface ExactResult {
  /** Minimum cost found (violated clauses, or energy); +Infinity when the slice was stopped before any. */
  readonly optimum: number;
  /** Number of configurations reaching the optimum (mirror partners counted). */
  readonly degeneracy: number;
  /** Configurations covered (2^n for a complete run, mirrors counted). */
  readonly assignments: number;
  /**
   * Configurations actually evaluated (the work really done): lanes of evaluated blocks summed over passes for
   * the pruning CNF kernel, visited configurations for the spin kernel (a mirror pair counts once).
   */
  readonly evaluated: number;
  /** False when the stop flag cut the enumeration short. */
  readonly complete: boolean;
  // --- issue 16 (exact counting): set by solvers/exact-cnf-truth.ts, absent for enumeration ---
  /** How the truth was computed: "count" (model counter) or "maxsat" (branch and bound); absent = enumeration. */
  readonly method?: "count" | "maxsat";
  /** The degeneracy as an exact decimal (it may exceed 2^53, where `degeneracy` is rounded). */
  readonly degeneracyExact?: string;
  /** Decisions made by the counting methods. */
  readonly nodes?: number;
  // --- end issue 16 ---
}

/** Result of many independent trials of a randomised solver on one instance at one run length. */
export interface TrialsResult {
  /** Trials started and finished (a stopped trial is not counted). */
  readonly trials: number;
  /** Trials that reached the target cost (the exact optimum from ground truth). */
  readonly successes: number;
  /** Elementary steps over all finished trials (flips for the walk, flip attempts for annealing). */
  readonly work: number;
  /** Lowest cost seen over all trials. */
  readonly best: number;
  /** True when the stop flag cut the run short. */
  readonly censored: boolean;
}

// ---------------------------------------------------------------------------------------------------------
// The solver registry's interface (issue 11). A solver is one file exporting one object of type
// {@link TrialsSolver} or {@link ExactSolver}, plus one line in solvers/registry.ts. The engine and the worker
// ask the registry; nothing outside the solver's own file names it.
// ---------------------------------------------------------------------------------------------------------

/** The two kinds of model the tool computes on (see harness/model/problem.ts). */
export type ProblemKind = "cnf" | "ising";

/** What a solver may ask about a study before any instance exists (to decide whether it applies). */
export interface SolverTarget {
  /** Family name (for messages only: decide on `kind`, never on the family's name). */
  readonly family: string;
  readonly kind: ProblemKind;
}

/** A value a method option can take once resolved (serialisable: it crosses the worker boundary). */
export type OptionValue = number | string | boolean | null | ReadonlyArray<number>;

/**
 * The resolved study options a solver reads, keyed by the option-table name without the leading dashes
 * (`walk-flips`, `anneal-sweeps`, `anneal-cooling`, `anneal-beta`, `spectral-b`, `spectral-eta`, …). Filled by the
 * engine from the frozen spec (engine/study.ts `methodOptionsOf`; the anneal range arrives as inverse temperatures).
 */
export type MethodOptions = Readonly<Record<string, OptionValue>>;

/** What the engine knows when it plans the cells of a randomised solver on one instance. */
export interface SolverStudy {
  /** Independent trials per instance and run length (`--trials`). */
  readonly trials: number;
  /** Resolved method options (see {@link MethodOptions}). */
  readonly options: MethodOptions;
}

/** Input of one {@link TrialsSolver.run}: everything is data, nothing is read from the environment. */
export interface TrialsInput<S> {
  /** Trials to run, an integer ≥ 0 (trial t draws only from trialRng(seed, t) of solvers/trial-seeds.ts). */
  readonly trials: number;
  /** The run length of this cell, in the solver's own unit (flips per trial, sweeps, …). */
  readonly runLength: number;
  /** Cell seed (derived by the study from master seed, family, n, instance, solver and run length). */
  readonly seed: string;
  /** Exact optimum from ground truth: success = reaching it (within `tolerance`). */
  readonly target: number;
  /** Absolute cost tolerance for success (0.5 for CNF, rounding scale for Ising energies). */
  readonly tolerance: number;
  /** Solver settings from {@link TrialsSolver.settings}, resolved once per study. */
  readonly settings: S;
  /** Cooperative stop flag; poll it every few thousand steps and return what you have, marked censored. */
  readonly stop: StopFlag;
}

/**
 * Result of a randomised solver's cell: the counts every solver reports plus optional extras. New optional
 * fields may be added here without touching existing solvers; the engine copies `extra` into the journal row.
 */
export interface TrialsOutcome extends TrialsResult {
  /**
   * Per-trial run-length distribution: steps to solution of each finished trial, in the run length's unit,
   * or −1 when the trial did not succeed within its cap (censored at `runLength`). Optional.
   */
  readonly stepsToSolution?: ReadonlyArray<number>;
  /** Replica-exchange acceptance rate per neighbouring pair of temperatures (tempering). Optional. */
  readonly exchangeAcceptance?: ReadonlyArray<number>;
  /**
   * Further scalar results written beside the counts into the journal (and runs.csv where the report knows
   * them), e.g. the annealer's temperature range. Keys are snake_case column names with units.
   */
  readonly extra?: Readonly<Record<string, number | string | boolean | null>>;
}

/**
 * A run-length distribution as {@link TrialsOutcome.stepsToSolution}: each trial's flips when solved, −1 when not
 * (the inverse of harness/stats/run-length.ts `runLengthsFromSteps`).
 */
export function stepsToSolution(rld: RunLengths): number[] {
  return Array.from(rld.flips, (flips, t) => (rld.solved[t] === 1 ? flips : -1));
}

/**
 * A randomised solver: independent trials at one run length per cell, success = reaching the known optimum.
 * @typeParam S - its resolved settings (plain data: they travel to the worker inside the task).
 */
export interface TrialsSolver<S = MethodOptions> {
  /** Name on the command line (`--solvers`), in the journal and in the CSV `solver` column. */
  readonly name: string;
  readonly kind: "trials";
  /** One line for `--help`. */
  readonly description: string;
  /** Option-table names this solver reads (for `--help` grouping and the manifest). */
  readonly options: ReadonlyArray<string>;
  /** The unit of its run length and of `work` (e.g. "flips", "sweeps"). */
  readonly runLengthUnit: string;
  /**
   * The model kinds on which it is part of the default `--solvers` (absent = never by default). The default list
   * of a study is the ground-truth solver plus every registered solver naming the study's kind here.
   */
  readonly defaultFor?: ReadonlyArray<ProblemKind>;
  /** Null when the solver applies to the study's instances, else the reason it does not (one line). */
  appliesTo(target: SolverTarget): string | null;
  /**
   * Null when the solver can be scored on an instance with this ground truth, else why not: such cells are
   * journalled as "skipped" (e.g. Schöning's walk on an unsatisfiable formula can only find models).
   */
  skipReason(truth: { readonly kind: ProblemKind; readonly optimum: number }): string | null;
  /** The run lengths to measure on an instance of size n (one cell each). */
  runLengths(n: number, study: SolverStudy): number[];
  /** Its settings, from the resolved study options (computed once per task; must be plain data). */
  settings(study: SolverStudy): S;
  /**
   * Optional instance-dependent set-up, run by the worker before it starts the clock (e.g. the annealer's
   * temperature range derived from the instance). Pure; returns the settings `run` receives.
   */
  prepare?(problem: Problem, settings: S): S;
  /** The pure computation: no clock, console, file or Math.random. The worker times the call. */
  run(problem: Problem, input: TrialsInput<S>): TrialsOutcome;
}

/**
 * An exact solver: the ground truth (optimum and its degeneracy) of an instance, split into parts that the
 * pool may run in parallel, then merged. Exhaustive enumeration is one; a model counter can be another.
 * @typeParam Part - one part of the work (plain data: it travels to the worker inside the task).
 */
export interface ExactSolver<Part = unknown> {
  readonly name: string;
  readonly kind: "exact";
  readonly description: string;
  /**
   * Largest size it accepts for a model kind (checked once at the edge, before any instance exists).
   * @param flipSymmetric - every instance is invariant under the global flip (halves the work of some methods).
   */
  maxSize(kind: ProblemKind, flipSymmetric: boolean): number;
  /** Splits the work of one instance over `workers` workers. */
  plan(problem: Problem, workers: number): Part[];
  /** The pure computation of one part. */
  run(problem: Problem, part: Part, stop: StopFlag): ExactResult;
  /**
   * Optional: the smallest part of the same shape as `part` (a zero-length run, e.g. one configuration), whose
   * {@link run} the worker times to measure the fixed per-call cost (issue 13, the fixed-cost floor). Without
   * it the floor is not measured (null).
   */
  leastPart?(problem: Problem, part: Part): Part;
  /** Joins the parts' results. */
  merge(results: ReadonlyArray<ExactResult>, tolerance: number): ExactResult;
}

/** Any registered solver. */
export type Solver = TrialsSolver<any> | ExactSolver<any>; // eslint-disable-line @typescript-eslint/no-explicit-any
