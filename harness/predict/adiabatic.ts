/**
 * The `adiabatic` predictor: the minimum spectral gap along the interpolation of Farhi, Goldstone, Gutmann, Lapan,
 * Lundgren, Preda, "A quantum adiabatic evolution algorithm applied to random instances of an NP-complete problem",
 * Science 292, 472 (2001):
 *
 *   H(s) = (1 − s)·Σ_i (1 − X_i)/2 + s·C(z),   s ∈ [0, 1],
 *
 * with C(z) = cost(z) − C* (violated clauses for a satisfiable CNF; the Ising energy minus its optimum), so H(1) has
 * ground energy 0. In the working space of numerics/sector-cost.ts: the flip-symmetric sector for Ising models with
 * only even-order terms (the evolution starts in the symmetric |+…+⟩ and H(s) commutes with Π X_i, so only the
 * symmetric levels matter), the full space otherwise. The gap is meaningful only for a unique optimum in that space
 * (one configuration, or one mirror pair); other instances give a `skipped` row saying why.
 *
 * Search: gap(s) = E1(s) − E0(s) on an even grid of `grid` points (endpoints in closed form: gap(0) = 1, or 2 in the
 * symmetric sector where the first excited level has two flipped qubits; gap(1) = the smallest non-zero C), then
 * Brent's minimisation without derivatives (Brent, "Algorithms for Minimization without Derivatives", 1973, ch. 5)
 * on the two grid intervals around the best grid point. A best grid point at either end of the grid is flagged
 * (`edge`): the minimum may lie outside what the grid resolved. A grid can also miss a minimum narrower than its
 * spacing: the default 21 points is a stated choice, not a guarantee.
 *
 * Runtime scale: 1/gap_min², the standard adiabatic-condition scale T ≫ max|⟨1|dH/ds|0⟩|/gap_min² (e.g. Farhi et
 * al., "Quantum computation by adiabatic evolution", arXiv:quant-ph/0001106, §2; the long version of the Science paper,
 * arXiv:quant-ph/0104129, states the same condition), up to the matrix-element factor, which we do not compute. It is reported in
 * `runtime_scale` only, never in `queries`: it is a time scale of an analog evolution (units ħ/energy), not a count of
 * oracle queries, so the study fits it as its own measure and the comparison rates it against no classical measure.
 */
import { costTolerance, type Problem } from "../model/problem.js";
import { LeanVectorPool, basisVectorsFor, leanLowestEigenpairs } from "./numerics/lean-lanczos.js";
import { type SectorCost, countOptima, diagonalOf, isShared, setAffine } from "./numerics/sector-cost.js";
import { ProductTeam, TEAM_MIN_DIM } from "./numerics/product-team.js";
import type { TransverseFieldOperator } from "./numerics/transverse-field.js";

/** Options of {@link adiabaticGap}. */
export interface AdiabaticOptions {
  /** Grid points on [0, 1], endpoints included (≥ 3; default 21, spacing 0.05). */
  readonly grid: number;
  /** Lanczos true-residual tolerance per solve (default 1e-10). */
  readonly tolerance: number;
  /** Largest Krylov dimension of one Lanczos cycle (default 5000). */
  readonly maxIterations: number;
  /** Seed of the Lanczos start vectors. */
  readonly seed: string;
  /** Brent's stopping width on s (default 1e-8). */
  readonly sTolerance: number;
  /** |C − C*| within which a configuration counts as optimal (default costTolerance(problem)). */
  readonly costTolerance?: number;
  /** Bytes beyond the lean working set for stored Lanczos vectors (as SpectralOptions.basisMemory; default 0). */
  readonly basisMemory?: number;
}

/** Defaults of {@link AdiabaticOptions}. */
export const DEFAULT_ADIABATIC_OPTIONS: Readonly<AdiabaticOptions> = Object.freeze({
  grid: 21,
  tolerance: 1e-10,
  maxIterations: 5000,
  seed: "adiabatic",
  sTolerance: 1e-8,
});

