/**
 * The predictor registry's interface (issue 11). A quantum predictor is one file exporting one
 * {@link Predictor} plus one line in harness/predict/registry.ts. Predictors are pure: they get numbers (ground
 * truth, measured success probabilities) or a problem and a stop flag, and return query counts and their parts;
 * never a clock, console, file or Math.random.
 *
 * Two ways to predict, a predictor may use either:
 * - closed form, evaluated when the tables are rebuilt from the journal ({@link Predictor.fromTruth},
 *   {@link Predictor.fromTrials}): cheap, no cell of its own, recomputed whenever the journal changes;
 * - numerics in the worker ({@link Predictor.cell}): one journalled cell per instance and parameter value.
 */
import type { Problem } from "../model/problem.js";
import type { MethodOptions, ProblemKind, SolverTarget, StopFlag } from "../../solvers/types.js";

/** A prediction's columns: `queries` (and `queries_log2`, `queries_low`, `queries_high`) plus its own parts. */
export type PredictionParts = Readonly<Record<string, number | string | boolean | null>>;

/** The ground truth of one instance, as closed-form predictors see it. */
export interface TruthView {
  readonly n: number;
  readonly kind: ProblemKind;
  readonly optimum: number;
  /** Number of configurations at the optimum (M of N = 2^n). */
  readonly degeneracy: number;
}

/** One measured cell of a randomised solver, as amplification predictors see it. */
export interface TrialsView {
  readonly n: number;
  readonly solver: string;
  readonly runLength: number;
  /** Per-trial success probability and its Wilson 95% interval. */
  readonly p: number;
  readonly pLow: number | undefined;
  readonly pHigh: number | undefined;
  /** Elementary steps per trial (flips, spin-update attempts). */
  readonly workPerTrial: number | undefined;
}

/** Input of one worker-side prediction (one cell). */
export interface PredictorCellInput {
  /** The parameter value of this cell (e.g. the filter strength b of the spectral method). */
  readonly param: number;
  /** Exact optimum from ground truth. */
  readonly optimum: number;
  /** Resolved method options (`spectral-eta`, …) keyed by option-table name. */
  readonly options: MethodOptions;
  readonly stop: StopFlag;
}

/** What the edge knows of a study's instances at size n when it checks a cell's memory (no instance exists yet). */
export interface CellSizeTarget {
  readonly kind: ProblemKind;
  /** Every instance is invariant under the global flip (only even-order terms). */
  readonly flipSymmetric: boolean;
  /** CNF: clauses per instance at this size when the family fixes it; null when instances may differ (folders). */
  readonly clauses: number | null;
}

/** The memory one cell needs against the allowance it runs under. */
export interface CellMemory {
  /** Bytes one cell at this size needs. */
  readonly needed: number;
  /** Bytes allowed (the option's value, or its machine-dependent default). */
  readonly allowed: number;
  /** How `needed` is made up, for messages (e.g. "49 bytes per amplitude × 2^26"). */
  readonly detail: string;
  /** The option-table name that sets the allowance. */
  readonly option: string;
}

/**
 * Worker-side numerics of a predictor: one cell per instance and parameter value. A cell whose numerics do not
 * apply to one instance returns `status: "skipped"` and a one-line `reason` among its parts; the engine records
 * the cell as skipped with that reason.
 */
export interface PredictorCell {
  /** Name of the cell parameter in predictions.csv (e.g. "b"). */
  readonly param: string;
  /**
   * False when the parameter is a numerical setting (e.g. the adiabatic grid), not a run length the report picks
   * the best of per size: its rows then carry no run length and the run-length rules do not apply. Default true.
   */
  readonly scanned?: boolean;
  /** The parameter values to compute for a study (e.g. the b scan). */
  params(options: MethodOptions): number[];
  /** Largest n the numerics accept for a problem (checked at the edge). */
  maxSize(kind: ProblemKind, flipSymmetric: boolean): number;
  /**
   * Memory of one cell at size n under the study's options, for numerics bounded by memory rather than by a fixed
   * size: checked at the edge (the refusal names both figures) and printed before a study starts.
   */
  memory?(target: CellSizeTarget, n: number, options: MethodOptions): CellMemory;
  /** The pure computation. */
  run(problem: Problem, input: PredictorCellInput): PredictionParts;
}

/** A quantum predictor. */
export interface Predictor {
  /** Name in `--predict`, the journal and the CSV `predictor` column. */
  readonly name: string;
  /** One line for `--help`. */
  readonly description: string;
  /** Option-table names it reads. */
  readonly options: ReadonlyArray<string>;
  /** Name of the randomised solver whose measured trials it amplifies, if any (that solver must run). */
  readonly amplifies?: string;
  /** Null when it applies to the study's instances, else the reason it does not (one line). */
  appliesTo(target: SolverTarget): string | null;
  /** Closed form from the ground truth of an instance; null when it does not apply to this instance. */
  fromTruth?(truth: TruthView): PredictionParts | null;
  /** Closed form from one measured cell of the solver it {@link amplifies}. */
  fromTrials?(trials: TrialsView): PredictionParts;
  /** Worker-side numerics. */
  readonly cell?: PredictorCell;
  /**
   * The predictions.csv column its cost is fitted on when that is not a count of oracle queries (e.g. the adiabatic
   * time scale 1/gap²), and what it means. Such a measure has no like classical measure: the comparison shows its
   * exponent but rates it on neither basis, and it never enters the cost model's seconds.
   */
  readonly measure?: { readonly column: string; readonly meaning: string };
}
