/**
 * The interface every classical solver shares. Solvers are pure: no clock, console, file or Math.random;
 * they get a seed and a stop flag and return counts. The worker measures wall time around them.
 */

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
