/**
 * The `spectral` predictor: exact numerics of the two-stage spectral method of arXiv:2212.01513 (prepare the
 * ground state ψ_b of an intermediate Hamiltonian from |+⟩, then measure in the computational basis, both stages
 * amplified), in the normalisation fixed by DESIGN.md §4:
 *
 *   x(z)   = (C(z) − C̄)/|C* − C̄|           C̄ = exact mean over all 2^n z, C* = optimum, so x(z*) = −1
 *   g_η(x) = min(0, (x + η)/(1 − η))        costs shallower than η of the optimum flattened to 0, g(−1) = −1
 *   H_b    = −(1/n) Σ_i X_i + b·g_η(x(z))   driver ground state |+⟩ with energy −1
 *
 * Lowest two eigenpairs by matrix-free Lanczos (lanczos.ts), in the flip-symmetric sector when the cost has the
 * global flip symmetry C(z) = C(~z) (Ising models with only even-order terms), otherwise in the full space; the
 * `sector` column says which, and so in which sector the gap E1 − E0 was measured.
 *
 * Predicted cost, parts reported separately so a reader can recombine them:
 *   rounds       = 1/(|⟨+|ψ_b⟩|·√P_opt)              amplitude amplification of both stages
 *   phase_factor = ⌈π·n/gap⌉                          see {@link spectralPhaseFactor} (a modelling assumption)
 *   queries      = rounds × phase_factor
 */
import { type Problem, costTolerance, sizeOf } from "../model/problem.js";
import { DEFAULT_LANCZOS_OPTIONS, LanczosWorkspace, type LanczosSector, lowestEigenpairs } from "./lanczos.js";

/** Options of {@link spectralPredict} and {@link spectralScan}. */
export interface SpectralOptions {
  /** Strength b ≥ 0 of the filtered cost in H_b (default 0.7). */
  readonly b: number;
  /** Filter depth η in [0, 1) (default 0.5): normalised costs above −η are flattened to 0. */
  readonly eta: number;
  /** Lanczos residual tolerance ‖Hψ − Eψ‖₂ for both eigenpairs (energy units of H_b; default 1e-9). */
  readonly tolerance: number;
  /**
   * Smallest gap E1 − E0 (energy units of H_b) for which a row counts as resolved, gap_ok (default 1e-6): a
   * thousand times the default residual tolerance, so the gap is far above the eigenvalue error (≤ residual)
   * and the scan's choice of b is never made on an unresolved gap.
   */
  readonly gapThreshold: number;
  /** Largest Krylov dimension of one Lanczos cycle (default 5000). */
  readonly maxIterations?: number;
  /** Seed of the Lanczos start vector (default "spectral"); results agree across seeds to the tolerance. */
  readonly seed?: string;
  /** |C − C*| within which a configuration counts as optimal (default: costTolerance(problem)). */
  readonly costTolerance?: number;
  /**
   * Force the sector; by default "symmetric" exactly when the cost has the global flip symmetry C(z) = C(~z)
   * (decided from the cost vector, so the same for every b of a scan).
   */
  readonly sector?: LanczosSector;
  /**
   * Bytes beyond the memory-lean working set that the lean path may fill with Lanczos vectors, saving the second
   * pass's products for those steps (default 0: the lean minimum; numerics/lean-lanczos.ts basisVectors).
   */
  readonly basisMemory?: number;
}

/** Defaults of {@link SpectralOptions} (the command line's --b, --eta, and the tolerance). */
export const DEFAULT_SPECTRAL_OPTIONS: Readonly<{
  b: number;
  eta: number;
  tolerance: number;
  gapThreshold: number;
  maxIterations: number;
}> = Object.freeze({
  b: 0.7,
  eta: 0.5,
  tolerance: 1e-9,
  gapThreshold: 1e-6,
  maxIterations: DEFAULT_LANCZOS_OPTIONS.maxIterations,
});

/** One prediction; every field is a journal field and a predictions.csv column (energies in units of H_b; rounds and iterations appear as state_preparations and lanczos_products, report/tables.ts `PREDICTION_COLUMNS`). */
export type SpectralResult = {
  /** Strength of the filtered cost. */
  b: number;
  /** Filter depth. */
  eta: number;
  /** Ground energy E0 of H_b. */
  e0: number;
  /** First excited energy E1 of H_b within `sector`. */
  e1: number;
  /** E1 − E0. */
  gap: number;
  /** |⟨+|ψ_b⟩|², overlap of the ground state with the driver's ground state. */
  overlap_start: number;
  /** P_opt = Σ_{z*}|⟨z*|ψ_b⟩|² over the optimal configurations z*. */
  overlap_opt: number;
  /** Number of optimal configurations z* (|C − C*| ≤ cost tolerance). */
  optima: number;
  /** 1/(|⟨+|ψ_b⟩|·√P_opt). */
  rounds: number | null;
  /** ⌈π·n/gap⌉ ({@link spectralPhaseFactor}). */
  phase_factor: number | null;
  /** rounds × phase_factor. */
  queries: number | null;
  /** log₂ of queries. */
  queries_log2: number | null;
  /** Products with H_b over the whole solve (both passes, both eigenpairs, residual checks). */
  iterations: number;
  /** max(residual0, residual1). */
  residual: number;
  /** True residual ‖Hψ0 − E0ψ0‖₂. */
  residual0: number;
  /** True residual of the first excited pair. */
  residual1: number;
  /** Both residuals within the tolerance. */
  converged: boolean;
  /** gap ≥ gap_threshold (and the solve converged). */
  gap_ok: boolean;
  /** The threshold used for gap_ok. */
  gap_threshold: number;
  /** Sector of E1: "symmetric" (flip-symmetric subspace) or "all". */
  sector: LanczosSector;
  /** Exact mean cost C̄ over all 2^n configurations. */
  mean_cost: number;
  /** Optimum C* used in the normalisation. */
  optimum: number;
};

