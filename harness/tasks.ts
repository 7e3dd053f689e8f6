/**
 * Messages between the run loop and the workers. Tasks carry only seeds and small numbers; the worker
 * regenerates the instance (DESIGN.md §3: never ship big arrays).
 */
import type { InstanceContext } from "./families/registry.js";
import type { Slice } from "../solvers/exhaustive.js";
import type { ExactResult, TrialsResult } from "../solvers/types.js";

/** Exact enumeration of one slice of an instance. */
export interface TruthSliceTask {
  readonly type: "truth-slice";
  readonly ctx: InstanceContext;
  readonly slice: Slice;
  /** Int32Array on a SharedArrayBuffer: element 0 non-zero = stop; element 1 set by the worker when it starts. */
  readonly stop: Int32Array;
}

/** Trials of a randomised solver at one run length. */
export interface TrialsTask {
  readonly type: "trials";
  readonly ctx: InstanceContext;
  readonly solver: "walk" | "anneal" | "breakwalk" | "tempering";
  readonly runLength: number;
  readonly trials: number;
  readonly seed: string;
  /** Exact optimum from ground truth: success = reaching it. */
  readonly target: number;
  readonly schedule: "linear" | "geometric";
  readonly beta: readonly [number, number] | null;
  /** Breakwalk's rule (nulls = defaults) and tempering's replicas and range; absent for the other solvers. */
  readonly breakwalk?: { readonly rule: "poly" | "exp" | null; readonly cb: number | null; readonly eps: number | null };
  readonly tempering?: { readonly replicas: number; readonly beta: readonly [number, number] | null };
  readonly stop: Int32Array;
}

/** Spectral numerics at one b. */
export interface SpectralTask {
  readonly type: "spectral";
  readonly ctx: InstanceContext;
  readonly b: number;
  readonly eta: number;
  readonly optimum: number;
  readonly stop: Int32Array;
}

export type Task = TruthSliceTask | TrialsTask | SpectralTask;

/** Worker answer to a truth slice (the instance descriptors come along for instances.csv). */
export interface TruthSliceAnswer {
  readonly result: ExactResult;
  readonly wall_ns: number;
  readonly meta: Readonly<Record<string, number | string | boolean>>;
  readonly seed: string;
  /** Exact mean cost over all configurations (spectral normalisation, reports). */
  readonly mean: number;
}

/** Worker answer to a trials task. */
export interface TrialsAnswer {
  readonly result: TrialsResult;
  readonly wall_ns: number;
  /** Anneal: the inverse-temperature range used and the rule that chose it. */
  readonly beta_start: number | null;
  readonly beta_end: number | null;
  /** Solver-specific columns for runs.csv (breakwalk: run-length summary; tempering: exchange acceptance). */
  readonly details?: Readonly<Record<string, number | string | null>>;
  /** Breakwalk: flips to solution per trial, −1 where censored at the cap (kept in the journal for per-size RLDs). */
  readonly rld?: ReadonlyArray<number>;
}

/** Worker answer to a spectral task: the predictor's columns. */
export interface SpectralAnswer {
  readonly row: Readonly<Record<string, number | string | boolean | null>>;
  readonly wall_ns: number;
}
