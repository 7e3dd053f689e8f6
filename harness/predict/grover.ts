/**
 * Query counts of Grover search on N = 2^n configurations with M marked ones (the optima), after Boyer,
 * Brassard, Høyer and Tapp, "Tight bounds on quantum searching", arXiv:quant-ph/9605034 (BBHT).
 *
 * Unit everywhere: one oracle query. A Grover iteration (oracle phase flip, then reflection about the
 * uniform state) makes exactly one query; checking a measured string classically (is it an optimum?) is
 * one more evaluation of the same predicate and is counted as one query too.
 *
 * Angles: sin²θ = M/N. We compute θ = atan2(√M, √(N−M)), which keeps full relative precision for tiny
 * M/N (n up to ≈ 60) and near M = N, where asin(√(M/N)) loses digits.
 */
import type { Predictor } from "./types.js";

/** Angle θ of Grover's rotation, sin²θ = M/N, for N = 2^n and M = optima (0 ≤ M ≤ N). */
export function groverTheta(n: number, optima: number): number {
  checkSpace(n, optima);
  const N = 2 ** n;
  return Math.atan2(Math.sqrt(optima), Math.sqrt(N - optima));
}

/** Probability of measuring a marked string after k Grover iterations: sin²((2k+1)θ) (BBHT, Lemma 1). */
export function groverSuccessProbability(k: number, theta: number): number {
  const s = Math.sin((2 * k + 1) * theta);
  return s * s;
}

/** Result of {@link groverKnown}; every field is a predictions.csv column (under the name report/tables.ts `PREDICTION_COLUMNS` gives it where this one is ambiguous, e.g. p → trial_success_p). */
export type GroverKnown = {
  /** Number of optima M (marked strings) the oracle marks. */
  optima: number;
  /** θ in radians, sin²θ = M/N. */
  theta: number | null;
  /** Grover iterations per attempt, k* = ⌊π/(4θ)⌋. */
  k_star: number | null;
  /** Probability that one attempt measures an optimum, sin²((2k*+1)θ). */
  success_probability: number | null;
  /** Oracle queries per attempt: k* iterations (one query each) + 1 classical check. */
  queries_per_attempt: number | null;
  /** Expected attempts until the first success, 1/P (geometric). */
  expected_attempts: number | null;
  /** Expected oracle queries until success, (k*+1)/P. */
  queries: number | null;
  /** log₂ of queries. */
  queries_log2: number | null;
  /** Empty when the prediction applies; otherwise why it does not (e.g. no optimum is marked). */
  reason: string;
};

/**
 * Grover search with a known number of optima M among N = 2^n strings (BBHT, section 3): each attempt runs
 * k* = ⌊π/(4θ)⌋ iterations, measures, and checks the outcome; attempts repeat until one succeeds.
 *
 * Counted: k* oracle queries (one per Grover iteration) plus 1 query for the classical check of the
 * measured string, per attempt; expected attempts 1/P with P = sin²((2k*+1)θ). So
 * queries = (k* + 1)/P. For M > N/2 we get k* = 0 and plain sampling (1/P = N/M checks).
 *
 * @param n - number of binary variables (N = 2^n), integer ≥ 0.
 * @param optima - number of optimal strings M, integer in [0, 2^n]. M = 0 gives queries = null and a reason.
 */
export function groverKnown(n: number, optima: number): GroverKnown {
  checkSpace(n, optima);
  if (optima === 0) {
    return {
      optima,
      theta: null,
      k_star: null,
      success_probability: null,
      queries_per_attempt: null,
      expected_attempts: null,
      queries: null,
      queries_log2: null,
      reason: "no marked string (M = 0): search never succeeds",
    };
  }
  const theta = groverTheta(n, optima);
  const kStar = Math.floor(Math.PI / (4 * theta));
  const p = groverSuccessProbability(kStar, theta);
  const perAttempt = kStar + 1;
  const queries = perAttempt / p;
  return {
    optima,
    theta,
    k_star: kStar,
    success_probability: p,
    queries_per_attempt: perAttempt,
    expected_attempts: 1 / p,
    queries,
    queries_log2: Math.log2(queries),
    reason: "",
  };
}

