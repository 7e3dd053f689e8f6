/**
 * One spectral computation on one instance, as a cell or the `spectral` command runs it: the cost in its working
 * space (numerics/sector-cost.ts), then the filtered-Hamiltonian numerics on the memory-lean path (spectral-lean.ts),
 * refused up front when the instance needs more than the memory allowance (--spectral-memory).
 */
import type { Problem } from "../model/problem.js";
import { InputError } from "../errors.js";
import { DEFAULT_SPECTRAL_OPTIONS } from "./spectral.js";
import { spectralLeanScan } from "./spectral-lean.js";
import { defaultSpectralMemory, memoryRefusal } from "./numerics/memory.js";
import { buildSectorCost } from "./numerics/sector-cost.js";

/**
 * Runs the spectral predictor at one (b, η).
 * @param optimum - exact optimum from ground truth, or null to take it from the cost vector.
 * @param memory - allowance in bytes (default: 75% of physical memory).
 * @param threads - threads for the products (default 1: study cells already fill the cores).
 * @throws InputError when the instance needs more memory than allowed (the message names both).
 */
export function computeSpectral(
  problem: Problem,
  optimum: number | null,
  b: number,
  eta: number,
  memory: number = defaultSpectralMemory(),
  threads = 1,
): Record<string, number | string | boolean | null> {
  const refusal = memoryRefusal("spectral", problem, memory);
  if (refusal !== null) throw new InputError(refusal);
  const cost = buildSectorCost(problem, threads > 1);
  const [row] = spectralLeanScan(problem, cost, optimum ?? cost.min, [b], { ...DEFAULT_SPECTRAL_OPTIONS, eta }, threads);
  return { ...row } as Record<string, number | string | boolean | null>;
}
