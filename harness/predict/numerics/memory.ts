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
 * Bytes per amplitude for a generated family before any instance exists (a study's check and its message):
 * ksat 49 (50 beyond 255 clauses); sk and maxcut 28 (flip-symmetric); pspin 28 for even p, 56 for odd; folder
 * families take the larger case (cnf 50, ising 56), since their files may differ.
 */
export function familyBytesPerAmplitude(family: string, params: Readonly<Record<string, unknown>>, n: number): number {
  const vectors = 8 * LEAN_VECTORS;
  switch (family) {
    case "ksat": {
      const clauses = Math.round(Number(params.density) * n);
      return vectors + (clauses > 255 ? 2 : 1);
    }
    case "sk":
    case "maxcut":
      return (vectors + 8) / 2;
    case "pspin":
      return Number(params.p) % 2 === 0 ? (vectors + 8) / 2 : vectors + 8;
    case "cnf":
      return vectors + 2;
    default:
      return vectors + 8;
  }
}

/** Bytes the largest spectral or adiabatic cell of a study at size n needs. */
export function studyMemoryNeeded(family: string, params: Readonly<Record<string, unknown>>, n: number): number {
  return familyBytesPerAmplitude(family, params, n) * 2 ** n + OVERHEAD_BYTES;
}
