/**
 * Amplitude amplification of one randomised classical trial (a Schöning walk, an annealing run) after
 * Brassard, Høyer, Mosca and Tapp, "Quantum amplitude amplification and estimation",
 * arXiv:quant-ph/0005055 (BHMT). The trial, run reversibly as a unitary A with success amplitude √p, is
 * amplified instead of repeated.
 *
 * Unit: one reversible trial run (one application of A or A†). Checking the measured outcome is one
 * evaluation of the cost function, a small part of one trial, and is not counted.
 */
import type { Predictor } from "./types.js";

/** Result of {@link amplifyTrial}; every field is a predictions.csv column (under the name report/tables.ts `PREDICTION_COLUMNS` gives it where this one is ambiguous, e.g. p → trial_success_p). */
export type AmplifiedTrial = {
  /** Per-trial success probability of the classical trial. */
  p: number;
  /** Lower end of p's interval (defaults to p). */
  p_low: number;
  /** Upper end of p's interval (defaults to p). */
  p_high: number;
  /** θ_p = arcsin √p, radians. */
  theta: number | null;
  /** Amplification rounds per attempt, m* = ⌊π/(4θ_p)⌋. */
  rounds: number | null;
  /** Reversible trial runs per attempt, 2m* + 1 (A once, then A and A† once per round). */
  trial_runs: number | null;
  /** Success probability of one attempt, sin²((2m*+1)θ_p). */
  success_probability: number | null;
  /** Expected reversible trial runs until success, (2m*+1)/sin²((2m*+1)θ_p). */
  queries: number | null;
  /** Smallest expected runs over p ∈ [p_low, p_high]. */
  queries_low: number | null;
  /** Largest expected runs over p ∈ [p_low, p_high]; null when p_low = 0 (unbounded). */
  queries_high: number | null;
  /** Expected classical trial runs without amplification, 1/p, for comparison. */
  queries_unamplified: number | null;
  /** Expected elementary steps: work per trial × queries (null without work per trial). */
  steps: number | null;
  /** work per trial × queries_low. */
  steps_low: number | null;
  /** work per trial × queries_high. */
  steps_high: number | null;
  /** log₂ of queries. */
  queries_log2: number | null;
  /** Empty when the prediction applies; otherwise why it does not (p = 0: no trial ever succeeded). */
  reason: string;
};

/**
 * Expected reversible trial runs of amplitude amplification with repetition (BHMT, Theorem 2 and the
 * discussion of known p): an attempt prepares A|0⟩, applies m* = ⌊π/(4θ_p)⌋ rounds of Q = −A S₀ A⁻¹ S_χ
 * (each round one A and one A†), measures and checks; attempts repeat until one succeeds. So one attempt
 * costs 2m*+1 trial runs, succeeds with probability sin²((2m*+1)θ_p), and the expected cost is
 * (2m*+1)/sin²((2m*+1)θ_p) trial runs — for small p ≈ (π/4)/√p, against 1/p classical repetitions.
 *
 * For p ≥ 1/4 the formula gives m* = 1 (p ∈ [1/4, 1/2)) or m* = 0 (p ≥ 1/2, plain sampling); for p just
 * below 1/2 one round is worse than plain repetition, which `queries_unamplified` shows.
 *
 * The interval is the exact minimum and maximum of the expected runs over p ∈ [pLow, pHigh]: the function is
 * a sawtooth in p (not monotone), so the ends of p's interval alone would not bound it; lower p means more
 * runs overall.
 *
 * @param p - measured per-trial success probability in [0, 1]; 0 gives nulls and a reason.
 * @param pLow - lower end of p's interval (e.g. Wilson 95%); default p.
 * @param pHigh - upper end of p's interval; default p.
 * @param workPerTrial - elementary steps of one trial (flips, flip attempts); optional.
 */
export function amplifyTrial(p: number, pLow = p, pHigh = p, workPerTrial?: number): AmplifiedTrial {
  for (const [name, v] of [["p", p], ["pLow", pLow], ["pHigh", pHigh]] as const) {
    if (!(v >= 0 && v <= 1)) throw new RangeError(`${name} must be a probability in [0, 1], got ${v}`);
  }
  if (!(pLow <= p && p <= pHigh)) throw new RangeError(`need pLow ≤ p ≤ pHigh, got ${pLow}, ${p}, ${pHigh}`);
  if (workPerTrial !== undefined && !(workPerTrial >= 0 && Number.isFinite(workPerTrial))) {
    throw new RangeError(`workPerTrial must be a finite number ≥ 0, got ${workPerTrial}`);
  }
  const work = workPerTrial ?? null;
  if (p === 0) {
    return {
      p,
      p_low: pLow,
      p_high: pHigh,
      theta: null,
      rounds: null,
      trial_runs: null,
      success_probability: null,
      queries: null,
      queries_low: pHigh > 0 ? expectedRunsExtremes(0, thetaOf(pHigh)).min : null,
      queries_high: null,
      queries_unamplified: null,
      steps: null,
      steps_low: null,
      steps_high: null,
      queries_log2: null,
      reason: "p = 0: no trial succeeded, nothing to amplify",
    };
  }
  const theta = thetaOf(p);
  const rounds = roundsOf(theta);
  const runs = 2 * rounds + 1;
  const success = sin2(runs * theta);
  const queries = runs / success;
  const ext = expectedRunsExtremes(thetaOf(pLow), thetaOf(pHigh));
  const high = pLow > 0 ? ext.max : null;
  return {
    p,
    p_low: pLow,
    p_high: pHigh,
    theta,
    rounds,
    trial_runs: runs,
    success_probability: success,
    queries,
    queries_low: ext.min,
    queries_high: high,
    queries_unamplified: 1 / p,
    steps: work === null ? null : work * queries,
    steps_low: work === null ? null : work * ext.min,
    steps_high: work === null || high === null ? null : work * high,
    queries_log2: Math.log2(queries),
    reason: "",
  };
}

