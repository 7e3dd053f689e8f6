/**
 * Matrix-free Lanczos for the lowest two eigenpairs of the transverse-field Hamiltonian
 *
 *   H = −(1/n) Σ_i X_i + diag(d),   on the 2^n computational-basis amplitudes (bit i of z = qubit i),
 *
 * as used by the spectral predictor (spectral.ts). Σ X_i is applied by bit-flip passes, never as a matrix.
 *
 * Method (choice and reasons):
 * - Plain three-term Lanczos (Lanczos 1950; numerical behaviour after Paige, "Accuracy and effectiveness of the
 *   Lanczos algorithm for the symmetric eigenproblem", Linear Algebra Appl. 34 (1980)), stopped on the residual
 *   estimate β_k|s_k| of the wanted Ritz values. No reorthogonalisation: we stop as soon as the extreme Ritz
 *   values converge, before orthogonality loss produces ghost copies (which would only duplicate the lowest value,
 *   never displace it). Full reorthogonalisation or thick restart would cost O(k) vector operations a step against
 *   the product's n additions per amplitude.
 * - Ritz vectors: the Lanczos vectors are kept while they fit a memory budget (`basisBytes`: 0 for a lone solve,
 *   512 MiB with a reusable {@link LanczosWorkspace}; the start vector always); vectors beyond it are regenerated
 *   in a SECOND PASS from the last two stored ones with the identical arithmetic, so the result is the same bit for
 *   bit whatever the budget. With the whole basis stored the second pass is free; otherwise it costs one product
 *   per regenerated vector.
 * - Every Ritz vector is checked with one true product: ‖Hψ − θψ‖₂ with θ = ψᵀHψ (the reported energy). If the
 *   true residual misses, the cycle restarts from the Ritz vector.
 * - The first run continues after E0's estimate meets the target for at most max(10, k/3) more steps, until the
 *   second Ritz value's does too; ψ0 is still formed from the shorter T_k (continuing lets orthogonality decay along
 *   ψ0, and a ghost mixed into ψ0 fails the true-residual check — measured: restarts appeared with longer
 *   continuations; k/3 gave the fewest products over 24 test instances, 3087 against 3247 with none).
 *   E1 is then computed by deflation (locking): ψ0 is projected out of every Lanczos vector of a second run started
 *   from the second Ritz vector, so its lowest Ritz value is E1 — correct even when E1 − E0 is tiny, where one run
 *   cannot tell a genuine E1 from a ghost of E0. Often that run stops after one step. ψ0 is converged to half
 *   the tolerance so that its leftover residual (which enters E1's through ⟨ψ0|H|ψ1⟩ = ⟨r0|ψ1⟩) keeps E1's
 *   true residual within the tolerance.
 *
 * Sectors: with sector "symmetric" the diagonal must satisfy d(z) = d(~z); H then commutes with Π X_i and we work
 * on the 2^(n−1)-dimensional flip-symmetric subspace, representing a symmetric vector by its amplitudes on z with
 * the top bit 0 (the partner of z under X_{n−1} is then the mirror of z, index 2^(n−1) − 1 − z). E0 is the global
 * ground energy (the ground state of this stoquastic H is unique and positive, hence symmetric) and E1 is the first
 * excited level IN THE SYMMETRIC SECTOR — the gap that matters when the evolution starts from the symmetric |+⟩.
 *
 * Memory, in vectors of the sector's dimension: 5 + c, with c ≥ 1 stored Lanczos vectors (the rest: a product and
 * two recurrence vectors of the regenerated tail, two Ritz vectors or ψ0 plus one Ritz vector). With the caller's cost
 * vector and diagonal (2 × 2^n doubles) and ψ0 unfolded to 2^n amplitudes in the symmetric sector, the total must
 * stay below {@link LANCZOS_MEMORY_LIMIT_BYTES}: n ≤ 24 in sector "all", n ≤ 25 in "symmetric". At n = 24 ("all")
 * a lone solve keeps 6 vectors of 128 MiB (plus the caller's 2: 1 GiB); with a workspace the budget adds at most
 * 4 more (1.5 GiB).
 */
