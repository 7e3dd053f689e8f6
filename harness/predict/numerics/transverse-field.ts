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
 * Product: {@link applyOperator}, one fused pass over v (eight amplitudes in registers, the three low flips inside
 * the group, every higher flip read from the partner's 64-byte line, the diagonal computed inline).
 * A cache-blocked variant, {@link applyOperatorBlocked}, is kept for comparison:
 *   pass A, per block of 2^BLOCK_BITS contiguous amplitudes (256 KiB of v, inside the 2 MiB L2): the diagonal, the
 *          recurrence term and every flip of a bit inside the block;
 *   pass B, for the bits above the block, HIGH_GROUP_BITS at a time: 2^g chunks of CHUNK amplitudes that differ only
 *          in those bits are read together (their union fits in L2), so one pass over memory applies g flips.
 * Measured on the 2-core EPYC VM (CPU time, n = 22, 3-SAT levels, the machine shared with other jobs): fused
 * 95–135 ms, blocked 158–236 ms per product. A single thread is limited by the n loads and adds per amplitude,
 * not by memory traffic, so the blocked variant's extra passes cost more than its saved far reads; the fused
 * kernel is the one the solver uses.
 */

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

/** Bits handled inside one block of pass A: 2^15 doubles = 256 KiB. */
export const BLOCK_BITS = 15;
/** High bits applied per pass B. */
export const HIGH_GROUP_BITS = 6;
/** Amplitudes per chunk of pass B (4 KiB): 2^6 chunks of v and w take 512 KiB. */
const CHUNK = 512;

/** Diagonal value d(z) (for checks and small dense builds). */
export function diagonalAt(d: Diagonal, z: number): number {
  if (d.kind === "levels") return d.table[d.levels[z]];
  return Math.min(d.cap, d.scale * d.costs[z] + d.shift);
}

/**
 * w = σ·(H v) − γ·vprev; returns wᵀv. v, vprev, w have length op.dim (≥ 2); w must differ from v and vprev
 * (vprev may equal v when γ = 0). One fused pass: eight amplitudes in registers, every flip read from its partner
 * cache line, the diagonal computed inline (see the module comment for why this, not the blocked variant).
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

/**
 * The same product cache-blocked (pass A in blocks, pass B for the high bits HIGH_GROUP_BITS at a time); kept for the
 * benchmark's comparison and the tests, not used by the solver (see the module comment).
 */
export function applyOperatorBlocked(
  op: TransverseFieldOperator,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
): number {
  const dim = op.dim;
  if (dim < 8) return applySmall(op, v, sigma, vprev, gamma, w);
  const blockBits = Math.min(op.bits, BLOCK_BITS);
  const block = 2 ** blockBits;
  const sx = -sigma * op.field;
  const highBits = op.bits - blockBits;
  let alpha = 0;
  const d = op.diagonal;
  // Pass A.
  for (let base = 0; base < dim; base += block) {
    const end = base + block;
    if (d.kind === "levels") diagonalLevels(d.levels, d.table, v, sigma, vprev, gamma, w, base, end);
    else diagonalAffine(d.costs, d.scale, d.shift, d.cap, v, sigma, vprev, gamma, w, base, end);
    const a = lowFlips(v, w, sx, base, block, op.mirror ? dim - 1 : -1, highBits === 0);
    alpha += a;
  }
  // Pass B.
  for (let lo = blockBits; lo < op.bits; lo += HIGH_GROUP_BITS) {
    const g = Math.min(HIGH_GROUP_BITS, op.bits - lo);
    alpha = highFlips(v, w, sx, dim, lo, g, lo + g >= op.bits);
  }
  return alpha;
}

/** w[z] = σ·d(z)·v[z] − γ·vprev[z] for z in [from, to), levels diagonal. */
function diagonalLevels(
  levels: Uint8Array | Uint16Array,
  table: Float64Array,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
  from: number,
  to: number,
): void {
  for (let z = from; z < to; z++) w[z] = sigma * table[levels[z]] * v[z] - gamma * vprev[z];
}

/** w[z] = σ·d(z)·v[z] − γ·vprev[z] for z in [from, to), affine diagonal. */
function diagonalAffine(
  costs: Float64Array,
  scale: number,
  shift: number,
  cap: number,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
  from: number,
  to: number,
): void {
  for (let z = from; z < to; z++) {
    const x = scale * costs[z] + shift;
    w[z] = sigma * (x < cap ? x : cap) * v[z] - gamma * vprev[z];
  }
}

/**
 * Adds sx·Σ flips of the bits below `block` (and the mirror partner when mirrorMask ≥ 0) to w over one block;
 * returns Σ w·v over the block when `last` (no high bits follow), else 0.
 */
function lowFlips(v: Float64Array, w: Float64Array, sx: number, base: number, block: number, mirrorMask: number, last: boolean): number {
  let alpha = 0;
  const end = base + block;
  const mirror = mirrorMask >= 0;
  for (let z = base; z < end; z += 8) {
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
    for (let bit = 8; bit < block; bit <<= 1) {
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
    if (mirror) {
      const q = mirrorMask - z;
      s0 += v[q];
      s1 += v[q - 1];
      s2 += v[q - 2];
      s3 += v[q - 3];
      s4 += v[q - 4];
      s5 += v[q - 5];
      s6 += v[q - 6];
      s7 += v[q - 7];
    }
    const w0 = w[z] + sx * s0;
    const w1 = w[z + 1] + sx * s1;
    const w2 = w[z + 2] + sx * s2;
    const w3 = w[z + 3] + sx * s3;
    const w4 = w[z + 4] + sx * s4;
    const w5 = w[z + 5] + sx * s5;
    const w6 = w[z + 6] + sx * s6;
    const w7 = w[z + 7] + sx * s7;
    w[z] = w0;
    w[z + 1] = w1;
    w[z + 2] = w2;
    w[z + 3] = w3;
    w[z + 4] = w4;
    w[z + 5] = w5;
    w[z + 6] = w6;
    w[z + 7] = w7;
    if (last) alpha += w0 * v0 + w1 * v1 + w2 * v2 + w3 * v3 + w4 * v4 + w5 * v5 + w6 * v6 + w7 * v7;
  }
  return alpha;
}

/** Offsets of the 2^g corners of a group of g bits from bit `lo` (reused; g ≤ HIGH_GROUP_BITS). */
const corners = new Int32Array(1 << HIGH_GROUP_BITS);
/** Partner offsets per corner and bit, flattened [corner·g + bit]. */
const partners = new Int32Array((1 << HIGH_GROUP_BITS) * HIGH_GROUP_BITS);

/**
 * Adds sx·Σ flips of bits lo … lo+g−1 to w (every amplitude once); returns Σ w·v when `last`, else 0.
 * Chunks of CHUNK amplitudes whose indices differ only in those bits are processed together.
 */
function highFlips(v: Float64Array, w: Float64Array, sx: number, dim: number, lo: number, g: number, last: boolean): number {
  const count = 1 << g;
  for (let c = 0; c < count; c++) {
    let off = 0;
    for (let i = 0; i < g; i++) if ((c >>> i) & 1) off += 2 ** (lo + i);
    corners[c] = off;
  }
  for (let c = 0; c < count; c++) for (let i = 0; i < g; i++) partners[c * g + i] = corners[c ^ (1 << i)];
  const span = 2 ** lo; // amplitudes below the group
  const stride = 2 ** (lo + g); // period of the group
  const chunk = Math.min(CHUNK, span);
  let alpha = 0;
  for (let top = 0; top < dim; top += stride) {
    for (let low = 0; low < span; low += chunk) {
      const base = top + low;
      for (let c = 0; c < count; c++) {
        const at = base + corners[c];
        const pc = c * g;
        for (let j = 0; j < chunk; j += 4) {
          let s0 = 0;
          let s1 = 0;
          let s2 = 0;
          let s3 = 0;
          for (let i = 0; i < g; i++) {
            const p = base + partners[pc + i] + j;
            s0 += v[p];
            s1 += v[p + 1];
            s2 += v[p + 2];
            s3 += v[p + 3];
          }
          const z = at + j;
          const w0 = w[z] + sx * s0;
          const w1 = w[z + 1] + sx * s1;
          const w2 = w[z + 2] + sx * s2;
          const w3 = w[z + 3] + sx * s3;
          w[z] = w0;
          w[z + 1] = w1;
          w[z + 2] = w2;
          w[z + 3] = w3;
          if (last) alpha += w0 * v[z] + w1 * v[z + 1] + w2 * v[z + 2] + w3 * v[z + 3];
        }
      }
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
