/**
 * One spectral computation on one instance, as a cell or the `spectral` command runs it: the cost vector over
 * all 2^n configurations, then the filtered-Hamiltonian numerics of spectral.ts.
 */
import { COST_VECTOR_MAX, fillCostVector } from "../model/cost-vector.js";
import type { Problem } from "../model/problem.js";
import { sizeOf } from "../model/problem.js";
import { InputError } from "../errors.js";
import { spectralPredict, DEFAULT_SPECTRAL_OPTIONS } from "./spectral.js";

/**
 * Runs the spectral predictor at one (b, η).
 * @param optimum - exact optimum from ground truth, or null to take it from the cost vector.
 */
export function computeSpectral(problem: Problem, optimum: number | null, b: number, eta: number): Record<string, number | string | boolean | null> {
  const n = sizeOf(problem);
  if (n > COST_VECTOR_MAX) throw new InputError(`spectral: n = ${n} is beyond the limit of ${COST_VECTOR_MAX} for exact state-vector numerics`);
  const costs = new Float64Array(2 ** n);
  fillCostVector(problem, costs);
  let best = optimum;
  if (best === null) {
    best = Infinity;
    for (let z = 0; z < costs.length; z++) if (costs[z] < best) best = costs[z];
  }
  const result = spectralPredict(problem, costs, best, { ...DEFAULT_SPECTRAL_OPTIONS, b, eta });
  return { ...result } as Record<string, number | string | boolean | null>;
}