import { Rng } from "../random.js";

/** "all": the full 2^n space; "symmetric": the flip-symmetric subspace (requires d(z) = d(~z)). */
export type LanczosSector = "all" | "symmetric";

/** Options of {@link lowestEigenpairs}. */
export interface LanczosOptions {
  /** Target for the true residual ‖Hψ − Eψ‖₂ of both eigenpairs (unit: energy; default 1e-9). */
  readonly tolerance: number;
  /** Largest Krylov dimension of one Lanczos cycle (default 5000); a cycle that reaches it restarts. */
  readonly maxIterations: number;
  /** Seed of the random start vector (any string; hex seeds from deriveSeed are used as they are). */
  readonly seed: string;
  /** Sector to work in (default "all"). */
  readonly sector?: LanczosSector;
  /** Cycles allowed per eigenpair beyond the first before giving up with converged = false (default 12). */
  readonly maxRestarts?: number;
  /**
   * Bytes for stored Lanczos vectors beyond the start vector; never past the 2 GiB limit. Default: 0 for a lone
   * solve (every vector regenerated in the second pass), 512 MiB with a {@link LanczosWorkspace}. Reason, measured on
   * the development VM: touching fresh memory costs ≈ 8 ms of CPU per 2 MiB (first-touch page faults), more than
   * the product a stored vector saves (≈ 3 ms at 2^18 amplitudes); reused memory costs nothing, so storing pays
   * from the second solve of a workspace on.
   */
  readonly basisBytes?: number;
  /** Memory kept between solves of the same dimension (e.g. a scan over b); see {@link LanczosWorkspace}. */
  readonly workspace?: LanczosWorkspace;
}

/**
 * Vectors kept allocated between solves of one dimension (a scan over b), so later solves touch no fresh memory and
 * may store their Lanczos basis. Holds up to the basis budget plus the working vectors until {@link release}d or
 * dropped. Not shared between threads.
 */
export class LanczosWorkspace {
  private pool: VectorPool | null = null;
  /** The pool for vectors of length dim (a new one when the dimension changes). @internal */
  poolFor(dim: number): VectorPool {
    if (this.pool === null || this.pool.dim !== dim) this.pool = new VectorPool(dim);
    return this.pool;
  }
  /** Drops every kept vector. */
  release(): void {
    this.pool = null;
  }
}

/** Defaults of {@link LanczosOptions}. */
export const DEFAULT_LANCZOS_OPTIONS: Readonly<Required<Omit<LanczosOptions, "workspace">>> = Object.freeze({
  tolerance: 1e-9,
  maxIterations: 5000,
  seed: "lanczos",
  sector: "all",
  maxRestarts: 12,
  basisBytes: 0,
});

/** Default {@link LanczosOptions.basisBytes} when a workspace is given (512 MiB). */
export const LANCZOS_WORKSPACE_BASIS_BYTES = 512 * 1024 ** 2;

/** Result of {@link lowestEigenpairs}. Energies in the units of H. */
export interface EigenResult {
  /** Lowest eigenvalue (Rayleigh quotient of psi0). */
  readonly e0: number;
  /** Second-lowest eigenvalue within the sector (Rayleigh quotient of its Ritz vector). */
  readonly e1: number;
  /** Ground state on all 2^n amplitudes (also in the symmetric sector), unit norm, sign fixed so Σψ ≥ 0. */
  readonly psi0: Float64Array;
  /** Products with H over all passes, cycles and residual checks. */
  readonly iterations: number;
  /** Krylov dimension of the final cycle for E0 (the first run) and for E1 (the deflated run). */
  readonly krylov0: number;
  readonly krylov1: number;
  /** True residuals ‖Hψ − Eψ‖₂ of the two eigenpairs. */
  readonly residual0: number;
  readonly residual1: number;
  /** Both residuals within tolerance. */
  readonly converged: boolean;
  /** Extra cycles (restarts) beyond the first, over both eigenpairs. */
  readonly restarts: number;
  /** Sector the pairs were computed in. */
  readonly sector: LanczosSector;
  /** Dimension of the space worked in (2^n, or 2^(n−1) in the symmetric sector). */
  readonly dimension: number;
  /** Vectors of that dimension allocated at the peak (stored Lanczos vectors included; with a workspace, since it
   * was created). */
  readonly vectors: number;
  /** Lanczos vectors per run the memory budget lets us store (the rest are regenerated in the second pass). */
  readonly stored: number;
}

