/**
 * Memory-lean matrix-free Lanczos for the lowest two eigenpairs of a transverse-field operator
 * (transverse-field.ts): the method of ../lanczos.ts (three-term recurrence stopped on the residual estimate,
 * Ritz vectors rebuilt by a SECOND PASS of the identical recurrence, a true-residual check on every Ritz vector,
 * restart from the Ritz vector when it misses; E1 by deflation (locking) against the stored ground state), with
 * only what the method needs kept in memory:
 *
 *   ground state:   start, u_{j−1}, u_j, w (three Lanczos vectors), Ritz accumulators y0 and y1   → 6 vectors
 *   first excited:  ψ0 (locked), start (= the second Ritz vector), u_{j−1}, u_j, w, y             → 6 vectors
 *
 * and no basis stored (the second pass regenerates it), no unfolded ψ0 (callers compute overlaps in the sector),
 * no double-per-amplitude diagonal (the operator carries a compact one). So a solve takes
 * {@link LEAN_VECTORS} vectors of the working dimension plus the operator's diagonal; see memory.ts.
 *
 * ../lanczos.ts stays as the reference implementation (test/lean-lanczos.test.ts compares the two to 1e-10).
 */
import { Rng } from "../../random.js";
import { TridiagonalScratch, tridiagonalEigenvalue, tridiagonalEigenvector } from "../lanczos.js";
import { applyOperator, type TransverseFieldOperator } from "./transverse-field.js";
import { type ProductTeam, sharedFloat64 } from "./product-team.js";
import { combineRange, sweepRange, updateRange } from "./vector-ops.js";

/** Vectors of the working dimension a solve holds at its peak. */
export const LEAN_VECTORS = 6;

/** Options of {@link leanLowestEigenpairs}. */
export interface LeanLanczosOptions {
  /** Target for the true residual ‖Hψ − Eψ‖₂ of both eigenpairs (default 1e-9). */
  readonly tolerance: number;
  /** Largest Krylov dimension of one cycle (default 5000). */
  readonly maxIterations: number;
  /** Seed of the random start vector. */
  readonly seed: string;
  /** Cycles allowed per eigenpair beyond the first (default 12). */
  readonly maxRestarts?: number;
  /** Vectors kept between solves of one dimension (a scan over b or s); see {@link LeanVectorPool}. */
  readonly pool?: LeanVectorPool;
  /** Threads for the products (product-team.ts); the pool and the operator's arrays must then be shared. */
  readonly team?: ProductTeam;
  /**
   * Lanczos vectors a cycle may keep for its Ritz vectors (default 1: the start vector only, the lean minimum).
   * Each kept vector saves the second pass one product and its vector passes; callers size this from the memory
   * left beyond the {@link LEAN_VECTORS} working vectors (see {@link basisVectorsFor}).
   */
  readonly basisVectors?: number;
}

/**
 * Lanczos vectors worth keeping in `spareBytes` of memory for a working space of `dim` amplitudes: 1 (the start
 * vector, always held) plus one per 8·dim bytes, capped at `cap` (a cycle never needs more than its Krylov size).
 */
export function basisVectorsFor(dim: number, spareBytes: number, cap = 1000): number {
  const extra = Math.floor(Math.max(0, spareBytes) / (8 * dim));
  return Math.max(1, Math.min(cap, 1 + extra));
}

/**
 * Free vectors of one working dimension, reused across solves (no first-touch page faults after the first) and
 * seeded with buffers the caller no longer needs (e.g. the double-precision cost vector a CNF level table was
 * built from). Single-threaded.
 */
export class LeanVectorPool {
  private readonly free: Float64Array[] = [];
  /** Vectors allocated by this pool (donated ones not counted). */
  allocated = 0;
  /** @param shared - allocate in SharedArrayBuffers (for a {@link ProductTeam}). */
  constructor(readonly dim: number, readonly shared = false) {}
  take(): Float64Array {
    const v = this.free.pop();
    if (v !== undefined) return v;
    this.allocated++;
    return this.shared ? sharedFloat64(this.dim) : new Float64Array(this.dim);
  }
  give(v: Float64Array): void {
    if (v.length !== this.dim) throw new Error(`lean lanczos: vector of length ${v.length} given to a pool of ${this.dim}`);
    this.free.push(v);
  }
  /** Drops every free vector. */
  clear(): void {
    this.free.length = 0;
  }
}

