/**
 * Every study option, declared once: name, type, default, allowed range, unit and a one-line description.
 * `--help`, validation and the manifest are all derived from this table (DESIGN.md §7).
 */

/** One option's declaration. */
export interface OptionSpec {
  readonly name: string;
  readonly type: "number" | "integer" | "string" | "boolean" | "list" | "duration" | "range";
  readonly group: "study" | "family" | "solvers" | "predictors" | "cost model" | "run" | "report";
  readonly description: string;
  readonly default?: number | string | boolean;
  readonly min?: number;
  readonly max?: number;
  /** Allowed values for a string or the items of a list. */
  readonly choices?: ReadonlyArray<string>;
  readonly unit?: string;
}

/** Family names the tool generates or reads. */
export const FAMILY_NAMES = ["ksat", "sk", "pspin", "maxcut", "cnf", "ising"] as const;
/** Classical solvers. */
export const SOLVER_NAMES = ["exhaustive", "walk", "breakwalk", "anneal", "tempering"] as const;
/** Quantum predictors. */
export const PREDICTOR_NAMES = [
  "grover",
  "grover-unknown",
  "min-finding",
  "amplified-walk",
  "amplified-anneal",
  "spectral",
] as const;

/** The study options (`run`, `slurm`, `instance` share the family part). */
export const STUDY_OPTIONS: ReadonlyArray<OptionSpec> = [
  { name: "family", type: "string", group: "study", choices: FAMILY_NAMES, default: "ksat", description: "instance family" },
  { name: "n", type: "range", group: "study", default: "10:20:2", description: "sizes FROM:TO[:STEP] (variables or spins)" },
  { name: "instances", type: "integer", group: "study", default: 10, min: 1, max: 100000, description: "instances per size" },
  { name: "seed", type: "string", group: "study", default: "1", description: "master seed; every instance and trial seed derives from it" },
  { name: "out", type: "string", group: "study", default: "results/latest", description: "output folder" },
  { name: "from", type: "string", group: "family", description: "folder of input files (families cnf and ising)" },
  { name: "k", type: "integer", group: "family", default: 3, min: 2, max: 16, description: "ksat: literals per clause" },
  { name: "density", type: "number", group: "family", min: 0, unit: "clauses/variable", description: "ksat: clause density α (default: the satisfiability threshold for k)" },
  { name: "planted", type: "boolean", group: "family", default: false, description: "ksat: reject clauses violated by a hidden assignment" },
  { name: "satisfiable", type: "boolean", group: "family", default: false, description: "ksat: keep only satisfiable draws (decided exactly)" },
  { name: "unique", type: "boolean", group: "family", default: false, description: "ksat: keep only draws with exactly one model" },
  { name: "couplings", type: "string", group: "family", default: "gauss", choices: ["gauss", "pm1"], description: "sk: J ~ N(0,1/n) or ±1/√n" },
  { name: "p", type: "integer", group: "family", default: 3, min: 2, max: 8, description: "pspin: interaction order" },
  { name: "degree", type: "integer", group: "family", default: 3, min: 1, max: 64, description: "maxcut: vertex degree d of the random regular graph" },
  { name: "solvers", type: "list", group: "solvers", default: "exhaustive,walk,breakwalk,anneal", choices: SOLVER_NAMES, description: "classical solvers to time (exhaustive always runs: it is the ground truth); spin families default to exhaustive,anneal,tempering" },
  { name: "trials", type: "integer", group: "solvers", default: 200, min: 1, max: 1e9, description: "walk/anneal: independent trials per instance and run length" },
  { name: "walk-flips", type: "string", group: "solvers", default: "3n", description: "walk: flips per trial before a restart, as K·n (e.g. 3n, Schöning's choice)" },
  { name: "sweeps", type: "list", group: "solvers", default: "10,30,100,300", description: "anneal: sweeps per trial, one run per value" },
  { name: "schedule", type: "string", group: "solvers", default: "geometric", choices: ["linear", "geometric"], description: "anneal: inverse-temperature schedule" },
  { name: "beta", type: "string", group: "solvers", description: "anneal: inverse-temperature range START:END (default: derived from the instance's energy scale)" },
  // --- baselines (issue 12): breakwalk and tempering ---
  { name: "breakwalk-rule", type: "string", group: "solvers", choices: ["poly", "exp"], description: "breakwalk: flip weight f(break), (eps+break)^-cb or cb^-break (default: poly for k ≤ 3, exp above)" },
  { name: "breakwalk-cb", type: "number", group: "solvers", min: 0, description: "breakwalk: cb of the flip weight (default per k: 2.38, 3.0, 3.6, 4.4 for k = 3, 4, 5, ≥ 6)" },
  { name: "breakwalk-eps", type: "number", group: "solvers", min: 0, description: "breakwalk: eps of the polynomial weight (default 1)" },
  { name: "breakwalk-flips", type: "string", group: "solvers", default: "1000n", description: "breakwalk: flips per trial at most (the cap of its run-length distribution), as K·n" },
  { name: "tempering-replicas", type: "integer", group: "solvers", default: 8, min: 1, max: 256, description: "tempering: replicas R (temperatures geometric between the hot and cold ends)" },
  { name: "tempering-sweeps", type: "list", group: "solvers", default: "10,30,100", description: "tempering: rounds per trial (a sweep of every replica, then exchanges), one run per value" },
  { name: "tempering-beta", type: "string", group: "solvers", description: "tempering: inverse-temperature range HOT:COLD (default: the annealer's instance-derived range)" },
  { name: "external", type: "string", group: "solvers", description: "NAME=COMMAND: time any solver binary (repeatable); placeholders {file}, {seed}, {timeout}; see README" },
  // --- end baselines ---
  { name: "predict", type: "list", group: "predictors", default: "grover,grover-unknown,min-finding,amplified-walk,amplified-anneal", choices: PREDICTOR_NAMES, description: "quantum predictors (query counts, never timings)" },
  { name: "b", type: "number", group: "predictors", default: 0.7, min: 0, description: "spectral: filter strength b" },
  { name: "b-scan", type: "string", group: "predictors", description: "spectral: scan b over FROM:TO:STEP (overrides --b)" },
  { name: "eta", type: "number", group: "predictors", default: 0.5, min: 0, max: 0.999, description: "spectral: filter depth η (costs shallower than η of the optimum are flattened)" },
  { name: "toffoli-us", type: "number", group: "cost model", default: 170, min: 0, unit: "µs", description: "time per Toffoli gate with one magic-state factory" },
  { name: "factories", type: "integer", group: "cost model", default: 1, min: 1, description: "magic-state factories working in parallel" },
  { name: "classical-parallelism", type: "number", group: "cost model", default: 1, min: 1, description: "classical cores S the measured time is divided by" },
  { name: "oracle-toffolis", type: "number", group: "cost model", min: 1, description: "override Toffolis per oracle query" },
  { name: "walk-step-toffolis", type: "number", group: "cost model", min: 1, description: "override Toffolis per reversible Schöning step" },
  { name: "anneal-step-toffolis", type: "number", group: "cost model", min: 1, description: "override Toffolis per reversible Metropolis update" },
  { name: "workers", type: "integer", group: "run", min: 1, max: 256, description: "worker threads (default: available cores)" },
  { name: "budget", type: "duration", group: "run", description: "wall-clock budget for the whole study (e.g. 90s, 6h); later cells are skipped, running ones censored" },
  { name: "cell-limit", type: "duration", group: "run", description: "wall-clock limit per cell (e.g. 10m); a stopped cell is recorded as censored" },
  { name: "shard", type: "string", group: "run", description: "run only slice K/N of the cells (1-based K)" },
  { name: "fit-from", type: "integer", group: "report", min: 1, description: "smallest n used in scaling fits (default: drop the smallest third of the sizes)" },
  { name: "resamples", type: "integer", group: "report", default: 2000, min: 100, max: 1e6, description: "bootstrap resamples for quantile and exponent intervals" },
];
