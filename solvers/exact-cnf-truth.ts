/**
 * CNF ground truth beyond enumeration, as an exact solver of the registry (solvers/registry.ts): the optimum
 * (minimum violated clauses) and its exact degeneracy from the model counter (satisfiable formulas) or the MaxSAT
 * branch and bound (unsatisfiable ones), in the {@link ExactResult} shape of enumeration, with the method and the
 * exact count attached.
 *
 * Switch rule: enumeration (solvers/exhaustive-cnf.ts) for n ≤ {@link COUNT_SWITCH_VARIABLES}, counting above;
 * the registry expresses it (the enumeration entry is capped there, this solver follows it).
 * Measured (mean of 6 random 3-SAT instances, node 20 on the 2-core test machine): at densities 4.26, 6 and 9
 * both methods take 3–60 ms for n = 16–28 with neither ahead throughout; from n = 32 the counter is ahead
 * (density 6, n = 36: 198 ms enumeration vs 49 ms counting; density 9, n = 36: 1.9 s vs 0.6 s) and enumeration
 * grows as 2^n in the worst case.
 */
import type { Cnf } from "../harness/model/cnf.js";
import { countModels } from "./count-cnf.js";
import { exhaustiveCnfSlice } from "./exhaustive-cnf.js";
import { maxsatExact } from "./maxsat-bound.js";
import type { ExactResult, ExactSolver, StopFlag } from "./types.js";

/** Largest n whose CNF ground truth comes from enumeration; larger formulas are counted. */
export const COUNT_SWITCH_VARIABLES = 30;

/**
 * Largest n accepted for CNF ground truth by counting. Not a hard limit of the method (it has none): a refusal
 * bound so that a study does not start cells that cannot finish. Planted random 3-SAT at α = 4.2 counts in
 * about 0.1 s at n = 100 (test/bench/count.bench.ts); time still grows exponentially near the threshold.
 */
export const CNF_COUNT_MAX_VARIABLES = 200;

/** Which method gives the ground truth of a CNF formula with n variables. */
export function cnfTruthMethod(n: number): "enumeration" | "count" {
  return n <= COUNT_SWITCH_VARIABLES ? "enumeration" : "count";
}

/**
 * Exact number of models of a formula (0n when unsatisfiable), by the faster method for its size (the switch
 * rule above). For the --satisfiable/--unique filters: deciding them needs no MaxSAT optimum. The counter polls
 * `stopCheck` (a generation limit, see harness/families/draw-stop.ts) and answers null when it stopped; an
 * enumeration (n ≤ COUNT_SWITCH_VARIABLES, at most 2^30 configurations) always finishes.
 */
export function cnfModelCount(cnf: Cnf, stopCheck: (() => boolean) | null = null): bigint | null {
  if (cnfTruthMethod(cnf.variables) === "count") {
    const r = countModels(cnf, null, stopCheck === null ? {} : { stopCheck });
    return r.complete ? r.count : null;
  }
  const truth = exhaustiveCnfSlice(cnf, 0, 0, null);
  return truth.optimum === 0 ? BigInt(truth.degeneracy) : 0n;
}

/**
 * Optimum and degeneracy of a CNF formula by counting: method "count" when satisfiable (degeneracy = model
 * count), "maxsat" otherwise (also while unproved, when stopped). `degeneracy` is the nearest double (exact
 * below 2^53), `degeneracyExact` the exact decimal; `assignments` = 2^n (all covered, implicitly);
 * `evaluated` and `nodes` = decisions made. No `leastPart`: the fixed-cost floor is not measured (null) for it.
 */
export function cnfTruthByCounting(cnf: Cnf, stop: StopFlag): ExactResult {
  const r = maxsatExact(cnf, stop);
  return {
    optimum: r.complete ? r.optimum : Infinity,
    degeneracy: r.complete ? Number(r.degeneracy) : 0,
    assignments: r.complete ? 2 ** cnf.variables : 0,
    // The work really done, in this method's unit: decisions (runs.csv `work` of a count/maxsat row).
    evaluated: r.nodes + r.counterNodes,
    complete: r.complete,
    method: r.complete && r.optimum === 0 ? "count" : "maxsat",
    degeneracyExact: r.complete ? r.degeneracy.toString() : "",
    nodes: r.nodes + r.counterNodes,
  };
}

/**
 * Model counting and MaxSAT on the solver registry: the CNF ground truth beyond enumeration. One part per
 * instance (components are found during the search, so the work is not split over workers).
 */
export const countSolver: ExactSolver<null> = {
  name: "count",
  kind: "exact",
  description: `exact CNF optimum and degeneracy beyond enumeration (n ≤ ${CNF_COUNT_MAX_VARIABLES}): model counting with components and a cache, MaxSAT branch and bound when unsatisfiable (the ground truth above n = ${COUNT_SWITCH_VARIABLES})`,
  maxSize: (kind) => (kind === "cnf" ? CNF_COUNT_MAX_VARIABLES : 0),
  plan: () => [null],
  run: (problem, _part, stop) => {
    if (problem.kind !== "cnf") throw new Error("count: CNF formulas only");
    return cnfTruthByCounting(problem.cnf, stop);
  },
  // One part: its result as it is (keeps the method and the exact count).
  merge: (results) => results[0],
};
