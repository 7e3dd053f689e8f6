/**
 * The instance-generator interface. Every generated instance is a pure function of
 * (master seed, family parameters, n, instance index): generators draw only from an {@link Rng} seeded with
 * deriveSeed(masterSeed, family, canonical parameters, n, index).
 */
import type { Problem } from "../model/problem.js";

/** Resolved, validated family parameters (numbers, strings, booleans only, so they hash canonically). */
export type FamilyParams = Readonly<Record<string, number | string | boolean>>;

/** A generated (or loaded) instance. */
export interface GeneratedInstance {
  readonly problem: Problem;
  /** The seed the instance was drawn from (empty for instances read from files). */
  readonly seed: string;
  /** Descriptors written to instances.csv (clauses, density, planted, rejected_draws, edges, file, …). */
  readonly meta: Readonly<Record<string, number | string | boolean>>;
}

/** An instance family. */
export interface Family {
  /** Name used on the command line and in the CSV `family` column. */
  readonly name: string;
  /**
   * Draws instance `index` of size n.
   * @param masterSeed - the study's master seed.
   * @param params - resolved family parameters.
   */
  generate(masterSeed: string, params: FamilyParams, n: number, index: number): GeneratedInstance;
}
