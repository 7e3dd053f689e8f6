/**
 * Exact ground truth by exhaustive enumeration, for every problem kind: splits the 2^n configurations into
 * prefix slices (so the worker pool can share them), runs the kernel for the problem kind on a slice, and
 * merges slice results. The kernels live in exhaustive-cnf.ts (bit-parallel k-SAT) and exhaustive-spin.ts
 * (Gray code with local fields).
 */
import type { Problem } from "../harness/model/problem.js";
import { costTolerance, sizeOf } from "../harness/model/problem.js";
import { hasFlipSymmetry } from "../harness/model/ising.js";
import { CNF_EXACT_MAX_VARIABLES, exhaustiveCnfSlice } from "./exhaustive-cnf.js";
import { SPIN_EXACT_MAX, exhaustiveSpinSlice } from "./exhaustive-spin.js";
import type { ExactResult, ExactSolver, StopFlag } from "./types.js";

/** One slice of the enumeration: the top `prefixBits` bits of z fixed to `prefix`. */
export interface Slice {
  readonly prefixBits: number;
  readonly prefix: number;
  /** Spin problems with only even-order terms: each configuration stands for its mirror too. */
  readonly mirror: boolean;
}

/** Largest n the exact methods accept for this problem kind. */
export function exactLimit(problem: Problem): number {
  return problem.kind === "cnf" ? CNF_EXACT_MAX_VARIABLES : SPIN_EXACT_MAX;
}

/**
 * Below 2^22 configurations a slice costs less than a pool round trip (~0.1 ms measured per task), so
 * small instances run as one slice; larger spin problems as 8 slices per worker, enough to balance two
 * cores whose speed differs when the machine is shared (common practice); CNF as one slice per worker.
 */
export function planSlices(problem: Problem, workers: number): Slice[] {
  const n = sizeOf(problem);
  const mirror = problem.kind === "ising" && n > 1 && hasFlipSymmetry(problem.ising);
  const covered = mirror ? n - 1 : n; // free bits once the top spin is pinned
  let bits = 0;
  if (covered >= 22 && workers > 1) {
    // CNF: the pruning kernel loses its bound at every slice border (each slice proves its own minimum), so
    // one slice per worker; spins: 8 per worker for balance.
    const perWorker = problem.kind === "cnf" ? 1 : 8;
    bits = Math.min(Math.ceil(Math.log2(workers * perWorker)), covered - 16);
  }
  if (!mirror) {
    const slices: Slice[] = [];
    for (let p = 0; p < 2 ** bits; p++) slices.push({ prefixBits: bits, prefix: p, mirror: false });
    return slices;
  }
  // Mirror: pin the top spin up by making it part of every prefix (prefix bit for spin n−1 is 0).
  if (bits === 0) return [{ prefixBits: 0, prefix: 0, mirror: true }];
  const slices: Slice[] = [];
  for (let p = 0; p < 2 ** bits; p++) slices.push({ prefixBits: bits + 1, prefix: p, mirror: true });
  return slices;
}

/** Runs one slice with the kernel for the problem's kind. */
export function exhaustiveSlice(problem: Problem, slice: Slice, stop: StopFlag): ExactResult {
  if (problem.kind === "cnf") return exhaustiveCnfSlice(problem.cnf, slice.prefixBits, slice.prefix, stop);
  return exhaustiveSpinSlice(problem.ising, slice.prefixBits, slice.prefix, slice.mirror, costTolerance(problem), stop);
}

/** Merges slice results: the minimum over slices, its degeneracy summed over the slices that reach it. */
export function mergeExact(results: ReadonlyArray<ExactResult>, tolerance: number): ExactResult {
  let optimum = Infinity;
  for (const r of results) if (r.optimum < optimum) optimum = r.optimum;
  let degeneracy = 0;
  let assignments = 0;
  let evaluated = 0;
  let complete = true;
  for (const r of results) {
    if (r.degeneracy > 0 && Math.abs(r.optimum - optimum) <= tolerance) degeneracy += r.degeneracy;
    assignments += r.assignments;
    evaluated += r.evaluated;
    complete &&= r.complete;
  }
  return { optimum, degeneracy, assignments, evaluated, complete };
}

/** Exhaustive enumeration on the solver registry: the ground truth of every instance within its limit. */
export const exhaustiveSolver: ExactSolver<Slice> = {
  name: "exhaustive",
  kind: "exact",
  description: "exact optimum and degeneracy by enumerating all 2^n configurations (always runs: the ground truth)",
  maxSize: (kind) => (kind === "cnf" ? CNF_EXACT_MAX_VARIABLES : SPIN_EXACT_MAX),
  plan: planSlices,
  run: exhaustiveSlice,
  // Every variable fixed (one configuration): only the kernel's set-up and one evaluation remain.
  leastPart: (problem, slice) => ({ prefixBits: sizeOf(problem), prefix: 0, mirror: slice.mirror }),
  merge: mergeExact,
};
