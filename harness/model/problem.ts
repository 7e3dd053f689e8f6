/**
 * A problem instance as every solver and predictor sees it: either a CNF formula (cost = violated clauses)
 * or an Ising cost function (cost = energy). Both are minimised over the 2^n bit strings z.
 */
import { type Cnf, meanViolated, violatedBy } from "./cnf.js";
import { type Ising, isingEnergyOf } from "./ising.js";

/** The two representations the tool computes on. */
export type Problem = { readonly kind: "cnf"; readonly cnf: Cnf } | { readonly kind: "ising"; readonly ising: Ising };

/** Number of binary variables n. */
export function sizeOf(problem: Problem): number {
  return problem.kind === "cnf" ? problem.cnf.variables : problem.ising.spins;
}

/** Cost C(z) of configuration index z (reference evaluation, not for hot loops). */
export function costOf(problem: Problem, z: number): number {
  return problem.kind === "cnf" ? violatedBy(problem.cnf, z) : isingEnergyOf(problem.ising, z);
}

/**
 * Exact mean cost over all 2^n configurations: Σ_c 2^(−|c|) for CNF; the constant for Ising (every
 * non-constant product of spins averages to zero).
 */
export function meanCost(problem: Problem): number {
  return problem.kind === "cnf" ? meanViolated(problem.cnf) : problem.ising.constant;
}

/**
 * Absolute tolerance within which two costs count as equal when counting optima (degeneracy).
 * CNF costs are integers (0 tolerance suffices, 0.5 is safe); Ising energies are sums of doubles, so we use
 * 1e-9 relative to Σ|J| (common practice: far above accumulated rounding of ≤ 2^30 incremental updates
 * with periodic resets, far below any physical gap of the generated families).
 */
export function costTolerance(problem: Problem): number {
  if (problem.kind === "cnf") return 0.5;
  let scale = Math.abs(problem.ising.constant);
  for (const j of problem.ising.coefficients) scale += Math.abs(j);
  return 1e-9 * Math.max(scale, 1);
}
