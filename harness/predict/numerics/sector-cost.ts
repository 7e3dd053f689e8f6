/**
 * The cost C(z) of an instance in the working space of the transverse-field numerics, stored compactly:
 * - CNF: violated-clause counts, exact integers, one byte per amplitude (two beyond 255 clauses), full space;
 * - Ising with the global flip symmetry (even-order terms only): one double per amplitude of the flip-symmetric
 *   sector, the configurations with the top spin up (s_{n−1} = +1, bit n−1 = 0), built directly by a Walsh–Hadamard
 *   transform over n − 1 bits (a term containing spin n−1 loses it, since s_{n−1} = +1);
 * - other Ising models: one double per amplitude of the full space.
 * Along with it the exact statistics both predictors need over ALL 2^n configurations: the mean, the minimum, and
 * the number of configurations within a tolerance of a given optimum.
 */
import { fillCostVector, walshHadamardInPlace } from "../../model/cost-vector.js";
import { hasFlipSymmetry } from "../../model/ising.js";
import { type Problem, sizeOf } from "../../model/problem.js";
import type { Diagonal } from "./transverse-field.js";
import { sharedFloat64, sharedUint16, sharedUint8 } from "./product-team.js";

/** Largest n the sector costs are built for (indices stay 31-bit integers). */
export const SECTOR_COST_MAX_N = 30;

/** A cost in its working space. */
export interface SectorCost {
  readonly n: number;
  /** log2 of the working dimension: n, or n − 1 in the symmetric sector. */
  readonly bits: number;
  readonly dim: number;
  /** True in the flip-symmetric sector (each working amplitude stands for the pair z, ~z). */
  readonly symmetric: boolean;
  /** Integer levels (CNF) or one double per amplitude. */
  readonly levels: Uint8Array | Uint16Array | null;
  readonly values: Float64Array | null;
  /** Largest level + 1 (levels only). */
  readonly levelCount: number;
  /** Exact mean of C over all 2^n configurations (the sector's mean equals it). */
  readonly mean: number;
  /** Minimum of C. */
  readonly min: number;
  /** Largest |C|. */
  readonly maxAbs: number;
  /**
   * A double-precision buffer of length dim the builder used and no longer needs (CNF: the transform's output), to
   * be donated to the Lanczos vector pool so the peak memory does not grow; null when none.
   */
  spare: Float64Array | null;
}

/** Whether an instance is solved in the flip-symmetric sector (Ising with even-order terms only). */
export function usesSymmetricSector(problem: Problem): boolean {
  return problem.kind === "ising" && hasFlipSymmetry(problem.ising) && sizeOf(problem) >= 2;
}

/** Bytes per working amplitude of the cost: 1 or 2 (CNF levels) or 8 (doubles). */
export function costBytesPerAmplitude(problem: Problem): number {
  if (problem.kind !== "cnf") return 8;
  return problem.cnf.offsets.length - 1 > 255 ? 2 : 1;
}

/**
 * Builds the cost in its working space.
 * @throws Error when n exceeds {@link SECTOR_COST_MAX_N}.
 */
