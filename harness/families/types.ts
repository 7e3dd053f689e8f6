/**
 * The instance-generator interface. Every generated instance is a pure function of
 * (master seed, family parameters, n, instance index): generators draw only from an {@link Rng} seeded with
 * deriveSeed(masterSeed, family, canonical parameters, n, index).
 */
import type { Problem } from "../model/problem.js";
import type { ProblemKind } from "../../solvers/types.js";

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

/** Size facts of a family at size n that the Toffoli counts of the cost model need. */
export interface FamilyCostShape {
  readonly kind: "ksat" | "ising";
  /** CNF: clauses per variable (0 for Ising). */
  readonly clausesPerVariable: number;
  /** CNF: literals per clause (the mean for mixed lengths; 0 for Ising). */
  readonly k: number;
  /** Ising: terms at size n (may be evaluated beyond the measured sizes). */
  readonly termsAt: (n: number) => number;
  /** Ising: interaction order of the terms. */
  readonly order: number;
}

/** One row of instances.csv as a family's cost shape reads it. */
export type InstanceDescriptors = Readonly<Record<string, number | string | boolean | null>> & { readonly n: number };

/**
 * How a family reads its parameters at the edge: values of the option table, already range-checked there
 * (the CLI provides it; tests may provide their own).
 */
export interface ParamReader {
  /** A numeric option, its declared default when not given. */
  number(option: string): number;
  /** True when the user gave the option. */
  given(option: string): boolean;
  /** A boolean flag. */
  flag(option: string): boolean;
  /** A string option, its declared default when not given. */
  text(option: string): string;
}

/**
 * An instance family: everything the rest of the tool needs to know about it, declared in its own file and
 * listed once in families/registry.ts. Nothing else decides on a family's name.
 */
export interface FamilyBase {
  /** Name used on the command line and in the CSV `family` column. */
  readonly name: string;
  /** The model its instances are: CNF (cost = violated clauses) or Ising (cost = energy). */
  readonly kind: ProblemKind;
  /** One line for `--help`. */
  readonly description: string;
  /** Option-table names of its parameters (shown under "Family options" with the family's name). */
  readonly params: ReadonlyArray<string>;
  /**
   * Resolves and validates its parameters (defaults filled in, key order fixed: spec.json is compared as
   * text on resume). Throws an InputError naming the option.
   */
  resolveParams(read: ParamReader): FamilyParams;
  /** Null when size n can be drawn with these parameters, else the reason (one line, naming the option). */
  checkSize(n: number, params: FamilyParams): string | null;
  /** True when every instance is invariant under the global flip (only even-order terms). */
  flipSymmetric(params: FamilyParams): boolean;
  /** Size facts for the cost model, from its parameters (and the instances' descriptors for folder families). */
  costShape(params: FamilyParams, instances: ReadonlyArray<InstanceDescriptors>): FamilyCostShape;
  /**
   * Descriptors of instances.csv beyond the instance's own `meta`, derived from the ground truth (e.g. the
   * maximum cut of a MaxCut instance). Optional.
   */
  describe?(meta: GeneratedInstance["meta"], optimum: number | null): Readonly<Record<string, number | string | boolean | null>>;
}

/** A family drawn from seeds. */
export interface GeneratedFamily extends FamilyBase {
  readonly source: "generated";
  /**
   * Draws instance `index` of size n.
   * @param masterSeed - the study's master seed.
   * @param params - resolved family parameters.
   */
  generate(masterSeed: string, params: FamilyParams, n: number, index: number): GeneratedInstance;
}

/** A family read from a folder of files (`--from DIR`). */
export interface FolderFamily extends FamilyBase {
  readonly source: "folder";
  /** File names it reads in the folder. */
  readonly fileExtensions: RegExp;
  /** Words for the files it reads, in messages (e.g. ".cnf"). */
  readonly fileWords: string;
  /** Reads one instance file; an InputError naming file and line on bad input. */
  load(file: string): GeneratedInstance;
}

/** Any family (see {@link FamilyBase}). */
export type Family = GeneratedFamily | FolderFamily;