/** Result of {@link leanLowestEigenpairs}; energies in the units of H. */
export interface LeanEigenResult {
  readonly e0: number;
  /** Second-lowest eigenvalue in the working space (the sector). */
  readonly e1: number;
  /** Ground state in the working space, unit norm, sign fixed so Σψ ≥ 0 (owned by the caller; may go back to the pool). */
  readonly psi0: Float64Array;
  /** Products with H over all passes, cycles and residual checks. */
  readonly iterations: number;
  readonly krylov0: number;
  readonly krylov1: number;
  readonly residual0: number;
  readonly residual1: number;
  readonly converged: boolean;
  readonly restarts: number;
}

/**
 * Lowest two eigenpairs of `op` (see the module comment).
 * @throws Error for a working space of fewer than 2 amplitudes or bad options.
 */
export function leanLowestEigenpairs(op: TransverseFieldOperator, options: LeanLanczosOptions): LeanEigenResult {
  const dim = op.dim;
  if (!(dim >= 2)) throw new Error(`lean lanczos: the working space has ${dim} state; two eigenpairs need at least 2`);
  const tolerance = options.tolerance;
  if (!(tolerance > 0)) throw new Error(`lean lanczos: tolerance = ${tolerance} must be positive`);
  const maxIterations = Math.floor(options.maxIterations);
  if (!(maxIterations >= 1)) throw new Error(`lean lanczos: maxIterations = ${options.maxIterations} must be ≥ 1`);
  const pool = options.pool ?? new LeanVectorPool(dim);
  if (pool.dim !== dim) throw new Error(`lean lanczos: pool dimension ${pool.dim}, operator ${dim}`);
  const ctx: Context = {
    op,
    pool,
    alpha: new Float64Array(maxIterations + 2),
    beta: new Float64Array(maxIterations + 2),
    sigma: new Float64Array(maxIterations + 2),
    s0: new Float64Array(maxIterations + 2),
    s1: new Float64Array(maxIterations + 2),
    tri: new TridiagonalScratch(maxIterations + 2),
    stepOut: new Float64Array(2),
    sums: new Float64Array(2),
    maxIterations,
    maxRestarts: options.maxRestarts ?? 12,
    capacity: Math.max(1, Math.floor(options.basisVectors ?? 1)),
    products: 0,
    team: options.team ?? null,
  };
  // 1. Start vector, seeded: the uniform superposition plus a random vector of the same expected norm
  //    ((U − ½)·√12 has variance 1). The uniform part is the ground state of the field term alone, and the operators
  //    here start from it (at b = 0, s = 0), so it carries most of ψ0 wherever the field dominates; the random part
  //    keeps a component along every eigenvector, so no symmetry of the instance can hide one from the Krylov space.
  //    Measured on SK n = 24 (sector), (b, η) = (0.7, 0.5): E0 settles after 53 products instead of 65.
  const rng = new Rng(options.seed);
  const start = pool.take();
  for (let z = 0; z < dim; z++) start[z] = 1 + (rng.nextDouble() - 0.5) * Math.sqrt(12);
  normalise(start);
  // 2. Ground state to half the tolerance (its leftover residual enters E1's), and a start for E1.
  const first = converge(ctx, start, null, 0.25 * tolerance, 0.5 * tolerance, true);
  const psi = first.vector;
  // 3. First excited state by deflation of ψ0.
  let next = first.second;
  if (next === null) {
    next = pool.take();
    next.fill(0);
  }
  axpy(-dot(next, psi), psi, next);
  if (!(norm(next) > 1e-3)) {
    for (let z = 0; z < dim; z++) next[z] = rng.nextDouble() - 0.5;
    axpy(-dot(next, psi), psi, next);
  }
  normalise(next);
  const second = converge(ctx, next, psi, 0.25 * tolerance, tolerance, false);
  pool.give(second.vector);
  let sum = 0;
  for (let z = 0; z < dim; z++) sum += psi[z];
  if (sum < 0) for (let z = 0; z < dim; z++) psi[z] = -psi[z];
  return {
    e0: first.energy,
    e1: second.energy,
    psi0: psi,
    iterations: ctx.products,
    krylov0: first.krylov,
    krylov1: second.krylov,
    residual0: first.residual,
    residual1: second.residual,
    converged: first.residual <= tolerance && second.residual <= tolerance,
    restarts: first.cycles - 1 + (second.cycles - 1),
  };
}

