/**
 * The exact (ground-truth) solvers, by name: the part of the solver registry (registry.ts) that `solve` needs. It
 * imports no randomised solver, so the one-file command loads only the code that computes its answer
 * (issue 16: start-up of `solve`). registry.ts lists these first, then the randomised ones.
 */
import { COUNT_SWITCH_VARIABLES, countSolver } from "./exact-cnf-truth.js";
import { exhaustiveSolver } from "./exhaustive.js";
import type { ExactSolver, ProblemKind } from "./types.js";

/** The same exact solver with its CNF limit lowered to `n` (the size where the next exact solver takes over). */
function capCnf<P>(solver: ExactSolver<P>, n: number): ExactSolver<P> {
  return { ...solver, maxSize: (kind, flipSymmetric) => (kind === "cnf" ? Math.min(n, solver.maxSize(kind, flipSymmetric)) : solver.maxSize(kind, flipSymmetric)) };
}

/**
 * Every exact solver, in registry order. Ground truth is the first one whose limit allows n (see
 * {@link groundTruthSolver}): CNF formulas are enumerated up to n = COUNT_SWITCH_VARIABLES, where enumeration is
 * as fast as counting, and counted beyond.
 */
export const EXACT_SOLVERS: ReadonlyArray<ExactSolver<any>> = [capCnf(exhaustiveSolver, COUNT_SWITCH_VARIABLES), countSolver]; // eslint-disable-line @typescript-eslint/no-explicit-any

/** Names of the exact (ground-truth) solvers: they always run, so `--solvers` may name them but never schedules them. */
export const EXACT_SOLVER_NAMES: ReadonlyArray<string> = EXACT_SOLVERS.map((s) => s.name);

/** The exact solver of that name; throws when there is none. */
export function exactSolverNamed(name: string): ExactSolver<any> { // eslint-disable-line @typescript-eslint/no-explicit-any
  const s = EXACT_SOLVERS.find((x) => x.name === name);
  if (!s) throw new Error(`no exact solver named '${name}'`);
  return s;
}

/**
 * The exact solver that computes the ground truth of a problem: the first registered one whose limit allows
 * it; beyond every limit, the one with the largest limit (whose refusal names that limit).
 */
export function groundTruthSolver(kind: ProblemKind, flipSymmetric: boolean, n: number): ExactSolver<any> { // eslint-disable-line @typescript-eslint/no-explicit-any
  let widest: ExactSolver<any> | null = null; // eslint-disable-line @typescript-eslint/no-explicit-any
  for (const s of EXACT_SOLVERS) {
    if (n <= s.maxSize(kind, flipSymmetric)) return s;
    if (widest === null || s.maxSize(kind, flipSymmetric) > widest.maxSize(kind, flipSymmetric)) widest = s;
  }
  return widest ?? exhaustiveSolver;
}