/** One adiabatic prediction; every field is a predictions.csv column (energies in units of H(s)). */
export type AdiabaticResult = {
  status: "ok" | "skipped";
  /** Why the row is skipped; empty when ok. */
  reason: string;
  n: number;
  sector: "symmetric" | "all";
  /** Optimal configurations in the full space. */
  optima: number;
  /** s at the minimum gap. */
  s_star: number | null;
  /** min_s E1(s) − E0(s). */
  gap_min: number | null;
  /** E0(s*). */
  e0: number | null;
  /** E1(s*). */
  e1: number | null;
  /** Eigen-solves (Lanczos runs) used. */
  solves: number;
  /** 1/gap_min²: the adiabatic-condition runtime scale, up to matrix-element factors. */
  runtime_scale: number | null;
  /** The best grid point was an end of the grid. */
  edge: boolean;
  grid: number;
  /** Largest true residual over the solves. */
  residual: number;
  /** Every solve met its tolerance. */
  converged: boolean;
};

/** The lowest two levels of H(s) in the working space of one instance. */
export class AdiabaticPath {
  private readonly op: TransverseFieldOperator;
  private readonly pool: LeanVectorPool;
  /** Levels already computed, by s (Brent returns a point it has evaluated). */
  private readonly memo = new Map<number, { e0: number; e1: number }>();
  /** Eigen-solves so far. */
  solves = 0;
  /** Largest true residual so far. */
  residual = 0;
  converged = true;
  /** Gap at s = 0: 1, or 2 in the symmetric sector. */
  readonly gapAtZero: number;
  /** Gap at s = 1: the smallest C − C* above the cost tolerance in the working space. */
  readonly gapAtOne: number;

  constructor(
    private readonly cost: SectorCost,
    private readonly optimum: number,
    tolerance: number,
    private readonly options: AdiabaticOptions,
    private readonly team?: ProductTeam,
  ) {
    this.pool = new LeanVectorPool(cost.dim, isShared(cost));
    if (cost.spare !== null) {
      this.pool.give(cost.spare);
      cost.spare = null;
    }
    this.op = { dim: cost.dim, bits: cost.bits, mirror: cost.symmetric, field: 0, diagonal: diagonalOf(cost) };
    this.gapAtZero = cost.symmetric ? 2 : 1;
    let next = Infinity;
    if (cost.levels !== null) {
      for (let z = 0; z < cost.dim; z++) {
        const c = cost.levels[z] - optimum;
        if (c > tolerance && c < next) next = c;
      }
    } else {
      const v = cost.values as Float64Array;
      for (let z = 0; z < cost.dim; z++) {
        const c = v[z] - optimum;
        if (c > tolerance && c < next) next = c;
      }
    }
    this.gapAtOne = next;
  }

  /** E0(s), E1(s) in the working space (closed forms at s = 0 and s = 1). */
  levels(s: number): { e0: number; e1: number } {
    const n = this.cost.n;
    if (s <= 0) return { e0: 0, e1: this.gapAtZero };
    if (s >= 1) return { e0: 0, e1: this.gapAtOne };
    const known = this.memo.get(s);
    if (known !== undefined) return known;
    this.op.field = (1 - s) / 2;
    // d = s·(C − C*) + (1 − s)·n/2: the constant of Σ(1 − X_i)/2 joins the diagonal.
    setAffine(this.op.diagonal, s, ((1 - s) * n) / 2 - s * this.optimum, Infinity);
    const eig = leanLowestEigenpairs(this.op, {
      tolerance: this.options.tolerance,
      maxIterations: this.options.maxIterations,
      seed: this.options.seed,
      pool: this.pool,
      team: this.team,
      basisVectors: basisVectorsFor(this.cost.dim, this.options.basisMemory ?? 0, this.options.maxIterations),
    });
    this.pool.give(eig.psi0);
    this.solves++;
    this.residual = Math.max(this.residual, eig.residual0, eig.residual1);
    if (!eig.converged) this.converged = false;
    const result = { e0: eig.e0, e1: eig.e1 };
    this.memo.set(s, result);
    return result;
  }

  gap(s: number): number {
    const l = this.levels(s);
    return l.e1 - l.e0;
  }
}

/**
 * Minimum gap of H(s) for one instance (see the module comment).
 * @param cost - from buildSectorCost (its spare buffer is taken into the vector pool).
 * @param optimum - the exact optimum C* of the raw cost.
 */