/** Memory ceiling of one solve including the caller's cost vector and diagonal, bytes (2 GiB). */
export const LANCZOS_MEMORY_LIMIT_BYTES = 2 * 1024 ** 3;

/** Working vectors besides the stored Lanczos vectors (see the module comment). */
const FIXED_VECTORS = 5;
/** Lanczos vectors always stored: the start vector, from which the second pass regenerates the rest. */
const MIN_STORED = 1;

/**
 * Bytes a solve at size n needs with `stored` Lanczos vectors: the working vectors, ψ0 unfolded to 2^n in the
 * symmetric sector, and the caller's cost vector and diagonal (2 × 2^n doubles).
 */
export function lanczosMemoryBytes(n: number, sector: LanczosSector, stored = MIN_STORED): number {
  const full = 2 ** n;
  const dim = sector === "symmetric" ? full / 2 : full;
  const unfolded = sector === "symmetric" ? full : 0;
  return 8 * ((FIXED_VECTORS + stored) * dim + unfolded + 2 * full);
}

/** Largest n whose solve stays strictly below {@link LANCZOS_MEMORY_LIMIT_BYTES}: 24 ("all"), 25 ("symmetric"). */
export function lanczosMaxN(sector: LanczosSector): number {
  let n = 1;
  while (lanczosMemoryBytes(n + 1, sector) < LANCZOS_MEMORY_LIMIT_BYTES) n++;
  return n;
}

/**
 * Lowest two eigenpairs of H = −(1/n) Σ_i X_i + diag(d) (see the module comment for the method).
 * @param n - number of qubits, 1 ≤ n ≤ {@link lanczosMaxN}(sector).
 * @param diagonal - d(z) for all z in [0, 2^n) (full length also in the symmetric sector).
 * @param options - tolerance (default 1e-9), maxIterations, seed, sector (default "all").
 * @throws Error when n exceeds the memory limit, the diagonal has the wrong length or is not finite, the
 *   symmetric sector is asked for a diagonal without the flip symmetry, or the sector has fewer than 2 states.
 */