/** Everything one solve shares; coefficient arrays are indexed by Lanczos step. */
interface Context {
  readonly op: TransverseFieldOperator;
  readonly pool: LeanVectorPool;
  readonly team: ProductTeam | null;
  /** α_j, β_j (β_0 = 0), σ_j = 1/β_j (σ_0 = 1): v_j = σ_j·u_j for the stored unnormalised u_j. */
  readonly alpha: Float64Array;
  readonly beta: Float64Array;
  readonly sigma: Float64Array;
  /** Ritz coefficient vectors of the lowest and second Ritz values of T_k. */
  readonly s0: Float64Array;
  readonly s1: Float64Array;
  readonly tri: TridiagonalScratch;
  readonly stepOut: Float64Array;
  /** ‖w‖² and the locked component from the update (vector-ops.ts). */
  readonly sums: Float64Array;
  readonly maxIterations: number;
  readonly maxRestarts: number;
  /** Lanczos vectors a cycle stores (the start vector counts); the second pass regenerates the rest. */
  readonly capacity: number;
  products: number;
}

interface Converged {
  /** The converged Ritz vector, unit norm (owned by the caller now). */
  readonly vector: Float64Array;
  /** The second Ritz vector of the last cycle, unnormalised, when asked for and k ≥ 2 (owned by the caller). */
  readonly second: Float64Array | null;
  readonly energy: number;
  readonly residual: number;
  readonly krylov: number;
  readonly cycles: number;
}

/**
 * Lanczos cycles on P H P (P = I − ψψᵀ for the locked vector, or I) from `start` (unit norm, owned by this call)
 * until the lowest Ritz pair's true residual under H (not P H P) is within `accept`.
 */
function converge(
  ctx: Context,
  start: Float64Array,
  locked: Float64Array | null,
  target: number,
  accept: number,
  wantSecond: boolean,
): Converged {
  const { op, pool } = ctx;
  let cycles = 0;
  for (;;) {
    cycles++;
    // 1. First pass: the tridiagonal matrix T_k, keeping what fits of the basis.
    const basis = firstPass(ctx, start, locked, target, wantSecond);
    const k = basis.k;
    // 2. Ritz coefficients: the lowest Ritz value of T_{k0}, k0 = where its estimate met the target (continuing
    //    for E1 lets orthogonality decay along ψ0, and mixing in the ghost would spoil ψ0), and the second Ritz value
    //    of the whole T_k.
    const k0 = basis.settled;
    tridiagonalEigenvector(ctx.alpha, ctx.beta, k0, tridiagonalEigenvalue(ctx.alpha, ctx.beta, k0, 0), ctx.s0, ctx.tri);
    ctx.s0.fill(0, k0, k);
    const second = wantSecond && k >= 2;
    if (second) {
      tridiagonalEigenvector(ctx.alpha, ctx.beta, k, tridiagonalEigenvalue(ctx.alpha, ctx.beta, k, 1), ctx.s1, ctx.tri);
    }
    // 3. Ritz vectors from the stored vectors, plus the regenerated tail (second pass).
    const y = pool.take();
    const y1 = second ? pool.take() : null;
    ritzVectors(ctx, basis, locked, y, y1);
    for (const u of basis.stored) pool.give(u); // start is stored[0]
    if (locked !== null) axpy(-dot(locked, y), locked, y);
    normalise(y);
    // 4. True residual with one product: θ = yᵀHy, r = ‖Hy − θy‖.
    const hy = pool.take();
    if (ctx.team !== null) ctx.team.apply(op, y, 1, y, 0, hy);
    else applyOperator(op, y, 1, y, 0, hy);
    ctx.products++;
    const energy = dot(y, hy);
    const residual = residualNorm(hy, y, energy);
    pool.give(hy);
    if (residual <= accept || cycles > ctx.maxRestarts) {
      return { vector: y, second: y1, energy, residual, krylov: k0, cycles };
    }
    // 5. Restart from the Ritz vector.
    if (y1 !== null) pool.give(y1);
    start = y;
  }
}

