/**
 * Record types that flow from workers through the journal into the report. Field names are the CSV
 * column names (snake_case with units) so that tables are rebuilt from the journal without renaming.
 */

/**
 * Cell status: finished normally, stopped by a budget (value is a lower bound), failed, or not applicable
 * (Schöning's walk on an unsatisfiable instance: it can only find models).
 */
/** "wrong": an external solver gave an answer that failed its check (never a success; the run exits with 1). */
export type CellStatus = "ok" | "censored" | "error" | "skipped" | "wrong";

/** One row of instances.csv: an instance and its exact ground truth. */
export interface InstanceRow {
  family: string;
  n: number;
  instance: number;
  seed: string;
  /** Family-specific descriptors (clauses, density, planted, rejected_draws, edges, …). */
  [extra: string]: string | number | boolean | null;
}

/** One row of runs.csv: one solver on one instance at one run length. */
export interface RunRow {
  family: string;
  n: number;
  instance: number;
  solver: string;
  /** Run length parameter (sweeps for anneal, max flips per trial for walk, empty for exhaustive). */
  run_length: number | null;
  status: CellStatus;
  /**
   * Elapsed (wall-clock) time of the cell, ns: for exhaustive and the counting methods from the first slice's start
   * to the last slice's end over the parallel workers (empty for journals written before it was recorded); for a
   * solver's cell (one worker) the same as cpu_ns.
   */
  wall_ns: number | null;
  /** CPU time of the cell, ns: the sum over its parallel slices (exhaustive, counting), else its one worker's time. */
  cpu_ns: number;
  /**
   * Elementary work really done: assignments evaluated for exhaustive (pruned ones not counted; older journals:
   * assignments covered), flips for walk, flip attempts for anneal.
   */
  work: number;
  /** Fixed per-cell cost (the same call with zero-length work), ns; null when not measured. */
  floor_ns: number | null;
  trials: number | null;
  successes: number | null;
  /** Probability that one trial (one run of the solver at this run length) succeeds, and its Wilson 95% interval. */
  trial_success_p: number | null;
  trial_success_p_low: number | null;
  trial_success_p_high: number | null;
  work_per_trial: number | null;
  wall_ns_per_trial: number | null;
  /** Time to solution with 99% confidence, ns (CPU time: from cpu_ns), and its interval from trial_success_p's interval. */
  tts_ns: number | null;
  tts_ns_low: number | null;
  tts_ns_high: number | null;
  /** Work to solution with 99% confidence (elementary steps). */
  tts_work: number | null;
  /** Lower end of its interval (a lower bound when no trial succeeded). */
  tts_work_low: number | null;
  message: string;
  /**
   * Per-trial steps to solution (−1 = not solved within run_length) for solvers that record a run-length
   * distribution; read by the report's fine-grid run-length rule (report/run-length-grid.ts). Not a runs.csv
   * column (a CSV cell holds one value): rows built from the journal carry it as a non-enumerable property.
   */
  steps_to_solution?: ReadonlyArray<number>;
}

/** One row of predictions.csv: one quantum predictor on one instance. */
export interface PredictionRow {
  family: string;
  n: number;
  instance: number;
  predictor: string;
  status: CellStatus;
  /** Predicted oracle (or reversible-trial) queries; never a measured time. */
  queries: number | null;
  queries_log2: number | null;
  queries_low: number | null;
  queries_high: number | null;
  /** Predictor-specific parts (theta, k_star, amplification_rounds, gap, …; tables.ts names them), serialised as their own columns. */
  [extra: string]: string | number | boolean | null;
}

/**
 * A run-length distribution (RLD): flips to solution per trial of a randomised solver on one instance, a trial not
 * solved within its cap censored at the cap (solvers/breakwalk.ts and walk.ts make them; the statistics
 * that follow from one are in harness/stats/run-length.ts).
 */
export interface RunLengths {
  /** Flips of each trial: to the solution when solved, else the cap (the trial's full length). */
  readonly flips: Float64Array;
  /** 1 when the trial reached a solution within the cap, else 0 (censored). */
  readonly solved: Uint8Array;
  /** The cap every trial ran to at most (flips). */
  readonly cap: number;
}