/**
 * log₂ of the per-variable growth factor of Schöning's walk amplified by amplitude amplification,
 * (1/2)·log₂(2(k−1)/k): Schöning's trial succeeds with probability ≈ (k/(2(k−1)))^n (Schöning, FOCS 1999),
 * so amplification needs ≈ (2(k−1)/k)^{n/2} trial runs (Ambainis, "Quantum search algorithms",
 * arXiv:quant-ph/0504012; BHMT). For 3-SAT: (4/3)^{n/2}, exponent ≈ 0.2075 per variable.
 *
 * @param k - clause width, integer ≥ 2.
 */
export function schoeningAmplifiedExponent(k: number): number {
  if (!Number.isInteger(k) || k < 2) throw new RangeError(`k must be an integer ≥ 2, got ${k}`);
  return 0.5 * Math.log2((2 * (k - 1)) / k);
}

/** Number of rounds m* = ⌊π/(4θ)⌋ for θ in (0, π/2]. */
function roundsOf(theta: number): number {
  return Math.floor(Math.PI / (4 * theta));
}

function thetaOf(p: number): number {
  return Math.atan2(Math.sqrt(p), Math.sqrt(1 - p));
}

function sin2(x: number): number {
  const s = Math.sin(x);
  return s * s;
}

/** Expected runs E(θ) = (2m+1)/sin²((2m+1)θ) with m = ⌊π/(4θ)⌋. */
function expectedRuns(theta: number): number {
  const runs = 2 * roundsOf(theta) + 1;
  return runs / sin2(runs * theta);
}

/**
 * Exact extremes of E(θ) over θ ∈ [θa, θb] (θa may be 0: then only the minimum is meaningful).
 * On the piece where m* = m (θ ∈ (π/(4(m+1)), π/(4m)]) E is smallest, 2m+1, at (2m+1)θ = π/2 and largest at the
 * piece's ends; at the breakpoint θ = π/(4m) it reaches B(m) = (2m+1)/cos²(π/(4m)), and just past it (piece m−1)
 * it is lower. B(1) = 6 > B(2) ≈ 5.86 < B(3) < B(4) < …, so the largest breakpoint value in range is at the
 * smallest or the largest m in range; the smallest minimum in range belongs to the smallest m whose minimiser lies
 * in range (2m+1 grows with m).
 */
function expectedRunsExtremes(thetaA: number, thetaB: number): { min: number; max: number } {
  const eB = expectedRuns(thetaB);
  const eA = thetaA > 0 ? expectedRuns(thetaA) : Infinity;
  let min = Math.min(eA, eB);
  let max = Math.max(eA, eB);
  const mB = roundsOf(thetaB);
  const mA = thetaA > 0 ? roundsOf(thetaA) : Infinity;
  if (mA > mB && Number.isFinite(mA)) {
    const breakpoint = (m: number): number => (2 * m + 1) / Math.cos(Math.PI / (4 * m)) ** 2;
    max = Math.max(max, breakpoint(mB + 1), breakpoint(mA));
  }
  const mMin = Math.max(1, Math.ceil((Math.PI / (2 * thetaB) - 1) / 2));
  const thetaMin = Math.PI / (2 * (2 * mMin + 1));
  if (thetaMin >= thetaA && thetaMin <= thetaB) min = Math.min(min, 2 * mMin + 1);
  return { min, max };
}

/**
 * Amplitude amplification of one randomised solver's trial, on the predictor registry: named
 * `amplified-SOLVER`, computed from every measured cell of that solver.
 */
export function amplifiedPredictor(solver: string, description: string): Predictor {
  return {
    name: `amplified-${solver}`,
    description,
    options: [],
    amplifies: solver,
    appliesTo: () => null,
    fromTrials: (r) => ({ ...amplifyTrial(r.p, r.pLow, r.pHigh, r.workPerTrial), run_length: r.runLength }),
  };
}
