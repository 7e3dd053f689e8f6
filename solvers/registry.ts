/**
 * The solver registry: every classical solver the tool can run, by name. Adding a solver is one file
 * exporting a {@link TrialsSolver} (or {@link ExactSolver}) and one line in the list below; the option table,
 * `--help`, the study's cells, the worker and the tables then know it.
 */
import { annealSolver } from "./anneal.js";
import { exhaustiveSolver } from "./exhaustive.js";
import type { ExactSolver, ProblemKind, Solver, TrialsSolver } from "./types.js";
import { walkSolver } from "./walk.js";

/** Every registered solver, in the order `--help` lists them (the exact ground-truth solvers first). */
export const SOLVERS: ReadonlyArray<Solver> = [
  exhaustiveSolver,
  walkSolver,
  annealSolver,
];

/** Names of every registered solver. */
export const SOLVER_NAMES: ReadonlyArray<string> = SOLVERS.map((s) => s.name);

/** The randomised solver of that name; throws (an internal error: names are validated at the edge). */
export function trialsSolverNamed(name: string): TrialsSolver<any> { // eslint-disable-line @typescript-eslint/no-explicit-any
  const s = SOLVERS.find((x) => x.name === name);
  if (!s || s.kind !== "trials") throw new Error(`no randomised solver named '${name}'`);
  return s;
}

/** The exact solver of that name; throws when there is none. */
export function exactSolverNamed(name: string): ExactSolver<any> { // eslint-disable-line @typescript-eslint/no-explicit-any
  const s = SOLVERS.find((x) => x.name === name);
  if (!s || s.kind !== "exact") throw new Error(`no exact solver named '${name}'`);
  return s;
}

/** The exact solver that computes the ground truth of a problem: the first registered one whose limit allows it. */
export function groundTruthSolver(kind: ProblemKind, flipSymmetric: boolean, n: number): ExactSolver<any> { // eslint-disable-line @typescript-eslint/no-explicit-any
  for (const s of SOLVERS) if (s.kind === "exact" && n <= s.maxSize(kind, flipSymmetric)) return s;
  return exhaustiveSolver;
}
