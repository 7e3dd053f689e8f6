/**
 * The spectral predictor (spectral.ts documents the method and the columns) on the memory-lean path: the cost in
 * its working space (numerics/sector-cost.ts: one byte per amplitude for CNF, the flip-symmetric sector for even
 * Ising models), the operator's diagonal b·g_η(x(z)) computed from it on the fly (numerics/transverse-field.ts), and
 * the Lanczos solve keeping six vectors (numerics/lean-lanczos.ts). Same row as spectralPredict; it agrees with it to
 * the eigen-solver's tolerance (test/spectral-lean.test.ts).
 */
import { costTolerance, type Problem } from "../model/problem.js";
import { LeanVectorPool, basisVectorsFor, leanLowestEigenpairs } from "./numerics/lean-lanczos.js";
import { type SectorCost, countOptima, diagonalOf, isShared, optimalWeight, setAffine } from "./numerics/sector-cost.js";
import { ProductTeam, TEAM_MIN_DIM } from "./numerics/product-team.js";
import type { TransverseFieldOperator } from "./numerics/transverse-field.js";
import { DEFAULT_SPECTRAL_OPTIONS, type SpectralOptions, type SpectralResult, spectralPhaseFactor } from "./spectral.js";

/**
 * The spectral rows for each b of `bValues` on one instance (one operator and vector pool for the whole scan).
 * @param cost - from buildSectorCost; its spare buffer, if any, is taken into the vector pool.
 * @param optimum - the exact optimum C*.
 * @throws Error for a constant cost, an optimum that is not the minimum, or bad options.
 */
export function spectralLeanScan(
  problem: Problem,
  cost: SectorCost,
  optimum: number,
  bValues: readonly number[],
  options: Omit<SpectralOptions, "b" | "sector">,
  threads = 1,
): SpectralResult[] {
  const tol = options.costTolerance ?? costTolerance(problem);
  if (!Number.isFinite(optimum)) throw new Error(`spectral: optimum = ${optimum} must be finite`);
  if (cost.min < optimum - tol) throw new Error(`spectral: optimum ${optimum} is not the minimum of the cost vector (which reaches ${cost.min})`);
  const optima = countOptima(cost, optimum, tol);
  if (optima === 0) throw new Error(`spectral: no configuration has the optimum cost ${optimum} (tolerance ${tol})`);
  const mean = cost.mean;
  const scale = Math.abs(optimum - mean);
  if (optima === 2 ** cost.n || !(scale > 0)) {
    throw new Error(`spectral: the cost is constant (optimum ${optimum} = mean ${mean}), so x = (C − C̄)/|C* − C̄| is undefined`);
  }
  const { eta } = options;
  if (!(eta >= 0 && eta < 1)) throw new Error(`spectral: eta = ${eta} must lie in [0, 1)`);
  if (!(options.tolerance > 0)) throw new Error(`spectral: tolerance = ${options.tolerance} must be > 0`);
  const shared = isShared(cost);
  const team = shared && threads > 1 && cost.dim >= TEAM_MIN_DIM ? new ProductTeam(threads) : undefined;
  try {
    return scan(problem, cost, optimum, bValues, options, tol, optima, mean, scale, shared, team);
  } finally {
    team?.close();
  }
}

/** The rows of {@link spectralLeanScan} once the inputs are checked. */
function scan(
  problem: Problem,
  cost: SectorCost,
  optimum: number,
  bValues: readonly number[],
  options: Omit<SpectralOptions, "b" | "sector">,
  tol: number,
  optima: number,
  mean: number,
  scale: number,
  shared: boolean,
  team: ProductTeam | undefined,
): SpectralResult[] {
  const { eta } = options;
  const pool = new LeanVectorPool(cost.dim, shared);
  if (cost.spare !== null) {
    pool.give(cost.spare);
    cost.spare = null;
  }
  const op: TransverseFieldOperator = { dim: cost.dim, bits: cost.bits, mirror: cost.symmetric, field: 1 / cost.n, diagonal: diagonalOf(cost) };
  const rows: SpectralResult[] = [];
  for (const b of bValues) {
    if (!(Number.isFinite(b) && b >= 0)) throw new Error(`spectral: b = ${b} must be a finite number ≥ 0`);
    // d = b·min(0, (x + η)/(1 − η)), x = (C − C̄)/scale: an affine map of C clamped at 0.
    const a = b / (scale * (1 - eta));
    setAffine(op.diagonal, a, b * (eta - mean / scale) / (1 - eta), 0);
    const eig = leanLowestEigenpairs(op, {
      tolerance: options.tolerance,
      maxIterations: options.maxIterations ?? DEFAULT_SPECTRAL_OPTIONS.maxIterations,
      seed: options.seed ?? "spectral",
      pool,
      team,
      basisVectors: basisVectorsFor(cost.dim, options.basisMemory ?? 0, options.maxIterations ?? DEFAULT_SPECTRAL_OPTIONS.maxIterations),
    });
    const psi = eig.psi0;
    let sum = 0;
    for (let z = 0; z < cost.dim; z++) sum += psi[z];
    // Full-space Σψ is Σ_s·√2 in the symmetric sector over 2^n = 2·dim states: either way (Σ)²/dim.
    const overlapStart = (sum * sum) / cost.dim;
    const pOpt = optimalWeight(cost, psi, optimum, tol);
    pool.give(psi);
    const gap = eig.e1 - eig.e0;
    const roundsRaw = 1 / (Math.sqrt(overlapStart) * Math.sqrt(pOpt));
    const rounds = Number.isFinite(roundsRaw) ? roundsRaw : null;
    const phase = gap > 0 ? spectralPhaseFactor(cost.n, gap) : null;
    const queries = rounds !== null && phase !== null && Number.isFinite(rounds * phase) ? rounds * phase : null;
    rows.push({
      b,
      eta,
      e0: eig.e0,
      e1: eig.e1,
      gap,
      overlap_start: overlapStart,
      overlap_opt: pOpt,
      optima,
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
      sector: cost.symmetric ? "symmetric" : "all",
      mean_cost: mean,
      optimum,
    });
  }
  return rows;
}
