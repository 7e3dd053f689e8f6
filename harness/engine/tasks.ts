/**
 * Messages between the run loop and the workers. Tasks carry only seeds, names and small numbers; the worker
 * regenerates the instance (DESIGN.md §3: never ship big arrays) and finds the method on its registry.
 */
import type { InstanceContext } from "../families/registry.js";
import type { ExactResult, MethodOptions, TrialsOutcome } from "../../solvers/types.js";
import type { PredictionParts } from "../predict/types.js";

/** One part of the ground truth of an instance, by an exact solver of the registry. */
export interface TruthSliceTask {
  readonly type: "truth-slice";
  readonly ctx: InstanceContext;
  /** Exact solver name (solvers/registry.ts). */
  readonly solver: string;
  /** The part, as the solver's `plan` made it (plain data). */
  readonly part: unknown;
  /** Int32Array on a SharedArrayBuffer: element 0 non-zero = stop; element 1 set by the worker when it starts. */
  readonly stop: Int32Array;
}

/** Trials of a randomised solver of the registry at one run length. */
export interface TrialsTask {
  readonly type: "trials";
  readonly ctx: InstanceContext;
  /** Randomised solver name (solvers/registry.ts). */
  readonly solver: string;
  readonly runLength: number;
  readonly trials: number;
  readonly seed: string;
  /** Exact optimum from ground truth: success = reaching it. */
  readonly target: number;
  /** The solver's settings (its `settings(study)`, plain data). */
  readonly settings: unknown;
  readonly stop: Int32Array;
}

/** A predictor's worker-side numerics at one parameter value. */
export interface PredictTask {
  readonly type: "predict";
  readonly ctx: InstanceContext;
  /** Predictor name (harness/predict/registry.ts). */
  readonly predictor: string;
  readonly param: number;
  readonly options: MethodOptions;
  readonly optimum: number;
  readonly stop: Int32Array;
}

export type Task = TruthSliceTask | TrialsTask | PredictTask;

/** Worker answer to a truth slice (the instance descriptors come along for instances.csv). */
export interface TruthSliceAnswer {
  readonly result: ExactResult;
  readonly wall_ns: number;
  /**
   * When the slice started: process.hrtime.bigint() as decimal digits (one monotonic clock for every thread of the
   * process), so the cell's elapsed time runs from its first slice's start to its last slice's end.
   */
  readonly start_ns: string;
  /** Fixed cost of the call: the same kernel on a one-configuration slice, timed after the real call; null if it failed. */
  readonly floor_ns: number | null;
  readonly meta: Readonly<Record<string, number | string | boolean>>;
  readonly seed: string;
  /** Exact mean cost over all configurations (spectral normalisation, reports). */
  readonly mean: number;
}

/** Worker answer to a trials task. */
export interface TrialsAnswer {
  readonly result: TrialsOutcome;
  readonly wall_ns: number;
  /** Fixed cost of the cell: the same solver call with zero trials, timed after the real call; null if it failed. */
  readonly floor_ns: number | null;
}

/** Worker answer to a predict task: the predictor's columns. */
export interface PredictAnswer {
  readonly row: PredictionParts;
  readonly wall_ns: number;
}
