/**
 * The transverse-field operator H = −field·Σ_i X_i + diag(d) on a vector of 2^bits amplitudes, and its product
 * with a vector, cache-blocked. Shared by the memory-lean Lanczos (lean-lanczos.ts), the spectral predictor
 * (d = b·g_η(x(z))) and the adiabatic gap (d = (1 − s)·n/2 + s·C(z), field = (1 − s)/2).
 *
 * The diagonal is never stored as a double per amplitude unless the cost itself needs one:
 * - "levels": a small integer cost level per amplitude (CNF: violated clauses, one byte each, two bytes beyond 255
 *   clauses) and a table of d per level, rebuilt for each b or s without touching the levels;
 * - "affine": one double of cost C(z) per amplitude and d(z) = min(cap, scale·C(z) + shift) computed on the fly.
 *
 * Sectors: with `mirror` the vector holds the flip-symmetric sector (amplitudes of z with the top qubit 0) and the
 * top qubit's flip maps z to dim − 1 − z.
 *
 * Product: {@link applyOperator}. From 2^10 amplitudes it is the two-pass blocked product of blocked-product.ts
 * (native kernels when built, else WebAssembly SIMD kernels on cache-sized scratch copies); below (and when no plan
 * exists),
 * the scalar fused pass here: eight amplitudes in registers, the three low flips
 * inside the group, every higher flip read from the partner's 64-byte line, the diagonal computed inline.
 */

import { applyBlocked, productPlan } from "./blocked-product.js";

/** Cost levels per amplitude and the diagonal value of each level. */
export interface LevelDiagonal {
  readonly kind: "levels";
  /** Level of each amplitude (index into `table`). */
  readonly levels: Uint8Array | Uint16Array;
  /** d for each level; rewritten between solves (b or s changes). */
  readonly table: Float64Array;
}

/** A double of cost per amplitude; d(z) = min(cap, scale·C(z) + shift). */
export interface AffineDiagonal {
  readonly kind: "affine";
  readonly costs: Float64Array;
  scale: number;
  shift: number;
  /** Upper clamp (Infinity for none). */
  cap: number;
}

export type Diagonal = LevelDiagonal | AffineDiagonal;

/** H = −field·Σ X_i + diag(d) in a working space of dim = 2^bits amplitudes. */
export interface TransverseFieldOperator {
  readonly dim: number;
  readonly bits: number;
  /** Symmetric sector: the flip of the (implicit) top qubit is the mirror z → dim − 1 − z. */
  readonly mirror: boolean;
  /** Coefficient of −Σ X_i. */
  field: number;
  readonly diagonal: Diagonal;
}

/** Diagonal value d(z) (for checks and small dense builds). */
export function diagonalAt(d: Diagonal, z: number): number {
  if (d.kind === "levels") return d.table[d.levels[z]];
  return Math.min(d.cap, d.scale * d.costs[z] + d.shift);
}

/**
 * w = σ·(H v) − γ·vprev; returns wᵀv. v, vprev, w have length op.dim (≥ 2); w must differ from v and vprev
 * (vprev may equal v when γ = 0). The blocked product or the fused pass (see the module comment).
 */
export function applyOperator(
  op: TransverseFieldOperator,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
): number {
  if (op.dim < 8) return applySmall(op, v, sigma, vprev, gamma, w);
  const plan = productPlan(op);
  if (plan !== null) return applyBlocked(op, plan, v, sigma, vprev, gamma, w);
  return applyOperatorRange(op, v, sigma, vprev, gamma, w, 0, op.dim);
}

/**
 * {@link applyOperator} restricted to the output amplitudes [from, to) (multiples of 8, dim ≥ 8): writes only those
 * of w and returns their part of wᵀv. Reads v anywhere, so threads may split the output range (product-team.ts).
 */
export function applyOperatorRange(
  op: TransverseFieldOperator,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
  from: number,
  to: number,
): number {
  const d = op.diagonal;
  const mirror = op.mirror ? op.dim - 1 : -1;
  return d.kind === "levels"
    ? fusedLevels(op.dim, d.levels, d.table, -sigma * op.field, v, sigma, vprev, gamma, w, mirror, from, to)
    : fusedAffine(op.dim, d.costs, d.scale, d.shift, d.cap, -sigma * op.field, v, sigma, vprev, gamma, w, mirror, from, to);
}

