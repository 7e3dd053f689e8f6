/**
 * The ground-truth path shared by `run` (the truth cell of every instance) and `solve` (one file): the exact
 * solver of the registry that accepts the problem, its parts spread over the pool, then merged.
 */
import type { InstanceContext } from "../families/registry.js";
import { costTolerance, sizeOf, type Problem } from "../model/problem.js";
import { groundTruthSolver } from "../../solvers/registry.js";
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
