/**
 * One spectral computation on one instance, as a cell or the `spectral` command runs it: the cost vector over
 * all 2^n configurations, then the filtered-Hamiltonian numerics of spectral.ts.
 */
import { COST_VECTOR_MAX, fillCostVector } from "../model/cost-vector.js";
import type { Problem } from "../model/problem.js";
import { sizeOf } from "../model/problem.js";
import { InputError } from "../errors.js";
import { spectralPredict, DEFAULT_SPECTRAL_OPTIONS } from "./spectral.js";
import { lanczosMaxN } from "./lanczos.js";
import { hasFlipSymmetry } from "../model/ising.js";
import type { Predictor } from "./types.js";

/**
 * Largest n the spectral numerics accept for a problem: the Lanczos memory budget (2 GiB), which allows one
 * more variable when the global spin flip halves the space.
 */
export function spectralLimit(problem: Problem): number {
  const symmetric = problem.kind === "ising" && hasFlipSymmetry(problem.ising);
  return Math.min(COST_VECTOR_MAX, lanczosMaxN(symmetric ? "symmetric" : "all"));
}

/**
 * Runs the spectral predictor at one (b, η).
 * @param optimum - exact optimum from ground truth, or null to take it from the cost vector.
 */
export function computeSpectral(problem: Problem, optimum: number | null, b: number, eta: number): Record<string, number | string | boolean | null> {
  const n = sizeOf(problem);
  const limit = spectralLimit(problem);
  if (n > limit) throw new InputError(`spectral: n = ${n} is beyond the limit of ${limit} for exact state-vector numerics in 2 GiB`);
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

/**
 * The spectral method on the predictor registry: one worker cell per instance and filter strength b (a thin
 * wrapper over {@link computeSpectral}; the numerics live in spectral.ts and lanczos.ts).
 */
export const spectralPredictor: Predictor = {
  name: "spectral",
  description: "two-stage spectral method (arXiv:2212.01513): exact Lanczos numerics of the filtered Hamiltonian",
  options: ["spectral-b", "spectral-b-scan", "spectral-eta"],
  appliesTo: () => null,
  cell: {
    param: "b",
    params: (options) => [...(options["spectral-b"] as ReadonlyArray<number>)],
    maxSize: (_kind, flipSymmetric) => Math.min(COST_VECTOR_MAX, lanczosMaxN(flipSymmetric ? "symmetric" : "all")),
    run: (problem, input) => computeSpectral(problem, input.optimum, input.param, Number(input.options["spectral-eta"])),
  },
};