/** What the first pass leaves: T_k in ctx.alpha/beta, σ in ctx.sigma, and the stored u_0 … u_{c−1}. */
interface Basis {
  readonly k: number;
  /** Krylov dimension at which the lowest Ritz value's estimate met the target (k when it never did). */
  readonly settled: number;
  readonly stored: Float64Array[];
}

/**
 * One Lanczos step: w = H v_j − β_j v_{j−1} with v = σ·u, α_j = wᵀv_j, w −= α_j v_j and the locked component,
 * β_{j+1} = ‖w‖. Writes α_j, β_{j+1} to ctx.stepOut. The same function runs both passes, so the regenerated
 * vectors equal the first pass's bit for bit.
 */
function step(
  ctx: Context,
  j: number,
  u: Float64Array,
  uprev: Float64Array,
  w: Float64Array,
  locked: Float64Array | null,
): void {
  const sigma = ctx.sigma[j];
  const gamma = j > 0 ? ctx.beta[j] * ctx.sigma[j - 1] : 0;
  const a = sigma * (ctx.team !== null ? ctx.team.apply(ctx.op, u, sigma, uprev, gamma, w) : applyOperator(ctx.op, u, sigma, uprev, gamma, w));
  ctx.products++;
  const as = a * sigma;
  const sums = ctx.sums;
  update(ctx, w, u, as, locked, sums);
  const nn = sums[0];
  const c = sums[1];
  if (locked !== null) combine(ctx, locked, w, -c, null, 0);
  ctx.stepOut[0] = a;
  ctx.stepOut[1] = Math.sqrt(Math.max(0, nn - c * c));
}

/**
 * First pass from `start`: Lanczos steps until the lowest Ritz value's residual estimate β_{k}|s_{k−1}| ≤ target
 * (and, with wantSecond, the second one's too, for at most as many steps again), or β = 0, or maxIterations.
 */
function firstPass(
  ctx: Context,
  start: Float64Array,
  locked: Float64Array | null,
  target: number,
  wantSecond: boolean,
): Basis {
  const { pool, alpha, beta, sigma, tri } = ctx;
  const stored: Float64Array[] = [start];
  beta[0] = 0;
  sigma[0] = 1;
  let uprev = start;
  let u = start;
  let k = 1;
  let settled = 0; // k at which E0's estimate first met the target
  let limit = ctx.maxIterations;
  for (let j = 0; j < ctx.maxIterations; j++) {
    const w = pool.take();
    step(ctx, j, u, uprev, w, locked);
    alpha[j] = ctx.stepOut[0];
    const b = ctx.stepOut[1];
    beta[j + 1] = b;
    k = j + 1;
    let stop = b === 0 || k >= limit;
    if (!stop) {
      if (settled === 0) {
        const last0 = tridiagonalEigenvector(alpha, beta, k, tridiagonalEigenvalue(alpha, beta, k, 0), ctx.s0, tri);
        if (b * Math.abs(last0) <= target) {
          settled = k;
          if (!wantSecond || k < 2) stop = true;
          else limit = Math.min(ctx.maxIterations, k + Math.max(10, Math.round(k / 3)));
        }
      }
      if (settled > 0 && !stop) {
        const last1 = tridiagonalEigenvector(alpha, beta, k, tridiagonalEigenvalue(alpha, beta, k, 1), ctx.s1, tri);
        if (b * Math.abs(last1) <= target) stop = true;
      }
    }
    if (stop) {
      pool.give(w);
      break;
    }
    sigma[j + 1] = 1 / b;
    if (j + 1 < ctx.capacity) stored.push(w);
    // u_{j−1} is no longer needed unless it is stored.
    if (j >= 1 && j - 1 >= ctx.capacity) pool.give(uprev);
    uprev = u;
    u = w;
  }
  // Release the unstored tail vectors still held.
  if (k - 1 >= ctx.capacity) pool.give(u);
  if (k - 2 >= ctx.capacity) pool.give(uprev);
  return { k, settled: settled > 0 ? settled : k, stored };
}

