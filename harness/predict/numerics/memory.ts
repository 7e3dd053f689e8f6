/**
 * Memory of the transverse-field numerics (spectral and adiabatic predictors) and the allowance they run under.
 *
 * A solve holds {@link LEAN_VECTORS} double-precision vectors of the working dimension (lean-lanczos.ts) and the cost
 * in its working space (sector-cost.ts). Bytes per amplitude of the full 2^n space:
 *   CNF (k-SAT):                       6·8 + 1 = 49   (two-byte levels beyond 255 clauses: 50)
 *   Ising with flip symmetry (SK, MaxCut, even p): (6·8 + 8)/2 = 28   (sector of 2^(n−1) amplitudes)
 *   other Ising (odd p-spin):          6·8 + 8 = 56
 * The CNF builder's double-precision transform buffer is donated to the vector pool, so it adds nothing.
 */
import os from "node:os";
import type { Problem } from "../../model/problem.js";
import { sizeOf } from "../../model/problem.js";
import { LEAN_VECTORS } from "./lean-lanczos.js";
import { SECTOR_COST_MAX_N, costBytesPerAmplitude, usesSymmetricSector } from "./sector-cost.js";
import type { MethodOptions } from "../../../solvers/types.js";
import type { CellMemory, CellSizeTarget } from "../types.js";

/** Share of physical memory allowed by default. */
export const DEFAULT_MEMORY_SHARE = 0.75;

/** Default allowance: 75% of the physical memory of this machine, read at run time (bytes). */
export function defaultSpectralMemory(): number {
  return Math.floor(DEFAULT_MEMORY_SHARE * os.totalmem());
}

/** Fixed overhead of a solve besides the vectors (tridiagonal scratch, tables), bytes. */
const OVERHEAD_BYTES = 16 * 1024 ** 2;

/** Bytes per amplitude of the full 2^n space (see the module comment). */
export function bytesPerAmplitude(problem: Problem): number {
  const perWorking = 8 * LEAN_VECTORS + costBytesPerAmplitude(problem);
  return usesSymmetricSector(problem) ? perWorking / 2 : perWorking;
}

/** Bytes one spectral or adiabatic solve of this instance needs. */
export function spectralMemoryNeeded(problem: Problem): number {
  return bytesPerAmplitude(problem) * 2 ** sizeOf(problem) + OVERHEAD_BYTES;
}

/** Bytes as GiB with two decimals ("12.25 GiB"), or MiB below 1 GiB ("48.0 MiB"). */
export function formatGiB(bytes: number): string {
  if (bytes < 1024 ** 3) return `${(bytes / 1024 ** 2).toFixed(1)} MiB`;
  return `${(bytes / 1024 ** 3).toFixed(2)} GiB`;
}

/**
 * The refusal for an instance too large for the allowance, or null when it fits.
 * @param what - the predictor's name for the message ("spectral", "adiabatic").
 */
export function memoryRefusal(what: string, problem: Problem, allowed: number): string | null {
  const n = sizeOf(problem);
  if (n > SECTOR_COST_MAX_N) return `${what}: n = ${n} is beyond the largest size ${SECTOR_COST_MAX_N} of the state-vector numerics`;
  const needed = spectralMemoryNeeded(problem);
  if (needed <= allowed) return null;
  return `${what}: n = ${n} needs ${formatGiB(needed)} (${bytesPerAmplitude(problem)} bytes per amplitude × 2^${n}), ` +
    `but --spectral-memory allows ${formatGiB(allowed)}`;
}

/**
 * Parses a --spectral-memory value: GiB as a number ("16", "0.5") or with a unit (MiB, GiB, TiB).
 * @returns bytes, or null for a value that does not parse or is not positive.
 */
export function parseMemory(text: string): number | null {
  const m = /^\s*(\d+(?:\.\d+)?)\s*(MiB|GiB|TiB|M|G|T)?\s*$/i.exec(text);
  if (!m) return null;
  const value = Number(m[1]);
  const unit = (m[2] ?? "GiB").toLowerCase()[0];
  const scale = unit === "m" ? 1024 ** 2 : unit === "t" ? 1024 ** 4 : 1024 ** 3;
  const bytes = Math.floor(value * scale);
  return bytes > 0 ? bytes : null;
}

/**
 * Bytes per amplitude before any instance exists (a study's check at the edge and its message), from what the
 * family declares: CNF 49 (50 beyond 255 clauses, or when the clause count is not fixed, as for a folder of files);
 * flip-symmetric Ising (SK, MaxCut, even p) 28; other Ising 56.
 */
export function targetBytesPerAmplitude(target: CellSizeTarget): number {
  const vectors = 8 * LEAN_VECTORS;
  if (target.kind === "cnf") return vectors + (target.clauses !== null && target.clauses <= 255 ? 1 : 2);
  return target.flipSymmetric ? (vectors + 8) / 2 : vectors + 8;
}

/** Bytes one spectral or adiabatic cell of a study at size n needs. */
export function targetMemoryNeeded(target: CellSizeTarget, n: number): number {
  return targetBytesPerAmplitude(target) * 2 ** n + OVERHEAD_BYTES;
}

/**
 * Bytes of an allowance a solve may spend on stored Lanczos vectors beyond what the instance needs at least, when
 * `sharers` such solves may run at once (study cells: one per core, the pool's default; a command: 1). Never more
 * than 80% of the memory the system reports available now (its share of it), so optional vectors never push the
 * machine into swapping or the out-of-memory killer when something else holds memory.
 */
export function basisMemoryFor(problem: Problem, allowed: number, sharers: number, available = os.freemem()): number {
  const share = Math.min(allowed, BASIS_SHARE_OF_AVAILABLE * available) / Math.max(1, sharers);
  return Math.max(0, share - spectralMemoryNeeded(problem));
}

/** Share of the available memory that stored Lanczos vectors may take at most (common practice: leave headroom). */
const BASIS_SHARE_OF_AVAILABLE = 0.8;

/** The allowance a cell reads from the resolved method options: `spectral-memory` in bytes, or this machine's default. */
export function allowedMemory(options: MethodOptions): number {
  const v = options["spectral-memory"];
  return typeof v === "number" && v > 0 ? v : defaultSpectralMemory();
}

/** The memory of one spectral or adiabatic cell at size n against its allowance (the predictors' `memory`). */
export function cellMemory(target: CellSizeTarget, n: number, options: MethodOptions): CellMemory {
  return {
    needed: targetMemoryNeeded(target, n),
    allowed: allowedMemory(options),
    detail: `${targetBytesPerAmplitude(target)} bytes per amplitude × 2^${n}`,
    option: "spectral-memory",
  };
}