export function adiabaticGap(problem: Problem, cost: SectorCost, optimum: number, options: AdiabaticOptions, threads = 1): AdiabaticResult {
  const grid = Math.floor(options.grid);
  if (!(grid >= 3)) throw new Error(`adiabatic: grid = ${options.grid} must be at least 3 points`);
  if (!Number.isFinite(optimum)) throw new Error(`adiabatic: optimum = ${optimum} must be finite`);
  const tol = options.costTolerance ?? costTolerance(problem);
  if (cost.min < optimum - tol) throw new Error(`adiabatic: optimum ${optimum} is not the minimum of the cost (which reaches ${cost.min})`);
  const optima = countOptima(cost, optimum, tol);
  const sector = cost.symmetric ? "symmetric" : "all";
  const base: AdiabaticResult = {
    status: "ok", reason: "", n: cost.n, sector, optima, s_star: null, gap_min: null, e0: null, e1: null, solves: 0,
    runtime_scale: null, edge: false, grid, residual: 0, converged: true,
  };
  const unique = cost.symmetric ? 2 : 1;
  if (optima !== unique) {
    const what = cost.symmetric ? `${optima / 2} mirror pairs` : `${optima} configurations`;
    return { ...base, status: "skipped", reason: `not applicable: ${what} reach the optimum; the minimum gap needs a unique optimum${cost.symmetric ? " up to the global flip" : ""}` };
  }
  const team = isShared(cost) && threads > 1 && cost.dim >= TEAM_MIN_DIM ? new ProductTeam(threads) : undefined;
  try {
    return search(base, new AdiabaticPath(cost, optimum, tol, options, team), grid, options);
  } finally {
    team?.close();
  }
}

/** Grid, then Brent (see the module comment). */
function search(base: AdiabaticResult, path: AdiabaticPath, grid: number, options: AdiabaticOptions): AdiabaticResult {
  // 1. Grid.
  const s = (i: number): number => i / (grid - 1);
  let best = 0;
  let bestGap = Infinity;
  for (let i = 0; i < grid; i++) {
    const g = path.gap(s(i));
    if (g < bestGap) {
      bestGap = g;
      best = i;
    }
  }
  // 2. Brent on the grid intervals beside the best point.
  const lo = s(Math.max(0, best - 1));
  const hi = s(Math.min(grid - 1, best + 1));
  const min = brentMinimise((x) => path.gap(x), lo, hi, s(best), bestGap, options.sTolerance);
  const at = path.levels(min.x);
  const gap = at.e1 - at.e0;
  const scale = 1 / (gap * gap);
  const finite = Number.isFinite(scale) && gap > 0;
  return {
    ...base,
    s_star: min.x,
    gap_min: gap,
    e0: at.e0,
    e1: at.e1,
    solves: path.solves,
    runtime_scale: finite ? scale : null,
    edge: best === 0 || best === grid - 1,
    residual: path.residual,
    converged: path.converged,
  };
}

/**
 * Brent's minimisation without derivatives (golden section with parabolic steps; Brent 1973, ch. 5, procedure
 * localmin) on [a, b], started from x with known f(x). Stops when the bracket is within 2·(1e-10·|x| + tol).
 */
export function brentMinimise(
  f: (x: number) => number,
  a: number,
  b: number,
  x0: number,
  f0: number,
  tol: number,
): { x: number; fx: number } {
  const golden = 0.5 * (3 - Math.sqrt(5));
  let x = x0;
  let w = x0;
  let v = x0;
  let fx = f0;
  let fw = f0;
  let fv = f0;
  let d = 0;
  let e = 0;
  for (let iter = 0; iter < 200; iter++) {
    const m = 0.5 * (a + b);
    const t = 1e-10 * Math.abs(x) + tol;
    const t2 = 2 * t;
    if (Math.abs(x - m) <= t2 - 0.5 * (b - a)) break;
    let p = 0;
    let q = 0;
    let r = 0;
    if (Math.abs(e) > t) {
      r = (x - w) * (fx - fv);
      q = (x - v) * (fx - fw);
      p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      r = e;
      e = d;
    }
    if (Math.abs(p) < Math.abs(0.5 * q * r) && p > q * (a - x) && p < q * (b - x)) {
      // Parabolic step.
      d = p / q;
      const u = x + d;
      if (u - a < t2 || b - u < t2) d = x < m ? t : -t;
    } else {
      // Golden-section step.
      e = (x < m ? b : a) - x;
      d = golden * e;
    }
    const u = x + (Math.abs(d) >= t ? d : d > 0 ? t : -t);
    const fu = f(u);
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, fx };
}