/** Σ_i v[z ^ bit_i] for eight amplitudes z … z+7 (all bits below dim, plus the mirror partner when mirror ≥ 0). */
const flipSums = new Float64Array(8);

/** Fills {@link flipSums} for the group at z (z a multiple of 8). */
function groupFlips(v: Float64Array, z: number, dim: number, mirror: number): void {
  const v0 = v[z];
  const v1 = v[z + 1];
  const v2 = v[z + 2];
  const v3 = v[z + 3];
  const v4 = v[z + 4];
  const v5 = v[z + 5];
  const v6 = v[z + 6];
  const v7 = v[z + 7];
  let s0 = v1 + v2 + v4;
  let s1 = v0 + v3 + v5;
  let s2 = v3 + v0 + v6;
  let s3 = v2 + v1 + v7;
  let s4 = v5 + v6 + v0;
  let s5 = v4 + v7 + v1;
  let s6 = v7 + v4 + v2;
  let s7 = v6 + v5 + v3;
  for (let bit = 8; bit < dim; bit <<= 1) {
    const p = z ^ bit;
    s0 += v[p];
    s1 += v[p + 1];
    s2 += v[p + 2];
    s3 += v[p + 3];
    s4 += v[p + 4];
    s5 += v[p + 5];
    s6 += v[p + 6];
    s7 += v[p + 7];
  }
  if (mirror >= 0) {
    const q = mirror - z;
    s0 += v[q];
    s1 += v[q - 1];
    s2 += v[q - 2];
    s3 += v[q - 3];
    s4 += v[q - 4];
    s5 += v[q - 5];
    s6 += v[q - 6];
    s7 += v[q - 7];
  }
  flipSums[0] = s0;
  flipSums[1] = s1;
  flipSums[2] = s2;
  flipSums[3] = s3;
  flipSums[4] = s4;
  flipSums[5] = s5;
  flipSums[6] = s6;
  flipSums[7] = s7;
}

/** Fused product with a level diagonal. */
function fusedLevels(
  dim: number,
  levels: Uint8Array | Uint16Array,
  table: Float64Array,
  sx: number,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
  mirror: number,
  from: number,
  to: number,
): number {
  let alpha = 0;
  for (let z = from; z < to; z += 8) {
    groupFlips(v, z, dim, mirror);
    for (let k = 0; k < 8; k++) {
      const x = sigma * table[levels[z + k]] * v[z + k] + sx * flipSums[k] - gamma * vprev[z + k];
      w[z + k] = x;
      alpha += x * v[z + k];
    }
  }
  return alpha;
}

/** Fused product with an affine diagonal min(cap, scale·C + shift). */
function fusedAffine(
  dim: number,
  costs: Float64Array,
  scale: number,
  shift: number,
  cap: number,
  sx: number,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
  mirror: number,
  from: number,
  to: number,
): number {
  let alpha = 0;
  for (let z = from; z < to; z += 8) {
    groupFlips(v, z, dim, mirror);
    for (let k = 0; k < 8; k++) {
      const y = scale * costs[z + k] + shift;
      const x = sigma * (y < cap ? y : cap) * v[z + k] + sx * flipSums[k] - gamma * vprev[z + k];
      w[z + k] = x;
      alpha += x * v[z + k];
    }
  }
  return alpha;
}

/** {@link applyOperator} for fewer than 8 amplitudes. */
function applySmall(op: TransverseFieldOperator, v: Float64Array, sigma: number, vprev: Float64Array, gamma: number, w: Float64Array): number {
  const dim = op.dim;
  let alpha = 0;
  for (let z = 0; z < dim; z++) {
    let s = 0;
    for (let bit = 1; bit < dim; bit <<= 1) s += v[z ^ bit];
    if (op.mirror) s += v[dim - 1 - z];
    const x = sigma * (diagonalAt(op.diagonal, z) * v[z] - op.field * s) - gamma * vprev[z];
    w[z] = x;
    alpha += x * v[z];
  }
  return alpha;
}
