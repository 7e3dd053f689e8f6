/**
 * Bridges the study's cost-model options (StudySpec.costModel, from the command line) to the cost model of
 * cost-model.ts: resolved options, the `speedbound cost` table, and the seconds-per-query function the
 * comparison and crossover estimates use.
 */
import type { FamilyCostShape } from "../families/types.js";
import {
  COST_MODEL_DEFAULTS,
  type CostModelOptions,
  annealStepToffolis,
  describeCostModel,
  quantumSeconds,
  toffolisPerQuery,
  walkStepToffolis,
} from "./cost-model.js";

/** The cost-model settings of a study as the command line gave them (StudySpec.costModel). */
export interface CostModelSettings {
  readonly toffoliSeconds: number;
  readonly factories: number;
  readonly classicalParallelism: number;
  readonly oracleToffolis: number | null;
  readonly walkStepToffolis: number | null;
  readonly annealStepToffolis: number | null;
}

/** The cost-model options of a study. */
export function costModelOptions(c: CostModelSettings): CostModelOptions {
  return {
    ...COST_MODEL_DEFAULTS,
    toffoliSeconds: c.toffoliSeconds,
    factories: c.factories,
    classicalParallelism: c.classicalParallelism,
    ...(c.oracleToffolis === null ? {} : { oracleToffolisOverride: c.oracleToffolis }),
    ...(c.walkStepToffolis === null ? {} : { walkStepToffolis: c.walkStepToffolis }),
    ...(c.annealStepToffolis === null ? {} : { annealStepToffolis: c.annealStepToffolis }),
  };
}

/** Rows of the `speedbound cost` table from resolved cost-model options (the edge resolves the command line). */
export function costModelRows(costModel: CostModelSettings): Array<{ quantity: string; value: string; source: string }> {
  return describeCostModel(costModelOptions(costModel));
}

/** Size facts of a family at size n that the Toffoli counts need (declared by each family: families/types.ts). */
export type FamilyShape = FamilyCostShape;

/**
 * For k-SAT the Metropolis update's local field is the sum over the ≈ m·k/n clauses holding the variable, so
 * the anneal step is costed with the clauses as its terms and k as their order.
 *
 * Quantum seconds per query for a predictor at size n: Toffolis per oracle query (plus diffusion), or per
 * reversible solver step times the steps of one trial for the amplified solvers (their "queries" are trial runs).
 */
export function secondsPerQuery(
  spec: { readonly costModel: CostModelSettings },
  shape: FamilyShape,
  stepsPerTrial: (predictor: string, n: number) => number,
): (family: string, predictor: string, n: number) => number {
  const options = costModelOptions(spec.costModel);
  return (_family, predictor, size) => {
    // The crossover search evaluates real-valued sizes; circuits exist for whole n only.
    const n = Math.max(1, Math.round(size));
    const clauses = Math.max(1, Math.round(shape.clausesPerVariable * n));
    const dims = shape.kind === "ksat"
      ? { n, clauses, k: shape.k, terms: clauses, order: shape.k }
      : { n, terms: Math.max(1, Math.round(shape.termsAt(n))), order: shape.order };
    let toffolis: number;
    if (predictor === "amplified-walk") toffolis = walkStepToffolis(dims, options).toffolis * stepsPerTrial(predictor, n);
    else if (predictor === "amplified-anneal") toffolis = annealStepToffolis(dims, options).toffolis * stepsPerTrial(predictor, n);
    else toffolis = toffolisPerQuery(shape.kind, dims, options).toffolis;
    return quantumSeconds(1, toffolis, options);
  };
}
