/**
 * A resolved study and its expansion into cells. A cell is the unit the journal records: the exact ground
 * truth of one instance (which is also the exhaustive solver's timed run), one randomised solver at one run
 * length on one instance, or one spectral computation on one instance. Every cell carries its own seed,
 * derived from the master seed and what identifies it, so results never depend on worker count, order or shard.
 */
import type { FamilyParams } from "../families/types.js";
import { canonicalParams } from "../families/params.js";
import { deriveSeed } from "../random.js";
import type { CostModelSettings } from "../predict/cost-table.js";
import { familyNamed } from "../families/registry.js";
import { predictorNamed } from "../predict/registry.js";
import { trialsSolverNamed } from "../../solvers/registry.js";
import type { MethodOptions, SolverStudy } from "../../solvers/types.js";

/** A study after validation: frozen and complete (defaults filled in). Written to spec.json and the manifest. */
export interface StudySpec {
  readonly family: string;
  /** Parameters that determine the instances (hashed into instance seeds). */
  readonly familyParams: FamilyParams;
  /** Sizes to run (generated families), ascending. */
  readonly sizes: ReadonlyArray<number>;
  readonly instances: number;
  readonly seed: string;
  /** For folder families: the files, sorted, with their sizes. */
  readonly files: ReadonlyArray<{ readonly file: string; readonly n: number }>;
  readonly solvers: ReadonlyArray<string>;
  readonly trials: number;
  /** Walk: flips per trial = walkFlipsPerVariable · n. */
  readonly walkFlipsPerVariable: number;
  readonly sweeps: ReadonlyArray<number>;
  readonly schedule: "linear" | "geometric";
  /** Anneal inverse-temperature range, or null for the instance-derived default. */
  readonly beta: readonly [number, number] | null;
  readonly predictors: ReadonlyArray<string>;
  readonly spectral: { readonly bValues: ReadonlyArray<number>; readonly eta: number };
  readonly costModel: CostModelSettings;
  /** Report settings; floorFactor is absent in spec.json files written before it existed (default 10). */
  readonly report: { readonly fitFrom: number | null; readonly resamples: number; readonly floorFactor?: number };
}

/** One instance of the study: what a worker needs to regenerate it. */
export interface InstanceRef {
  readonly n: number;
  readonly index: number;
  /** Source file for folder families, else "". */
  readonly file: string;
}

/** What a cell computes: ground truth, a randomised solver's trials, or a predictor's numerics. */
export type CellKind = "truth" | "run" | "predict";

/** A unit of work and of journalling. */
export interface Cell {
  /** Unique, stable key: the journal records it; resume skips it. */
  readonly key: string;
  readonly kind: CellKind;
  readonly instance: InstanceRef;
  /** Solver name (runs, truth) or predictor name (predict). */
  readonly method: string;
  /** Run length (walk flips per trial, anneal sweeps) or b for spectral; null for truth. */
  readonly runLength: number | null;
  readonly seed: string;
}

/** The instances of a study in order (by n, then index). */
export function instancesOf(spec: StudySpec): InstanceRef[] {
  if (spec.files.length > 0) {
    const seen = new Map<number, number>();
    const out: InstanceRef[] = [];
    for (const f of spec.files) {
      const index = seen.get(f.n) ?? 0;
      seen.set(f.n, index + 1);
      out.push({ n: f.n, index, file: f.file });
    }
    return out.sort((a, b) => a.n - b.n || a.index - b.index);
  }
  const out: InstanceRef[] = [];
  for (const n of spec.sizes) for (let index = 0; index < spec.instances; index++) out.push({ n, index, file: "" });
  return out;
}

/** Seed of a cell: hash of master seed, family parameters, n, instance, method and run length. */
export function cellSeed(spec: StudySpec, inst: InstanceRef, method: string, runLength: number | null): string {
  return deriveSeed(spec.seed, spec.family, canonicalParams(spec.familyParams), inst.n, inst.index, method, runLength ?? "");
}

/** Key of the truth cell of an instance. */
export function truthKey(inst: InstanceRef): string {
  return `truth|${inst.n}|${inst.index}`;
}

/** All cells of one instance, truth first (the other cells need its optimum). */
export function cellsOfInstance(spec: StudySpec, inst: InstanceRef): Cell[] {
  const cells: Cell[] = [
    { key: truthKey(inst), kind: "truth", instance: inst, method: "exhaustive", runLength: null, seed: cellSeed(spec, inst, "exhaustive", null) },
  ];
  const target = { family: spec.family, kind: familyNamed(spec.family).kind };
  const study = solverStudyOf(spec);
  for (const name of spec.solvers) {
    const solver = trialsSolverNamed(name);
    if (solver.appliesTo(target) !== null) continue;
    for (const len of solver.runLengths(inst.n, study)) cells.push(runCell(spec, inst, name, len));
  }
  for (const name of spec.predictors) {
    const cell = predictorNamed(name).cell;
    if (!cell) continue;
    for (const v of cell.params(study.options)) {
      cells.push({ key: `${name}|${inst.n}|${inst.index}|${v}`, kind: "predict", instance: inst, method: name, runLength: v, seed: cellSeed(spec, inst, name, v) });
    }
  }
  return cells;
}

/**
 * The resolved method options of a study, keyed by option-table name, as solvers and predictors read them.
 * (The spec keeps its historical field names so that spec.json, compared as text on resume, does not change.)
 */
export function methodOptionsOf(spec: StudySpec): MethodOptions {
  return {
    "walk-flips": spec.walkFlipsPerVariable,
    "anneal-sweeps": spec.sweeps,
    "anneal-cooling": spec.schedule,
    "anneal-beta": spec.beta,
    "spectral-b": spec.spectral.bValues,
    "spectral-eta": spec.spectral.eta,
  };
}

/** What a randomised solver sees of a study. */
export function solverStudyOf(spec: StudySpec): SolverStudy {
  return { trials: spec.trials, options: methodOptionsOf(spec) };
}

function runCell(spec: StudySpec, inst: InstanceRef, solver: string, runLength: number): Cell {
  return { key: `run|${inst.n}|${inst.index}|${solver}|${runLength}`, kind: "run", instance: inst, method: solver, runLength, seed: cellSeed(spec, inst, solver, runLength) };
}

/**
 * Splits the instances into `count` balanced shards by expected work (2^n, the exact parts dominate),
 * deterministically: largest first, each to the currently lightest shard, ties to the lowest shard number.
 * Whole instances go to one shard, so a shard never needs another shard's ground truth.
 * @returns the instances of shard `k` (1-based), in run order.
 */
export function shardInstances(all: ReadonlyArray<InstanceRef>, k: number, count: number): InstanceRef[] {
  const load = new Array<number>(count).fill(0);
  const owner = new Map<InstanceRef, number>();
  const order = [...all].sort((a, b) => b.n - a.n || a.index - b.index || a.file.localeCompare(b.file));
  for (const inst of order) {
    let best = 0;
    for (let s = 1; s < count; s++) if (load[s] < load[best]) best = s;
    load[best] += 2 ** inst.n;
    owner.set(inst, best + 1);
  }
  return all.filter((inst) => owner.get(inst) === k);
}
