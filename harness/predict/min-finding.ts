/**
 * Quantum minimum finding after Dürr and Høyer, "A quantum algorithm for finding the minimum",
 * arXiv:quant-ph/9607014: repeated BBHT searches (arXiv:quant-ph/9605034) for a string cheaper than the
 * current threshold, the threshold moving to each string found.
 */
import type { Predictor } from "./types.js";

/** Result of {@link minFinding}; every field is a predictions.csv column. */
export type MinFinding = {
  /** The paper's bound on the expected total number of comparison-oracle queries, (45/4)√N + (7/10)(log₂N)². */
  queries: number;
  /** log₂ of queries. */
  queries_log2: number;
  /** The search part of the bound, (45/4)√N. */
  search_queries: number;
  /** The threshold-update part of the bound, (7/10)(log₂N)². */
  update_queries: number;
  /** Run length that finds the minimum with probability ≥ 1/2: twice the expectation bound (Markov's inequality). */
  queries_half_success: number;
  /** Always true: `queries` is a proven upper bound on the expectation, not an exact expectation. */
  is_bound: boolean;
};

/**
 * Expected number of comparison-oracle queries of quantum minimum finding over N = 2^n strings, as bounded by
 * Dürr and Høyer (their Lemma 2; lemma number from memory): at most (45/4)√N + (7/10)(log₂N)² before the
 * threshold holds a minimum. This is
 * the paper's bound, reported as such (`is_bound`): it depends on n only, not on the instance. One query is one
 * application of the oracle that marks strings with cost below the current threshold.
 *
 * @param n - number of binary variables (N = 2^n), integer ≥ 0.
 */
export function minFinding(n: number): MinFinding {
  if (!Number.isInteger(n) || n < 0 || n > 1000) throw new RangeError(`n must be an integer in [0, 1000], got ${n}`);
  const search = (45 / 4) * 2 ** (n / 2);
  const update = (7 / 10) * n * n;
  const queries = search + update;
  return {
    queries,
    queries_log2: Math.log2(queries),
    search_queries: search,
    update_queries: update,
    queries_half_success: 2 * queries,
    is_bound: true,
  };
}

/**
 * Quantum minimum finding on the predictor registry. It answers the optimisation question: spin families, and
 * CNF instances with no model (for a satisfiable formula, search for a model is Grover's question).
 */
export const minFindingPredictor: Predictor = {
  name: "min-finding",
  description: "quantum minimum finding (Dürr–Høyer): expected queries bound",
  options: [],
  appliesTo: () => null,
  fromTruth: (t) => (t.kind === "cnf" && t.optimum === 0 ? null : minFinding(t.n)),
};
