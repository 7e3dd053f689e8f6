/**
 * The full cost vector C(z) for all 2^n configurations, used by the spectral predictor (the diagonal of its
 * Hamiltonian) and by anything else that needs every cost at once.
 *
 * Method: every cost function we handle is a polynomial in the spin variables χ_i(z) = (−1)^(bit i of z),
 *   C(z) = Σ_S f(S) · Π_{i∈S} χ_i(z) = Σ_S f(S) · (−1)^popcount(S & z),
 * so C is the Walsh–Hadamard transform of its coefficient table f. We write f into `out` (one entry per
 * term, 2^k entries per k-literal clause) and transform in place: n·2^n additions, no per-configuration
 * bookkeeping, and every output passes through exactly n butterflies, so there is no drift to reset (unlike an
 * incremental Gray-code walk, which must recompute periodically).
 *
 * Exactness: for CNF every coefficient is a multiple of 2^−k and every partial sum of the transform is bounded by
 * the number of clauses, so all intermediate values are exact dyadic rationals in a double (m·2^k < 2^53) and
 * the result is the exact integer count of violated clauses. For Ising models the error of each output is at
 * most about n·2^−53·Σ|J| (n rounding steps on values bounded by Σ|J|), far inside 10^−12 relative.
 */
import { walshHadamard } from "./walsh.js";
import { type Cnf } from "./cnf.js";
import { type Ising } from "./ising.js";
import { type Problem, sizeOf } from "./problem.js";

/**
 * Largest n for which a cost vector is built: 2^26 doubles take 512 MiB; n = 27 would take 1 GiB for the cost
 * alone, leaving no room under the tool's 2 GiB budget for the spectral solver's own vectors.
 */
export const COST_VECTOR_MAX = 26;

/** Clauses longer than this are added directly to the 2^(n−k) configurations they violate, not expanded. */
function expandClause(k: number, n: number): boolean {
  return 2 * k <= n || k <= 3;
}

/**
 * Fills `out[z]` with C(z) for every z in [0, 2^n): violated clauses for CNF (exact integers), the energy for
 * Ising models (the constant included). Bit conventions are those of cnf.ts and ising.ts (bit v−1 = variable v;
 * bit i = 1 means s_i = −1).
 * @param problem - the instance; n ≤ {@link COST_VECTOR_MAX}.
 * @param out - length exactly 2^n; overwritten.
 * @throws Error when n exceeds {@link COST_VECTOR_MAX} or `out` has the wrong length.
 */
export function fillCostVector(problem: Problem, out: Float64Array): void {
  const n = sizeOf(problem);
  if (!Number.isInteger(n) || n < 0 || n > COST_VECTOR_MAX) {
    throw new Error(
      `cost vector: n = ${n} exceeds the limit n ≤ ${COST_VECTOR_MAX} (2^n doubles must fit in 512 MiB)`,
    );
  }
  const size = 2 ** n;
  if (out.length !== size) throw new Error(`cost vector: output length ${out.length}, expected 2^${n} = ${size}`);
  out.fill(0);
  if (problem.kind === "cnf") {
    const direct = cnfSpectrum(problem.cnf, out);
    walshHadamard(out, n);
    if (direct.length > 0) addLongClauses(problem.cnf, direct, out);
  } else {
    isingSpectrum(problem.ising, out);
    walshHadamard(out, n);
  }
}

/**
 * Writes the Walsh coefficients of Σ_c [clause c violated] into f. A clause violated iff every literal is false:
 * Π_v (1 + σ_v χ_v)/2 with σ = +1 for a positive literal (false iff bit 0, where χ = +1) and −1 for a negative
 * one. Returns the indices of the clauses left for direct addition (too long to expand).
 */
function cnfSpectrum(cnf: Cnf, f: Float64Array): number[] {
  const n = cnf.variables;
  const { literals, offsets } = cnf;
  const direct: number[] = [];
  const bits: number[] = [];
  const signs: number[] = [];
  for (let c = 0; c + 1 < offsets.length; c++) {
    bits.length = 0;
    signs.length = 0;
    let tautology = false;
    for (let i = offsets[c]; i < offsets[c + 1]; i++) {
      const lit = literals[i];
      const v = Math.abs(lit) - 1;
      if (!(v >= 0 && v < n)) throw new Error(`cost vector: clause ${c} has literal ${lit} outside 1..${n}`);
      const s = lit > 0 ? 1 : -1;
      const at = bits.indexOf(v);
      if (at < 0) {
        bits.push(v);
        signs.push(s);
      } else if (signs[at] !== s) {
        tautology = true;
      }
    }
    if (tautology) continue;
    const k = bits.length;
    if (!expandClause(k, n)) {
      direct.push(c);
      continue;
    }
    const weight = 2 ** -k;
    for (let subset = 0; subset < 1 << k; subset++) {
      let mask = 0;
      let sign = 1;
      for (let j = 0; j < k; j++) {
        if ((subset >>> j) & 1) {
          mask |= 1 << bits[j];
          sign *= signs[j];
        }
      }
      f[mask] += sign * weight;
    }
  }
  return direct;
}

/** Adds 1 to every configuration violating each listed clause (all free bits enumerated). */
function addLongClauses(cnf: Cnf, clauses: readonly number[], out: Float64Array): void {
  const n = cnf.variables;
  const full = 2 ** n - 1; // n ≤ 26: masks stay within 31-bit integers
  for (const c of clauses) {
    let fixed = 0;
    let pattern = 0;
    for (let i = cnf.offsets[c]; i < cnf.offsets[c + 1]; i++) {
      const lit = cnf.literals[i];
      const bit = 1 << (Math.abs(lit) - 1);
      fixed |= bit;
      if (lit < 0) pattern |= bit; // a negative literal is false when its variable is 1
    }
    const free = full & ~fixed;
    // Enumerate all subsets of the free bits: s ← (s − free) & free walks them in increasing order.
    let s = 0;
    do {
      out[(s | pattern) >>> 0] += 1;
      s = (s - free) & free;
    } while (s !== 0);
  }
}

/** Writes the Walsh coefficients of the Ising energy into f: f[0] = constant, f[mask_t] −= J_t. */
function isingSpectrum(model: Ising, f: Float64Array): void {
  f[0] += model.constant;
  for (let t = 0; t + 1 < model.termOffsets.length; t++) {
    let mask = 0;
    // XOR, not OR: a spin listed twice squares to 1 and drops out of the product.
    for (let i = model.termOffsets[t]; i < model.termOffsets[t + 1]; i++) {
      const spin = model.termSpins[i];
      if (!(spin >= 0 && spin < model.spins)) throw new Error(`cost vector: term ${t} has spin ${spin} outside 0..${model.spins - 1}`);
      mask ^= 1 << spin;
    }
    f[mask] -= model.coefficients[t];
  }
}

/** The transform, re-exported under its former name for callers of this module. */
export { walshHadamard as walshHadamardInPlace } from "./walsh.js";