export function lowestEigenpairs(n: number, diagonal: Float64Array, options: LanczosOptions): EigenResult {
  const sector: LanczosSector = options.sector ?? "all";
  if (sector !== "all" && sector !== "symmetric") throw new Error(`lanczos: unknown sector "${String(sector)}"`);
  if (!Number.isInteger(n) || n < 1) throw new Error(`lanczos: n = ${n} must be a positive integer`);
  const maxN = lanczosMaxN(sector);
  if (n > maxN) {
    throw new Error(
      `lanczos: n = ${n} exceeds the limit n ≤ ${maxN} for sector "${sector}" (${FIXED_VECTORS + MIN_STORED} ` +
        `vectors of the sector's dimension plus the cost vector and diagonal must stay below 2 GiB)`,
    );
  }
  const tolerance = options.tolerance;
  if (!(tolerance > 0)) throw new Error(`lanczos: tolerance = ${tolerance} must be positive`);
  const maxIterations = Math.floor(options.maxIterations);
  if (!(maxIterations >= 1)) throw new Error(`lanczos: maxIterations = ${options.maxIterations} must be ≥ 1`);
  const maxRestarts = options.maxRestarts ?? DEFAULT_LANCZOS_OPTIONS.maxRestarts;
  const full = 2 ** n;
  if (diagonal.length !== full) throw new Error(`lanczos: diagonal length ${diagonal.length}, expected 2^${n} = ${full}`);
  let dmax = 0;
  for (let z = 0; z < full; z++) {
    const a = Math.abs(diagonal[z]);
    if (!(a < Infinity)) throw new Error(`lanczos: diagonal entry ${z} is not finite (${diagonal[z]})`);
    if (a > dmax) dmax = a;
  }
  const symmetric = sector === "symmetric";
  if (symmetric) {
    const slack = 1e-9 * dmax;
    for (let z = 0; z < full / 2; z++) {
      if (Math.abs(diagonal[z] - diagonal[full - 1 - z]) > slack) {
        throw new Error(
          `lanczos: sector "symmetric" needs d(z) = d(~z), but d(${z}) = ${diagonal[z]} and ` +
            `d(${full - 1 - z}) = ${diagonal[full - 1 - z]}`,
        );
      }
    }
  }
  const dim = symmetric ? full / 2 : full;
  if (dim < 2) throw new Error(`lanczos: sector "${sector}" at n = ${n} has ${dim} state; two eigenpairs need at least 2`);

  // Stored Lanczos vectors: the budget, but never past the 2 GiB limit.
  const workspace = options.workspace;
  const budget = Math.min(
    options.basisBytes ?? (workspace !== undefined ? LANCZOS_WORKSPACE_BASIS_BYTES : DEFAULT_LANCZOS_OPTIONS.basisBytes),
    LANCZOS_MEMORY_LIMIT_BYTES - 1 - lanczosMemoryBytes(n, sector),
  );
  const capacity = Math.min(maxIterations + 1, MIN_STORED + Math.max(0, Math.floor(budget / (8 * dim))));

  const ctx: Context = {
    op: { dim, mirror: symmetric, invn: 1 / n, d: symmetric ? diagonal.subarray(0, dim) : diagonal },
    pool: workspace !== undefined ? workspace.poolFor(dim) : new VectorPool(dim),
    alpha: new Float64Array(maxIterations + 2),
    beta: new Float64Array(maxIterations + 2),
    sigma: new Float64Array(maxIterations + 2),
    s0: new Float64Array(maxIterations + 2),
    s1: new Float64Array(maxIterations + 2),
    tri: new TridiagonalScratch(maxIterations + 2),
    stepOut: new Float64Array(2),
    capacity,
    maxIterations,
    maxRestarts,
    products: 0,
  };

  // 1. Random start vector, seeded.
  const rng = new Rng(options.seed);
  const start = ctx.pool.take();
  for (let z = 0; z < dim; z++) start[z] = rng.nextDouble() - 0.5;
  normalise(start);

  // 2. Ground state, to half the tolerance (see the module comment), and a start for the first excited state.
  const first = converge(ctx, start, null, 0.25 * tolerance, 0.5 * tolerance, true);
  const psi = first.vector;
  // 3. First excited state by deflation of ψ0.
  let next = first.second;
  if (next === null) {
    next = ctx.pool.take();
    next.fill(0);
  }
  axpy(-dot(next, psi), psi, next);
  if (!(norm(next) > 1e-3)) {
    for (let z = 0; z < dim; z++) next[z] = rng.nextDouble() - 0.5;
    axpy(-dot(next, psi), psi, next);
  }
  normalise(next);
  const second = converge(ctx, next, psi, 0.25 * tolerance, tolerance, false);
  ctx.pool.give(second.vector);

  // 4. Output: ψ0 on all 2^n amplitudes, sign fixed.
  let sum = 0;
  for (let z = 0; z < dim; z++) sum += psi[z];
  const sign = sum < 0 ? -1 : 1;
  let psi0: Float64Array;
  if (symmetric) {
    psi0 = new Float64Array(full);
    const c = sign * Math.SQRT1_2;
    for (let z = 0; z < dim; z++) {
      psi0[z] = c * psi[z];
      psi0[full - 1 - z] = c * psi[z];
    }
    ctx.pool.give(psi);
  } else {
    psi0 = psi;
    if (sign < 0) for (let z = 0; z < dim; z++) psi0[z] = -psi0[z];
  }
  return {
    e0: first.energy,
    e1: second.energy,
    psi0,
    iterations: ctx.products,
    krylov0: first.krylov,
    krylov1: second.krylov,
    residual0: first.residual,
    residual1: second.residual,
    converged: first.residual <= tolerance && second.residual <= tolerance,
    restarts: first.cycles - 1 + (second.cycles - 1),
    sector,
    dimension: dim,
    vectors: ctx.pool.allocated,
    stored: capacity,
  };
}