/**
 * y0 = Σ_j s0_j v_j and y1 = Σ_j s1_j v_j over the k Lanczos vectors: the stored ones in one sweep (on the team's
 * threads when there is one), the rest regenerated from the last two stored vectors with {@link step}.
 */
function ritzVectors(
  ctx: Context,
  basis: Basis,
  locked: Float64Array | null,
  y0: Float64Array,
  y1: Float64Array | null,
): void {
  const { stored, k } = basis;
  const { s0, s1, sigma, pool } = ctx;
  const count = Math.min(k, stored.length);
  const c0 = new Float64Array(count);
  const c1 = y1 !== null ? new Float64Array(count) : null;
  for (let j = 0; j < count; j++) {
    c0[j] = s0[j] * sigma[j];
    if (c1 !== null) c1[j] = s1[j] * sigma[j];
  }
  if (ctx.team !== null) ctx.team.sweep(stored, count, c0, y0, c1, y1);
  else sweepRange(stored, count, c0, y0, c1, y1, 0, y0.length);
  if (k <= count) return;
  // Second pass over the tail: u_count … u_{k−1}.
  let uprev = stored[Math.max(0, count - 2)]; // with count = 1, step 0 ignores uprev (β_0 = 0)
  let u = stored[count - 1];
  for (let j = count - 1; j < k - 1; j++) {
    const w = pool.take();
    step(ctx, j, u, uprev, w, locked);
    combine(ctx, w, y0, s0[j + 1] * sigma[j + 1], y1, y1 !== null ? s1[j + 1] * sigma[j + 1] : 0);
    if (j - 1 >= count) pool.give(uprev);
    uprev = u;
    u = w;
  }
  if (k - 1 >= count) pool.give(u);
  if (k - 2 >= count) pool.give(uprev);
}

/** w −= a·u; out = [‖w‖², lockedᵀw] (see vector-ops.ts), on the team's threads when there is one. */
function update(ctx: Context, w: Float64Array, u: Float64Array, a: number, locked: Float64Array | null, out: Float64Array): void {
  if (ctx.team !== null) {
    ctx.team.update(w, u, a, locked, out);
    return;
  }
  out[0] = 0;
  out[1] = 0;
  updateRange(w, u, a, locked, 0, w.length, out);
}

/** y0 += c0·x (and y1 += c1·x), on the team's threads when there is one. */
function combine(ctx: Context, x: Float64Array, y0: Float64Array, c0: number, y1: Float64Array | null, c1: number): void {
  if (ctx.team !== null) ctx.team.combine(x, y0, c0, y1, c1);
  else combineRange(x, y0, c0, y1, c1, 0, x.length);
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

function norm(a: Float64Array): number {
  return Math.sqrt(dot(a, a));
}

function normalise(a: Float64Array): void {
  const s = 1 / norm(a);
  for (let i = 0; i < a.length; i++) a[i] *= s;
}

/** y += c·x */
function axpy(c: number, x: Float64Array, y: Float64Array): void {
  for (let i = 0; i < x.length; i++) y[i] += c * x[i];
}

/** ‖hy − θy‖₂ */
function residualNorm(hy: Float64Array, y: Float64Array, theta: number): number {
  let s = 0;
  for (let i = 0; i < y.length; i++) {
    const r = hy[i] - theta * y[i];
    s += r * r;
  }
  return Math.sqrt(s);
}