/** Result of {@link spectralScan}. */
export interface SpectralScan {
  /** One row per b, in the order given. */
  readonly rows: SpectralResult[];
  /** Index of the row with the fewest queries among rows with gap_ok; −1 when no row qualifies. */
  readonly best: number;
}

/**
 * Phase-estimation factor: ⌈π·n/gap⌉ uses of the cost oracle per round.
 *
 * Modelling assumption (ours, matching issue 5's "factor ∝ n/gap"; not a bound derived in arXiv:2212.01513):
 * reflecting about ψ_b needs a phase estimation that resolves E0 from E1, i.e. evolution under H_b for a time
 * π/gap, and we charge n cost-oracle queries per unit of that time (a product formula that applies the cost phase
 * once beside each of the driver's n single-qubit terms). Other models (e.g. a qubitised walk with block-encoding
 * normalisation 1 + b, giving ≈ π(1 + b)/gap) are recombined from the gap, b and n columns.
 * @param n - number of qubits.
 * @param gap - E1 − E0 in units of H_b (> 0).
 */
export function spectralPhaseFactor(n: number, gap: number): number {
  return Math.ceil((Math.PI * n) / gap);
}

/** Normalisation data shared by every b of one instance. */
interface Normalised {
  readonly n: number;
  readonly mean: number;
  readonly scale: number;
  readonly optimum: number;
  readonly costTolerance: number;
  readonly optima: number;
  readonly symmetric: boolean;
}

/**
 * The spectral prediction for one instance at one b.
 * @param problem - the instance (n ≥ 1; n ≤ 24, or 25 in the symmetric sector, for memory).
 * @param costs - C(z) for all z in [0, 2^n) (from fillCostVector).
 * @param optimum - the exact optimum C* (from exhaustive search).
 * @param options - b, eta, tolerance, gapThreshold (see {@link DEFAULT_SPECTRAL_OPTIONS}).
 * @throws Error for a constant cost (C* = C̄), an optimum that is not the minimum of `costs`, or bad options.
 */
export function spectralPredict(
  problem: Problem,
  costs: Float64Array,
  optimum: number,
  options: SpectralOptions,
): SpectralResult {
  const norm = normalise(problem, costs, optimum, options);
  const diagonal = new Float64Array(costs.length);
  return solve(norm, costs, diagonal, options, undefined);
}

/**
 * {@link spectralPredict} for each b in `bValues` (one diagonal buffer reused), and the b minimising queries among
 * rows whose gap passes the threshold.
 */
export function spectralScan(
  problem: Problem,
  costs: Float64Array,
  optimum: number,
  bValues: readonly number[],
  options: SpectralOptions,
): SpectralScan {
  if (bValues.length === 0) throw new Error("spectral: the b scan is empty");
  const norm = normalise(problem, costs, optimum, options);
  const diagonal = new Float64Array(costs.length);
  // One workspace for the whole scan: memory touched once, Lanczos basis stored from the second b on.
  const workspace = new LanczosWorkspace();
  const rows: SpectralResult[] = [];
  let best = -1;
  for (const b of bValues) {
    const row = solve(norm, costs, diagonal, { ...options, b }, workspace);
    rows.push(row);
    if (row.gap_ok && row.queries !== null && (best < 0 || row.queries < (rows[best].queries as number))) {
      best = rows.length - 1;
    }
  }
  return { rows, best };
}