/**
 * BBHT's averaged success probability (Lemma 2): j uniform on {0, …, c−1}, then j Grover iterations and a
 * measurement succeed with probability P_c = 1/2 − sin(4cθ)/(4c·sin 2θ) = (1/c)·Σ_j sin²((2j+1)θ).
 *
 * Evaluated without cancellation: direct summation for c ≤ 64; otherwise, with a = 2θ, the numerator of
 * P_c = (2c·sin a − sin(2ca))/(4c·sin a) is taken from its Taylor series when 2ca < 1 (there both terms
 * are ≈ 2ca and their difference ≈ (2ca)³/6 would be lost to rounding), directly otherwise.
 *
 * @param choices - c, the number of equally likely iteration counts (a positive integer).
 * @param theta - Grover angle θ in (0, π/2].
 */
export function averagedSuccessProbability(choices: number, theta: number): number {
  if (!Number.isInteger(choices) || choices < 1) throw new RangeError(`choices must be a positive integer, got ${choices}`);
  if (choices <= 64) {
    let sum = 0;
    for (let j = 0; j < choices; j++) sum += groverSuccessProbability(j, theta);
    return sum / choices;
  }
  const a = 2 * theta;
  const sinA = Math.sin(a);
  if (sinA === 0) return theta === 0 ? 0 : 1; // θ = π/2: every string is marked
  const twoC = 2 * choices;
  const y = twoC * a;
  let numerator: number;
  if (y >= 1) {
    numerator = twoC * sinA - Math.sin(y);
  } else {
    // Σ_{k≥1} (−1)^{k+1} 2c·a^{2k+1}((2c)^{2k} − 1)/(2k+1)!: alternating, decreasing because 2ca < 1.
    numerator = 0;
    let aPow = a; // a^{2k+1}
    let cPow = 1; // (2c)^{2k}
    let fact = 1; // (2k+1)!
    for (let k = 1; k <= 30; k++) {
      aPow *= a * a;
      cPow *= twoC * twoC;
      fact *= 2 * k * (2 * k + 1);
      const term = (twoC * aPow * (cPow - 1)) / fact;
      numerator += k % 2 === 1 ? term : -term;
      if (term <= 1e-18 * Math.abs(numerator)) break;
    }
  }
  return numerator / (4 * choices * sinA);
}

/** Result of {@link groverUnknown}; every field is a predictions.csv column (under the name report/tables.ts `PREDICTION_COLUMNS` gives it where this one is ambiguous, e.g. p → trial_success_p). */
export type GroverUnknown = {
  /** Number of optima M (unknown to the algorithm; used only to evaluate its expectation). */
  optima: number;
  /** Growth factor λ of the schedule. */
  lambda: number;
  /** θ in radians, sin²θ = M/N. */
  theta: number | null;
  /** Expected Grover iterations (one oracle query each) until success. */
  iterations: number | null;
  /** Expected classical checks until success (one per stage = expected number of stages). */
  checks: number | null;
  /** Expected oracle queries until success: iterations + checks. */
  queries: number | null;
  /** log₂ of queries. */
  queries_log2: number | null;
  /** m₀ = 1/sin 2θ, the scale of BBHT's bound (≤ √(N/M) when M ≤ 3N/4). */
  m0: number | null;
  /** BBHT's stated bound on expected Grover iterations, (9/2)·m₀; null outside its hypotheses (λ = 6/5, 0 < M ≤ 3N/4). */
  bound_queries: number | null;
  /** Stages run before m reaches √N (after that every stage is identical). */
  stages_to_saturation: number;
  /** Empty when the prediction applies; otherwise why it does not. */
  reason: string;
};

