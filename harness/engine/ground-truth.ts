/**
 * The ground-truth path shared by `run` (the truth cell of every instance) and `solve` (one file): the exact
 * solver of the registry that accepts the problem, its parts spread over the pool, then merged.
 */
import type { InstanceContext } from "../families/registry.js";
import { costTolerance, meanCost, sizeOf, type Problem } from "../model/problem.js";
import { groundTruthSolver } from "../../solvers/exact-registry.js";
import type { ExactResult } from "../../solvers/types.js";
import type { WorkerPool } from "./pool.js";
import type { TruthSliceAnswer } from "./tasks.js";

/** The merged exact result and the worker answers of its parts (they carry the instance's descriptors). */
export interface GroundTruth {
  readonly merged: ExactResult;
  readonly answers: ReadonlyArray<TruthSliceAnswer>;
  /** Name of the exact solver that computed it. */
  readonly solver: string;
}

/**
 * Computes the optimum and degeneracy of one instance on the pool.
 * @param problem - the instance (in this thread: the plan needs its kind and symmetry only).
 * @param ctx - how the workers regenerate or load it.
 * @param stop - the cell's stop flag (see engine/stop.ts).
 */
export async function computeGroundTruth(pool: WorkerPool, problem: Problem, ctx: InstanceContext, workers: number, stop: Int32Array): Promise<GroundTruth> {
  const exact = groundTruthSolver(problem.kind, false, sizeOf(problem));
  const parts = exact.plan(problem, workers);
  const answers = await Promise.all(parts.map((part) => pool.run<TruthSliceAnswer>({ type: "truth-slice", ctx, solver: exact.name, part, stop })));
  return { merged: exact.merge(answers.map((a) => a.result), costTolerance(problem)), answers, solver: exact.name };
}

/**
 * True when the ground truth of `problem` is one part on `workers` workers (small enumerations, counting):
 * then {@link computeGroundTruthHere} is faster than starting a pool, whose threads each load the registries
 * (`solve` of a counted 100-variable formula: 0.2–0.3 s less CPU, with the lazy command loading of
 * cli/commands/index.ts).
 */
export function groundTruthIsOnePart(problem: Problem, workers: number): boolean {
  return groundTruthSolver(problem.kind, false, sizeOf(problem)).plan(problem, workers).length === 1;
}

/**
 * The same ground truth computed in this thread, for a caller that has no pool and nothing else to do while
 * it runs (`solve`); `run` never uses it, since its cell limits and signals need the main thread free. The
 * answers carry no instance descriptors (the caller has the problem itself).
 */
export function computeGroundTruthHere(problem: Problem, workers: number, stop: Int32Array): GroundTruth {
  const exact = groundTruthSolver(problem.kind, false, sizeOf(problem));
  const answers: TruthSliceAnswer[] = exact.plan(problem, workers).map((part) => {
    const start = process.hrtime.bigint();
    const result = exact.run(problem, part, stop);
    return { result, wall_ns: Number(process.hrtime.bigint() - start), start_ns: String(start), floor_ns: null, meta: {}, seed: "", mean: meanCost(problem) };
  });
  return { merged: exact.merge(answers.map((a) => a.result), costTolerance(problem)), answers, solver: exact.name };
}

/**
 * Elapsed (wall-clock) time of a ground-truth cell, ns: from the first slice's start to the last slice's end over
 * the parallel workers (time a slice waited in the pool's queue before its start is not counted). The slices'
 * own times summed are the cell's CPU time (`wall_ns` of the truth record, runs.csv `cpu_ns`).
 */
export function slicesElapsed(answers: ReadonlyArray<TruthSliceAnswer>): number {
  let first = BigInt(answers[0].start_ns);
  let last = first + BigInt(Math.round(answers[0].wall_ns));
  for (const a of answers) {
    const start = BigInt(a.start_ns);
    const end = start + BigInt(Math.round(a.wall_ns));
    if (start < first) first = start;
    if (end > last) last = end;
  }
  return Number(last - first);
}