/** Validates the inputs and computes C̄, |C* − C̄| and the number of optima. */
function normalise(problem: Problem, costs: Float64Array, optimum: number, options: SpectralOptions): Normalised {
  const n = sizeOf(problem);
  if (!Number.isInteger(n) || n < 1) throw new Error(`spectral: n = ${n} must be at least 1`);
  if (costs.length !== 2 ** n) throw new Error(`spectral: cost vector length ${costs.length}, expected 2^${n}`);
  checkOptions(options);
  const tol = options.costTolerance ?? costTolerance(problem);
  if (!(tol >= 0)) throw new Error(`spectral: costTolerance = ${tol} must be ≥ 0`);
  if (!Number.isFinite(optimum)) throw new Error(`spectral: optimum = ${optimum} must be finite`);
  // Neumaier-compensated sum: exact for CNF integers, ~1 ulp for Ising energies.
  let sum = 0;
  let carry = 0;
  let min = Infinity;
  let maxAbs = 0;
  let optima = 0;
  for (let z = 0; z < costs.length; z++) {
    const c = costs[z];
    if (!Number.isFinite(c)) throw new Error(`spectral: cost of configuration ${z} is not finite (${c})`);
    if (Math.abs(c) > maxAbs) maxAbs = Math.abs(c);
    const t = sum + c;
    carry += Math.abs(sum) >= Math.abs(c) ? sum - t + c : c - t + sum;
    sum = t;
    if (c < min) min = c;
    if (Math.abs(c - optimum) <= tol) optima++;
  }
  const mean = (sum + carry) / costs.length;
  if (min < optimum - tol) {
    throw new Error(`spectral: optimum ${optimum} is not the minimum of the cost vector (which reaches ${min})`);
  }
  if (optima === 0) throw new Error(`spectral: no configuration has the optimum cost ${optimum} (tolerance ${tol})`);
  const scale = Math.abs(optimum - mean);
  // Constant: every configuration is optimal (within tolerance). Otherwise some cost exceeds C* + tol, so C̄ > C*.
  if (optima === costs.length || !(scale > 0)) {
    throw new Error(
      `spectral: the cost is constant (optimum ${optimum} = mean ${mean}), so x = (C − C̄)/|C* − C̄| is undefined`,
    );
  }
  return { n, mean, scale, optimum, costTolerance: tol, optima, symmetric: isFlipSymmetric(costs, 1e-12 * maxAbs) };
}

function checkOptions(o: SpectralOptions): void {
  if (!(Number.isFinite(o.b) && o.b >= 0)) throw new Error(`spectral: b = ${o.b} must be a finite number ≥ 0`);
  if (!(o.eta >= 0 && o.eta < 1)) throw new Error(`spectral: eta = ${o.eta} must lie in [0, 1)`);
  if (!(o.tolerance > 0)) throw new Error(`spectral: tolerance = ${o.tolerance} must be > 0`);
  if (!(o.gapThreshold >= 0)) throw new Error(`spectral: gapThreshold = ${o.gapThreshold} must be ≥ 0`);
}

/** Builds diag = b·g_η(x(z)) into `diagonal`, solves, and assembles the row. */
function solve(
  norm: Normalised,
  costs: Float64Array,
  diagonal: Float64Array,
  options: SpectralOptions,
  workspace: LanczosWorkspace | undefined,
): SpectralResult {
  checkOptions(options);
  const { n, mean, scale, optimum, costTolerance: tol } = norm;
  const { b, eta } = options;
  const invScale = 1 / scale;
  const invDepth = 1 / (1 - eta);
  const size = costs.length;
  for (let z = 0; z < size; z++) {
    const x = (costs[z] - mean) * invScale;
    const g = (x + eta) * invDepth;
    diagonal[z] = g < 0 ? b * g : 0;
  }
  const sector: LanczosSector = options.sector ?? (norm.symmetric ? "symmetric" : "all");
  const eig = lowestEigenpairs(n, diagonal, {
    tolerance: options.tolerance,
    maxIterations: options.maxIterations ?? DEFAULT_SPECTRAL_OPTIONS.maxIterations,
    seed: options.seed ?? "spectral",
    sector,
    workspace,
  });
  const psi = eig.psi0;
  let amplitudeSum = 0;
  let pOpt = 0;
  for (let z = 0; z < size; z++) {
    const a = psi[z];
    amplitudeSum += a;
    if (Math.abs(costs[z] - optimum) <= tol) pOpt += a * a;
  }
  const overlapStart = (amplitudeSum * amplitudeSum) / size;
  const gap = eig.e1 - eig.e0;
  const roundsRaw = 1 / (Math.sqrt(overlapStart) * Math.sqrt(pOpt));
  const rounds = Number.isFinite(roundsRaw) ? roundsRaw : null;
  const phase = gap > 0 ? spectralPhaseFactor(n, gap) : null;
  const queries = rounds !== null && phase !== null && Number.isFinite(rounds * phase) ? rounds * phase : null;
  return {
    b,
    eta,
    e0: eig.e0,
    e1: eig.e1,
    gap,
    overlap_start: overlapStart,
    overlap_opt: pOpt,
    optima: norm.optima,
    rounds,
    phase_factor: phase,
    queries,
    queries_log2: queries === null ? null : Math.log2(queries),
    iterations: eig.iterations,
    residual: Math.max(eig.residual0, eig.residual1),
    residual0: eig.residual0,
    residual1: eig.residual1,
    converged: eig.converged,
    gap_ok: eig.converged && gap >= options.gapThreshold,
    gap_threshold: options.gapThreshold,
    sector: eig.sector,
    mean_cost: mean,
    optimum,
  };
}

/**
 * True when C(z) = C(~z) for all z within `slack` (10^−12 of max|C|: the rounding of an even-order Ising energy
 * computed along different paths; CNF counts are exact), so every H_b commutes with Π_i X_i.
 */
function isFlipSymmetric(c: Float64Array, slack: number): boolean {
  const size = c.length;
  for (let z = 0; z < size / 2; z++) if (Math.abs(c[z] - c[size - 1 - z]) > slack) return false;
  return true;
}
