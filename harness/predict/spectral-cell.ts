/**
 * One spectral computation on one instance, as a cell or the `spectral` command runs it: the cost in its working
 * space (numerics/sector-cost.ts), then the filtered-Hamiltonian numerics on the memory-lean path (spectral-lean.ts),
 * refused up front when the instance needs more than the memory allowance (--spectral-memory).
 */
import type { Problem } from "../model/problem.js";
import { InputError } from "../errors.js";
import { DEFAULT_SPECTRAL_OPTIONS } from "./spectral.js";
import { spectralLeanScan } from "./spectral-lean.js";
import { availableParallelism } from "node:os";
import { allowedMemory, basisMemoryFor, cellMemory, defaultSpectralMemory, memoryRefusal } from "./numerics/memory.js";
import { SECTOR_COST_MAX_N, buildSectorCost } from "./numerics/sector-cost.js";
import type { Predictor } from "./types.js";

/**
 * Runs the spectral predictor at one (b, η).
 * @param optimum - exact optimum from ground truth, or null to take it from the cost.
 * @param memory - allowance in bytes (default: 75% of physical memory).
 * @param threads - threads for the products (default 1: study cells already fill the cores).
 * @param sharers - solves that may run at once under the same allowance (default 1); the allowance's share beyond
 *   the lean minimum holds stored Lanczos vectors.
 * @throws InputError when the instance needs more memory than allowed (the message names both).
 */
export function computeSpectral(
  problem: Problem,
  optimum: number | null,
  b: number,
  eta: number,
  memory: number = defaultSpectralMemory(),
  threads = 1,
  sharers = 1,
): Record<string, number | string | boolean | null> {
  const refusal = memoryRefusal("spectral", problem, memory);
  if (refusal !== null) throw new InputError(refusal);
  const cost = buildSectorCost(problem, threads > 1);
  const [row] = spectralLeanScan(problem, cost, optimum ?? cost.min, [b], { ...DEFAULT_SPECTRAL_OPTIONS, eta, basisMemory: basisMemoryFor(problem, memory, sharers) }, threads);
  return { ...row } as Record<string, number | string | boolean | null>;
}

/**
 * The spectral method on the predictor registry: one worker cell per instance and filter strength b (a thin
 * wrapper over {@link computeSpectral}; the numerics live in spectral-lean.ts and numerics/). Its reach is set by
 * memory (--spectral-memory), checked at the edge through `memory`; `maxSize` is only the index-width cap.
 */
export const spectralPredictor: Predictor = {
  name: "spectral",
  description: "two-stage spectral method (arXiv:2212.01513): exact Lanczos numerics of the filtered Hamiltonian",
  options: ["spectral-b", "spectral-b-scan", "spectral-eta", "spectral-memory"],
  appliesTo: () => null,
  cell: {
    param: "b",
    params: (options) => [...(options["spectral-b"] as ReadonlyArray<number>)],
    maxSize: () => SECTOR_COST_MAX_N,
    memory: cellMemory,
    // Study cells use one thread each (the pool's workers already fill the cores) and share the allowance with
    // as many other cells as there are cores.
    run: (problem, input) =>
      computeSpectral(problem, input.optimum, input.param, Number(input.options["spectral-eta"]), allowedMemory(input.options), 1, availableParallelism()),
  },
};
