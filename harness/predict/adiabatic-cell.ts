/**
 * One adiabatic computation on one instance, as a study cell or the `adiabatic` command runs it: the memory check
 * (--spectral-memory), the cost in its working space, then the minimum-gap search of adiabatic.ts.
 */
import { InputError } from "../errors.js";
import type { Problem } from "../model/problem.js";
import { DEFAULT_ADIABATIC_OPTIONS, adiabaticGap } from "./adiabatic.js";
import { availableParallelism } from "node:os";
import { allowedMemory, basisMemoryFor, cellMemory, defaultSpectralMemory, memoryRefusal } from "./numerics/memory.js";
import { SECTOR_COST_MAX_N, buildSectorCost } from "./numerics/sector-cost.js";
import type { Predictor } from "./types.js";

/**
 * Runs the adiabatic predictor.
 * @param optimum - exact optimum from ground truth, or null to take it from the cost.
 * @param grid - grid points on [0, 1] (default 21).
 * @param memory - allowance in bytes (default: 75% of physical memory).
 * @param threads - threads for the products of one large solve (default 1: study cells already fill the cores).
 * @param sharers - solves that may run at once under the same allowance (default 1; see computeSpectral).
 * @throws InputError when the instance needs more memory than allowed.
 */
export function computeAdiabatic(
  problem: Problem,
  optimum: number | null,
  grid: number = DEFAULT_ADIABATIC_OPTIONS.grid,
  memory: number = defaultSpectralMemory(),
  threads = 1,
  sharers = 1,
): Record<string, number | string | boolean | null> {
  const refusal = memoryRefusal("adiabatic", problem, memory);
  if (refusal !== null) throw new InputError(refusal);
  const cost = buildSectorCost(problem, threads > 1);
  const result = adiabaticGap(problem, cost, optimum ?? cost.min, { ...DEFAULT_ADIABATIC_OPTIONS, grid, basisMemory: basisMemoryFor(problem, memory, sharers) }, threads);
  return { ...result };
}

/**
 * The adiabatic minimum gap on the predictor registry: one worker cell per instance, its parameter the grid size
 * (`grid`, --adiabatic-grid). Instances without a unique optimum come back as `skipped` rows with the reason. Its
 * measure is the time scale 1/gap_min² (`runtime_scale`), not an oracle count.
 */
export const adiabaticPredictor: Predictor = {
  name: "adiabatic",
  description: "minimum gap of the adiabatic path (Farhi et al., Science 292, 472): runtime scale 1/gap_min²",
  options: ["adiabatic-grid", "spectral-memory"],
  appliesTo: () => null,
  measure: {
    column: "runtime_scale",
    meaning: "a time scale 1/gap_min² (units ħ/energy), not an oracle count",
  },
  cell: {
    param: "grid",
    scanned: false,
    params: (options) => [Number(options["adiabatic-grid"] ?? DEFAULT_ADIABATIC_OPTIONS.grid)],
    maxSize: () => SECTOR_COST_MAX_N,
    memory: cellMemory,
    // Study cells use one thread each (the pool's workers already fill the cores) and share the allowance with
    // as many other cells as there are cores.
    run: (problem, input) => computeAdiabatic(problem, input.optimum, input.param, allowedMemory(input.options), 1, availableParallelism()),
  },
};
