/**
 * The solver registry: every classical solver the tool can run, by name. Adding a solver is one file
 * exporting a {@link TrialsSolver} (or {@link ExactSolver}) and one line in the list below; the option table,
 * `--help`, the study's cells, the worker and the tables then know it.
 */
import { annealSolver } from "./anneal.js";
import { breakwalkSolver } from "./breakwalk.js";
import { COUNT_SWITCH_VARIABLES, countSolver } from "./exact-cnf-truth.js";
import { exhaustiveSolver } from "./exhaustive.js";
import { temperingSolver } from "./tempering.js";
import type { ExactSolver, ProblemKind, Solver, TrialsSolver } from "./types.js";
import { walkSolver } from "./walk.js";

/** Every registered solver, in the order `--help` lists them (the exact ground-truth solvers first). */
export const SOLVERS: ReadonlyArray<Solver> = [
  // Ground truth is the first exact solver whose limit allows n (see groundTruthSolver): CNF formulas are
  // enumerated up to n = COUNT_SWITCH_VARIABLES, where enumeration is as fast as counting, and counted beyond.
  capCnf(exhaustiveSolver, COUNT_SWITCH_VARIABLES),
  countSolver,
  walkSolver,
  breakwalkSolver,
  annealSolver,
  temperingSolver,
];

/** Names of every registered solver. */
export const SOLVER_NAMES: ReadonlyArray<string> = SOLVERS.map((s) => s.name);

/**
 * The default `--solvers` of a study on a model kind: the exact ground-truth solvers (they always run), then every
 * randomised solver whose `defaultFor` names the kind, in registry order.
 */
export function defaultSolvers(kind: ProblemKind): string[] {
  // Of the exact solvers only the first for the kind is named: the others take over beyond its limit by themselves.
  const exact = SOLVERS.find((s) => s.kind === "exact" && s.maxSize(kind, false) > 0);
  return SOLVERS.filter((s) => s === exact || (s.kind === "trials" && (s.defaultFor ?? []).includes(kind))).map((s) => s.name);
}

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

/** Names of the exact (ground-truth) solvers: they always run, so `--solvers` may name them but never schedules them. */
export const EXACT_SOLVER_NAMES: ReadonlyArray<string> = SOLVERS.filter((s) => s.kind === "exact").map((s) => s.name);

/**
 * The exact solver that computes the ground truth of a problem: the first registered one whose limit allows
 * it; beyond every limit, the one with the largest limit (whose refusal names that limit).
 */
export function groundTruthSolver(kind: ProblemKind, flipSymmetric: boolean, n: number): ExactSolver<any> { // eslint-disable-line @typescript-eslint/no-explicit-any
  let widest: ExactSolver<any> | null = null; // eslint-disable-line @typescript-eslint/no-explicit-any
  for (const s of SOLVERS) {
    if (s.kind !== "exact") continue;
    if (n <= s.maxSize(kind, flipSymmetric)) return s;
    if (widest === null || s.maxSize(kind, flipSymmetric) > widest.maxSize(kind, flipSymmetric)) widest = s;
  }
  return widest ?? exhaustiveSolver;
}

/** The same exact solver with its CNF limit lowered to `n` (the size where the next exact solver takes over). */
function capCnf<P>(solver: ExactSolver<P>, n: number): ExactSolver<P> {
  return { ...solver, maxSize: (kind, flipSymmetric) => (kind === "cnf" ? Math.min(n, solver.maxSize(kind, flipSymmetric)) : solver.maxSize(kind, flipSymmetric)) };
}
