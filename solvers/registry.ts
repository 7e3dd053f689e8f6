/**
 * The solver registry: every classical solver the tool can run, by name. Adding a solver is one file
 * exporting a {@link TrialsSolver} and one line in the list below (an exact solver: one line in the list of
 * exact-registry.ts); the option table, `--help`, the study's cells, the worker and the tables then know it.
 */
import { annealSolver } from "./anneal.js";
import { breakwalkSolver } from "./breakwalk.js";
import { EXACT_SOLVERS } from "./exact-registry.js";
import { temperingSolver } from "./tempering.js";
import type { ProblemKind, Solver, TrialsSolver } from "./types.js";
import { walkSolver } from "./walk.js";

// The exact solvers live in exact-registry.ts (so `solve` loads no randomised solver); their look-ups are these.
export { EXACT_SOLVER_NAMES, exactSolverNamed, groundTruthSolver } from "./exact-registry.js";

/** Every registered solver, in the order `--help` lists them (the exact ground-truth solvers first). */
export const SOLVERS: ReadonlyArray<Solver> = [
  // Ground truth is the first exact solver whose limit allows n (see groundTruthSolver in exact-registry.ts).
  ...EXACT_SOLVERS,
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
