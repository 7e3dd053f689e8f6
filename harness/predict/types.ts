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

/** Worker-side numerics of a predictor: one cell per instance and parameter value. */
export interface PredictorCell {
  /** Name of the cell parameter in predictions.csv (e.g. "b"). */
  readonly param: string;
  /** The parameter values to compute for a study (e.g. the b scan). */
  params(options: MethodOptions): number[];
  /** Largest n the numerics accept for a problem (checked at the edge). */
  maxSize(kind: ProblemKind, flipSymmetric: boolean): number;
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
}