export function buildSectorCost(problem: Problem, shared = false): SectorCost {
  const f64 = (length: number): Float64Array => (shared ? sharedFloat64(length) : new Float64Array(length));
  const n = sizeOf(problem);
  if (!(n >= 1 && n <= SECTOR_COST_MAX_N)) throw new Error(`sector cost: n = ${n} outside 1..${SECTOR_COST_MAX_N}`);
  if (problem.kind === "cnf") {
    const dim = 2 ** n;
    const full = f64(dim);
    fillCostVector(problem, full);
    const clauses = problem.cnf.offsets.length - 1;
    const levels = clauses > 255 ? (shared ? sharedUint16(dim) : new Uint16Array(dim)) : shared ? sharedUint8(dim) : new Uint8Array(dim);
    let sum = 0;
    let min = Infinity;
    let max = 0;
    for (let z = 0; z < dim; z++) {
      const c = full[z];
      levels[z] = c;
      sum += c; // integers below 2^53: exact
      if (c < min) min = c;
      if (c > max) max = c;
    }
    return { n, bits: n, dim, symmetric: false, levels, values: null, levelCount: max + 1, mean: sum / dim, min, maxAbs: max, spare: full };
  }
  const symmetric = usesSymmetricSector(problem);
  let values: Float64Array;
  let bits = n;
  if (symmetric) {
    bits = n - 1;
    values = f64(2 ** bits);
    const model = problem.ising;
    const top = 1 << (n - 1);
    values[0] += model.constant;
    for (let t = 0; t + 1 < model.termOffsets.length; t++) {
      let mask = 0;
      for (let i = model.termOffsets[t]; i < model.termOffsets[t + 1]; i++) mask ^= 1 << model.termSpins[i];
      values[(mask & ~top) >>> 0] -= model.coefficients[t];
    }
    walshHadamardInPlace(values, bits);
  } else {
    values = f64(2 ** n);
    fillCostVector(problem, values);
  }
  // Neumaier-compensated mean, as spectral.ts.
  let sum = 0;
  let carry = 0;
  let min = Infinity;
  let maxAbs = 0;
  for (let z = 0; z < values.length; z++) {
    const c = values[z];
    const t = sum + c;
    carry += Math.abs(sum) >= Math.abs(c) ? sum - t + c : c - t + sum;
    sum = t;
    if (c < min) min = c;
    if (Math.abs(c) > maxAbs) maxAbs = Math.abs(c);
  }
  return { n, bits, dim: values.length, symmetric, levels: null, values, levelCount: 0, mean: (sum + carry) / values.length, min, maxAbs, spare: null };
}

/** Configurations of the full space within `tolerance` of `optimum` (a symmetric-sector amplitude counts twice). */
export function countOptima(cost: SectorCost, optimum: number, tolerance: number): number {
  let count = 0;
  if (cost.levels !== null) {
    for (let z = 0; z < cost.dim; z++) if (Math.abs(cost.levels[z] - optimum) <= tolerance) count++;
  } else {
    const v = cost.values as Float64Array;
    for (let z = 0; z < cost.dim; z++) if (Math.abs(v[z] - optimum) <= tolerance) count++;
  }
  return cost.symmetric ? 2 * count : count;
}

/**
 * Σ ψ(z)² over the working amplitudes within `tolerance` of `optimum`: the probability of measuring an optimum in
 * the full space (in the symmetric sector ψ(z) = ψ(~z) = ψ_s(z)/√2 and both are optimal, so the sum is the same).
 */
export function optimalWeight(cost: SectorCost, psi: Float64Array, optimum: number, tolerance: number): number {
  let p = 0;
  if (cost.levels !== null) {
    for (let z = 0; z < cost.dim; z++) if (Math.abs(cost.levels[z] - optimum) <= tolerance) p += psi[z] * psi[z];
  } else {
    const v = cost.values as Float64Array;
    for (let z = 0; z < cost.dim; z++) if (Math.abs(v[z] - optimum) <= tolerance) p += psi[z] * psi[z];
  }
  return p;
}

/**
 * A diagonal d = min(cap, scale·C + shift) over the cost: a level table for CNF, an on-the-fly affine map
 * otherwise. Update it with {@link setAffine}.
 */
export function diagonalOf(cost: SectorCost): Diagonal {
  if (cost.levels !== null) {
    const shared = cost.levels.buffer instanceof SharedArrayBuffer;
    return { kind: "levels", levels: cost.levels, table: shared ? sharedFloat64(cost.levelCount) : new Float64Array(cost.levelCount) };
  }
  return { kind: "affine", costs: cost.values as Float64Array, scale: 0, shift: 0, cap: Infinity };
}

/** Sets d = min(cap, scale·C + shift). */
export function setAffine(d: Diagonal, scale: number, shift: number, cap: number): void {
  if (d.kind === "levels") {
    for (let l = 0; l < d.table.length; l++) d.table[l] = Math.min(cap, scale * l + shift);
  } else {
    d.scale = scale;
    d.shift = shift;
    d.cap = cap;
  }
}

/** True when the cost's arrays live in SharedArrayBuffers (built with shared = true). */
export function isShared(cost: SectorCost): boolean {
  const a = cost.levels ?? cost.values;
  return a !== null && a.buffer instanceof SharedArrayBuffer;
}