/** The operator in the working space. */
interface Operator {
  readonly dim: number;
  /** Symmetric sector: the top bit's flip is the mirror z → dim − 1 − z. */
  readonly mirror: boolean;
  readonly invn: number;
  readonly d: Float64Array;
}

/** Everything one solve shares; coefficient arrays are indexed by Lanczos step. */
interface Context {
  readonly op: Operator;
  readonly pool: VectorPool;
  /** α_j, β_j (β_0 = 0), σ_j = 1/β_j (σ_0 = 1): v_j = σ_j·u_j for the stored unnormalised u_j. */
  readonly alpha: Float64Array;
  readonly beta: Float64Array;
  readonly sigma: Float64Array;
  /** Ritz coefficient vectors of the lowest and second Ritz values of T_k. */
  readonly s0: Float64Array;
  readonly s1: Float64Array;
  readonly tri: TridiagonalScratch;
  readonly stepOut: Float64Array;
  /** Lanczos vectors stored per run. */
  readonly capacity: number;
  readonly maxIterations: number;
  readonly maxRestarts: number;
  products: number;
}

/** Free vectors of the working dimension, reused across runs so a solve allocates only its peak. */
class VectorPool {
  private readonly free: Float64Array[] = [];
  /** Vectors allocated so far (the peak, since none is ever dropped). */
  allocated = 0;
  constructor(readonly dim: number) {}
  take(): Float64Array {
    const v = this.free.pop();
    if (v !== undefined) return v;
    this.allocated++;
    return new Float64Array(this.dim);
  }
  give(v: Float64Array): void {
    this.free.push(v);
  }
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
    applyH(op, y, 1, y, 0, hy);
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
  const a = sigma * applyH(ctx.op, u, sigma, uprev, gamma, w);
  ctx.products++;
  const as = a * sigma;
  const dim = w.length;
  let nn = 0;
  let c = 0;
  if (locked === null) {
    for (let z = 0; z < dim; z++) {
      const x = w[z] - as * u[z];
      w[z] = x;
      nn += x * x;
    }
  } else {
    for (let z = 0; z < dim; z++) {
      const x = w[z] - as * u[z];
      w[z] = x;
      nn += x * x;
      c += locked[z] * x;
    }
    for (let z = 0; z < dim; z++) w[z] -= c * locked[z];
  }
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

/** Tile of the blocked linear combination: two 2^11-double accumulators stay in a 32 KiB L1 cache. */
const COMBINE_TILE = 2048;

/**
 * y0 = Σ_j s0_j v_j and y1 = Σ_j s1_j v_j over the k Lanczos vectors: the stored ones in one blocked sweep, the rest
 * regenerated from the last two stored vectors with {@link step}.
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
  const dim = y0.length;
  const count = Math.min(k, stored.length);
  for (let t = 0; t < dim; t += COMBINE_TILE) {
    const end = Math.min(dim, t + COMBINE_TILE);
    y0.fill(0, t, end);
    if (y1 !== null) y1.fill(0, t, end);
    for (let j = 0; j < count; j++) {
      const u = stored[j];
      const c0 = s0[j] * sigma[j];
      for (let z = t; z < end; z++) y0[z] += c0 * u[z];
      if (y1 !== null) {
        const c1 = s1[j] * sigma[j];
        for (let z = t; z < end; z++) y1[z] += c1 * u[z];
      }
    }
  }
  if (k <= count) return;
  // Second pass over the tail: u_count … u_{k−1}.
  let uprev = stored[Math.max(0, count - 2)]; // with count = 1, step 0 ignores uprev (β_0 = 0)
  let u = stored[count - 1];
  for (let j = count - 1; j < k - 1; j++) {
    const w = pool.take();
    step(ctx, j, u, uprev, w, locked);
    const c0 = s0[j + 1] * sigma[j + 1];
    for (let z = 0; z < dim; z++) y0[z] += c0 * w[z];
    if (y1 !== null) {
      const c1 = s1[j + 1] * sigma[j + 1];
      for (let z = 0; z < dim; z++) y1[z] += c1 * w[z];
    }
    if (j - 1 >= count) pool.give(uprev);
    uprev = u;
    u = w;
  }
  if (k - 1 >= count) pool.give(u);
  if (k - 2 >= count) pool.give(uprev);
}

/**
 * w = σ·(H u) − γ·uprev with H = −(1/n)ΣX_i + diag(d); returns wᵀu.
 * Eight amplitudes at a time in registers: the three low bit flips stay inside the group of eight, every higher
 * flip reads the partner group (one 64-byte cache line) — one load and one add per amplitude and flip. Measured at
 * n = 20 on the development machine: 0.48 ns per amplitude and flip, against 1.3 ns for one streaming pass per bit
 * and for a cache-tiled variant with an accumulator array.
 */
function applyH(op: Operator, u: Float64Array, sigma: number, uprev: Float64Array, gamma: number, w: Float64Array): number {
  if (op.dim < 8) return applyHSmall(op, u, sigma, uprev, gamma, w);
  return op.mirror
    ? applyHMirror(op.dim, op.d, op.invn, u, sigma, uprev, gamma, w)
    : applyHAll(op.dim, op.d, op.invn, u, sigma, uprev, gamma, w);
}

/** {@link applyH} on the full space (dim ≥ 8). Kept apart from the mirror variant so each loop stays branch-free. */
function applyHAll(
  dim: number,
  d: Float64Array,
  invn: number,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
): number {
  const sd = sigma;
  const sx = -sigma * invn;
  let alpha = 0;
  for (let z = 0; z < dim; z += 8) {
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
    const w0 = sd * d[z] * v0 + sx * s0 - gamma * vprev[z];
    const w1 = sd * d[z + 1] * v1 + sx * s1 - gamma * vprev[z + 1];
    const w2 = sd * d[z + 2] * v2 + sx * s2 - gamma * vprev[z + 2];
    const w3 = sd * d[z + 3] * v3 + sx * s3 - gamma * vprev[z + 3];
    const w4 = sd * d[z + 4] * v4 + sx * s4 - gamma * vprev[z + 4];
    const w5 = sd * d[z + 5] * v5 + sx * s5 - gamma * vprev[z + 5];
    const w6 = sd * d[z + 6] * v6 + sx * s6 - gamma * vprev[z + 6];
    const w7 = sd * d[z + 7] * v7 + sx * s7 - gamma * vprev[z + 7];
    w[z] = w0;
    w[z + 1] = w1;
    w[z + 2] = w2;
    w[z + 3] = w3;
    w[z + 4] = w4;
    w[z + 5] = w5;
    w[z + 6] = w6;
    w[z + 7] = w7;
    alpha += w0 * v0 + w1 * v1 + w2 * v2 + w3 * v3 + w4 * v4 + w5 * v5 + w6 * v6 + w7 * v7;
  }
  return alpha;
}

/** {@link applyH} in the symmetric sector (dim ≥ 8): the top bit's flip reads the mirrored group. */
function applyHMirror(
  dim: number,
  d: Float64Array,
  invn: number,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
): number {
  const sd = sigma;
  const sx = -sigma * invn;
  let alpha = 0;
  for (let z = 0; z < dim; z += 8) {
    const v0 = v[z];
    const v1 = v[z + 1];
    const v2 = v[z + 2];
    const v3 = v[z + 3];
    const v4 = v[z + 4];
    const v5 = v[z + 5];
    const v6 = v[z + 6];
    const v7 = v[z + 7];
    const q = dim - 1 - z;
    let s0 = v1 + v2 + v4 + v[q];
    let s1 = v0 + v3 + v5 + v[q - 1];
    let s2 = v3 + v0 + v6 + v[q - 2];
    let s3 = v2 + v1 + v7 + v[q - 3];
    let s4 = v5 + v6 + v0 + v[q - 4];
    let s5 = v4 + v7 + v1 + v[q - 5];
    let s6 = v7 + v4 + v2 + v[q - 6];
    let s7 = v6 + v5 + v3 + v[q - 7];
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
    const w0 = sd * d[z] * v0 + sx * s0 - gamma * vprev[z];
    const w1 = sd * d[z + 1] * v1 + sx * s1 - gamma * vprev[z + 1];
    const w2 = sd * d[z + 2] * v2 + sx * s2 - gamma * vprev[z + 2];
    const w3 = sd * d[z + 3] * v3 + sx * s3 - gamma * vprev[z + 3];
    const w4 = sd * d[z + 4] * v4 + sx * s4 - gamma * vprev[z + 4];
    const w5 = sd * d[z + 5] * v5 + sx * s5 - gamma * vprev[z + 5];
    const w6 = sd * d[z + 6] * v6 + sx * s6 - gamma * vprev[z + 6];
    const w7 = sd * d[z + 7] * v7 + sx * s7 - gamma * vprev[z + 7];
    w[z] = w0;
    w[z + 1] = w1;
    w[z + 2] = w2;
    w[z + 3] = w3;
    w[z + 4] = w4;
    w[z + 5] = w5;
    w[z + 6] = w6;
    w[z + 7] = w7;
    alpha += w0 * v0 + w1 * v1 + w2 * v2 + w3 * v3 + w4 * v4 + w5 * v5 + w6 * v6 + w7 * v7;
  }
  return alpha;
}

/** {@link applyH} for working spaces of fewer than 8 amplitudes. */
function applyHSmall(
  op: Operator,
  u: Float64Array,
  sigma: number,
  uprev: Float64Array,
  gamma: number,
  w: Float64Array,
): number {
  const dim = op.dim;
  let alpha = 0;
  for (let z = 0; z < dim; z++) {
    let s = 0;
    for (let bit = 1; bit < dim; bit <<= 1) s += u[z ^ bit];
    if (op.mirror) s += u[dim - 1 - z];
    const x = sigma * (op.d[z] * u[z] - op.invn * s) - gamma * uprev[z];
    w[z] = x;
    alpha += x * u[z];
  }
  return alpha;
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

/** Scratch of the tridiagonal routines (LU with partial pivoting of T − σI, as LAPACK dgttrf). */
export class TridiagonalScratch {
  readonly d: Float64Array;
  readonly du: Float64Array;
  readonly du2: Float64Array;
  readonly dl: Float64Array;
  readonly pivot: Uint8Array;
  constructor(size: number) {
    this.d = new Float64Array(size);
    this.du = new Float64Array(size);
    this.du2 = new Float64Array(size);
    this.dl = new Float64Array(size);
    this.pivot = new Uint8Array(size);
  }
}

/**
 * The index-th smallest eigenvalue of the symmetric tridiagonal T_k (diagonal alpha[0..k), off-diagonal
 * beta[1..k)) by Sturm-sequence bisection to full double precision (Barth, Martin & Wilkinson, "Calculation of
 * the eigenvalues of a symmetric tridiagonal matrix by the method of bisection", Numer. Math. 9 (1967)).
 */
export function tridiagonalEigenvalue(alpha: Float64Array, beta: Float64Array, k: number, index: number): number {
  let lo = Infinity;
  let hi = -Infinity;
  let bmax = 0;
  for (let i = 0; i < k; i++) {
    const r = (i > 0 ? Math.abs(beta[i]) : 0) + (i + 1 < k ? Math.abs(beta[i + 1]) : 0);
    lo = Math.min(lo, alpha[i] - r);
    hi = Math.max(hi, alpha[i] + r);
    if (i > 0) bmax = Math.max(bmax, Math.abs(beta[i]));
  }
  const pivmin = Number.MIN_VALUE * 1e10 * Math.max(1, bmax * bmax);
  const eps = Number.EPSILON;
  for (let it = 0; it < 200 && hi - lo > 2 * eps * Math.max(Math.abs(lo), Math.abs(hi)) + pivmin; it++) {
    const mid = 0.5 * (lo + hi);
    // Count eigenvalues below mid from the signs of the LDLᵀ pivots of T − mid·I.
    let count = 0;
    let q = alpha[0] - mid;
    if (Math.abs(q) < pivmin) q = -pivmin;
    if (q < 0) count++;
    for (let i = 1; i < k; i++) {
      q = alpha[i] - mid - (beta[i] * beta[i]) / q;
      if (Math.abs(q) < pivmin) q = -pivmin;
      if (q < 0) count++;
    }
    if (count > index) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Eigenvector of T_k for the eigenvalue approximation theta by two steps of inverse iteration (LU of T − θI with
 * partial pivoting, as LAPACK dgttrf/dgttrs; a zero pivot is replaced by ε‖T‖). Writes the unit vector into
 * out[0..k) and returns its last component (for the Lanczos residual estimate β_k|s_{k−1}|).
 */
export function tridiagonalEigenvector(
  alpha: Float64Array,
  beta: Float64Array,
  k: number,
  theta: number,
  out: Float64Array,
  scratch: TridiagonalScratch,
): number {
  if (k === 1) {
    out[0] = 1;
    return 1;
  }
  const { d, du, du2, dl, pivot } = scratch;
  let scale = 0;
  for (let i = 0; i < k; i++) {
    d[i] = alpha[i] - theta;
    scale = Math.max(scale, Math.abs(alpha[i]) + Math.abs(beta[i]) + (i + 1 < k ? Math.abs(beta[i + 1]) : 0));
  }
  for (let i = 0; i + 1 < k; i++) {
    du[i] = beta[i + 1];
    dl[i] = beta[i + 1];
    du2[i] = 0;
    pivot[i] = 0;
  }
  const tiny = Number.EPSILON * Math.max(scale, Number.MIN_VALUE);
  // Factor.
  for (let i = 0; i + 1 < k; i++) {
    if (Math.abs(d[i]) >= Math.abs(dl[i])) {
      if (d[i] === 0) d[i] = tiny;
      const fact = dl[i] / d[i];
      dl[i] = fact;
      d[i + 1] -= fact * du[i];
    } else {
      const fact = d[i] / dl[i];
      d[i] = dl[i];
      dl[i] = fact;
      const temp = du[i];
      du[i] = d[i + 1];
      d[i + 1] = temp - fact * d[i + 1];
      if (i + 2 < k) {
        du2[i] = du[i + 1];
        du[i + 1] = -fact * du[i + 1];
      }
      pivot[i] = 1;
    }
  }
  if (d[k - 1] === 0) d[k - 1] = tiny;
  for (let i = 0; i < k; i++) out[i] = 1 / Math.sqrt(k) + 1e-3 * Math.sin(i + 1); // a generic start
  for (let round = 0; round < 2; round++) {
    // Solve: forward with the stored multipliers and interchanges, then back substitution.
    for (let i = 0; i + 1 < k; i++) {
      if (pivot[i] === 0) {
        out[i + 1] -= dl[i] * out[i];
      } else {
        const temp = out[i];
        out[i] = out[i + 1];
        out[i + 1] = temp - dl[i] * out[i];
      }
    }
    out[k - 1] /= d[k - 1];
    out[k - 2] = (out[k - 2] - du[k - 2] * out[k - 1]) / d[k - 2];
    for (let i = k - 3; i >= 0; i--) out[i] = (out[i] - du[i] * out[i + 1] - du2[i] * out[i + 2]) / d[i];
    let s = 0;
    for (let i = 0; i < k; i++) s += out[i] * out[i];
    s = 1 / Math.sqrt(s);
    for (let i = 0; i < k; i++) out[i] *= s;
  }
  return out[k - 1];
}