/**
 * Expected query count of BBHT's search for an unknown number of solutions (Theorem 3), computed exactly from
 * the schedule rather than bounded:
 *
 *   1. m ← 1.  2. Choose j uniformly among the nonnegative integers smaller than m, i.e. from {0, …, ⌈m⌉−1}
 *   (⌈m⌉ equally likely values; m itself grows by a non-integer factor).  3. Apply j Grover iterations to the
 *   uniform state.  4. Measure.  5. Check the outcome; stop if it is an optimum.  6. Otherwise m ← min(λm, √N),
 *   go to 2.
 *
 * Stage s (with c_s = ⌈m_s⌉ choices) succeeds with probability P_{c_s} ({@link averagedSuccessProbability}) and
 * costs (c_s − 1)/2 iterations on average plus 1 check. The expectation is Σ_s R_s·((c_s−1)/2 + 1) with
 * R_s = Π_{r<s}(1 − P_{c_r}) the probability of reaching stage s; once m has saturated at √N the remaining
 * stages are identical and their sum is the geometric tail R_S·((c−1)/2 + 1)/P_c.
 *
 * Beside it we report BBHT's bound for λ = 6/5 and 0 < M ≤ 3N/4: expected Grover iterations at most
 * (9/2)·m₀ with m₀ = 1/sin 2θ = N/(2√(M(N−M))) ≤ √(N/M) (the constant as stated in the proof of Theorem 3, taken
 * from memory because the paper's text could not be consulted here). Our own re-derivation from Lemma 2 alone
 * (P ≥ 1/4 once m ≥ m₀,
 * (1/2)·λ/(λ−1)·m₀ before that stage, (λ/2)/(1 − 3λ/4)·m₀ after it) gives the looser 9·m₀; the exact
 * expectation computed here is ≈ 2.9·m₀ for large N, below both. The bound counts iterations only; our
 * `queries` adds the checks.
 *
 * @param n - number of binary variables (N = 2^n), integer ≥ 0.
 * @param optima - number of optimal strings M, integer in [0, 2^n]; M = 0 gives queries = null (the schedule never stops).
 * @param lambda - growth factor λ > 1 (BBHT: any value in (1, 4/3); default 6/5).
 */
export function groverUnknown(n: number, optima: number, lambda = 6 / 5): GroverUnknown {
  checkSpace(n, optima);
  if (!(lambda > 1) || !Number.isFinite(lambda)) throw new RangeError(`lambda must be a finite number > 1, got ${lambda}`);
  if (optima === 0) {
    return {
      optima,
      lambda,
      theta: null,
      iterations: null,
      checks: null,
      queries: null,
      queries_log2: null,
      m0: null,
      bound_queries: null,
      stages_to_saturation: stagesToSaturation(n, lambda),
      reason: "no marked string (M = 0): the schedule never stops",
    };
  }
  const N = 2 ** n;
  const theta = groverTheta(n, optima);
  const root = Math.sqrt(N);
  let m = 1;
  let reach = 1;
  let iterations = 0;
  let checks = 0;
  let stages = 0;
  while (m < root) {
    const c = Math.ceil(m);
    iterations += (reach * (c - 1)) / 2;
    checks += reach;
    reach *= 1 - averagedSuccessProbability(c, theta);
    m = Math.min(lambda * m, root);
    stages++;
  }
  const c = Math.ceil(root);
  const pTail = averagedSuccessProbability(c, theta);
  iterations += (reach * (c - 1)) / 2 / pTail;
  checks += reach / pTail;
  const queries = iterations + checks;
  // sin 2θ = 2√(M(N−M))/N, formed from M and N so it stays exact near M = N.
  const sin2t = (2 * Math.sqrt(optima) * Math.sqrt(N - optima)) / N;
  const m0 = sin2t > 0 ? 1 / sin2t : null;
  const inBound = lambda === 6 / 5 && optima <= 0.75 * N && m0 !== null;
  return {
    optima,
    lambda,
    theta,
    iterations,
    checks,
    queries,
    queries_log2: Math.log2(queries),
    m0,
    bound_queries: inBound ? 4.5 * (m0 as number) : null,
    stages_to_saturation: stages,
    reason: "",
  };
}

function stagesToSaturation(n: number, lambda: number): number {
  const root = Math.sqrt(2 ** n);
  let m = 1;
  let stages = 0;
  while (m < root) {
    m = Math.min(lambda * m, root);
    stages++;
  }
  return stages;
}

function checkSpace(n: number, optima: number): void {
  if (!Number.isInteger(n) || n < 0 || n > 1000) throw new RangeError(`n must be an integer in [0, 1000], got ${n}`);
  if (!Number.isInteger(optima) || optima < 0 || optima > 2 ** n) {
    throw new RangeError(`optima must be an integer in [0, 2^${n}], got ${optima}`);
  }
}

/** Grover search with the number of optima known, on the predictor registry. */
export const groverPredictor: Predictor = {
  name: "grover",
  description: "Grover search with the number of optima M known (BBHT)",
  options: [],
  appliesTo: () => null,
  fromTruth: (t) => groverKnown(t.n, t.degeneracy),
};

/** Grover search with an unknown number of optima (the BBHT exponential schedule), on the predictor registry. */
export const groverUnknownPredictor: Predictor = {
  name: "grover-unknown",
  description: "Grover search with M unknown: BBHT's exponential schedule, expected queries exactly",
  options: [],
  appliesTo: () => null,
  fromTruth: (t) => groverUnknown(t.n, t.degeneracy),
};
