/**
 * Every command-line option, declared once: name, old spellings, type, default (per command where it differs),
 * allowed range, unit, one-line description, and the commands that take it. This module imports nothing, so a
 * light command path (`solve`, see cli.ts) reads the table without loading the registries; options.ts adds the
 * registries' names as the choices of --family, --solvers and --predict, and is what everything else imports.
 *
 * Option names that belong to one method carry its prefix (`--walk-…`, `--anneal-…`, `--spectral-…`); the
 * spellings before the prefixes are accepted as hidden aliases.
 */

/** The commands of the tool (also listed by the unknown-command message). */
export const COMMAND_NAMES = ["run", "demo", "solve", "instance", "report", "spectral", "adiabatic", "merge", "compare", "slurm", "cost"] as const;
/** One command of the tool. */
export type CommandName = (typeof COMMAND_NAMES)[number];

/** One option's declaration. */
export interface OptionSpec {
  /** Name without the leading dashes; also the key resolve.ts reads. */
  readonly name: string;
  /** Older spellings, accepted and hidden from `--help`. */
  readonly aliases?: ReadonlyArray<string>;
  /** Accepted but not shown by `--help` (an older form kept for one release). */
  readonly hidden?: boolean;
  /** May be given more than once, each time adding one value (every other option takes exactly one). */
  readonly repeatable?: boolean;
  readonly type: "number" | "integer" | "string" | "boolean" | "list" | "duration" | "range";
  readonly group: "study" | "family" | "solvers" | "predictors" | "cost model" | "run" | "report" | "output" | "cluster";
  readonly description: string;
  /** The default the commands use when the option is not given (see also {@link OptionSpec.commandDefaults}). */
  readonly default?: number | string | boolean;
  /** A different default for some commands (shown by their `--help` and used by them). */
  readonly commandDefaults?: Readonly<Partial<Record<CommandName, number | string | boolean>>>;
  readonly min?: number;
  readonly max?: number;
  /** Allowed values for a string or the items of a list. */
  readonly choices?: ReadonlyArray<string>;
  /** The registry whose names are the allowed values (filled in as `choices` by options.ts). */
  readonly registry?: "families" | "solvers" | "predictors";
  readonly unit?: string;
  /** The commands that take it. */
  readonly commands: ReadonlyArray<CommandName>;
}

const STUDY: ReadonlyArray<CommandName> = ["run", "slurm"];

/**
 * The annealer's cooling laws, by our names, and the older names still accepted: "equal-ratios" = the inverse
 * temperature grows by a constant factor per sweep (was "geometric"), "equal-steps" = by a constant step (was
 * "linear"). The frozen spec keeps the older internal names, so folders begun before the rename resume.
 */
export const COOLING_LAWS = ["equal-ratios", "equal-steps"] as const;
/** Older cooling-law names → the internal schedule names of solvers/anneal.ts. */
export const COOLING_INTERNAL: Readonly<Record<string, "linear" | "geometric">> = {
  "equal-ratios": "geometric",
  "equal-steps": "linear",
  geometric: "geometric",
  linear: "linear",
};
const INSTANCE: ReadonlyArray<CommandName> = ["run", "slurm", "instance"];
/** Cost-model options: `report` takes them too, so a different Toffoli time needs no rerun (issue 13). */
const COST_MODEL: ReadonlyArray<CommandName> = ["run", "slurm", "cost", "report"];

/**
 * The option table, as declared. The allowed values of --family, --solvers and --predict are the registries' names:
 * those options name their registry, and options.ts fills them in (with the registries loaded).
 */
export const OPTION_TABLE = [
  { name: "family", type: "string", group: "study", registry: "families", default: "ksat", commands: INSTANCE, description: "instance family" },
  { name: "n", type: "range", group: "study", default: "10:20:2", commandDefaults: { instance: "20" }, commands: INSTANCE, description: "sizes FROM:TO[:STEP] (variables or spins)" },
  { name: "instances", type: "integer", group: "study", default: 10, min: 1, max: 100000, commands: STUDY, description: "instances per size" },
  { name: "seed", type: "string", group: "study", default: "1", commands: INSTANCE, description: "master seed; every instance and trial seed derives from it" },
  { name: "out", type: "string", group: "study", default: "results/latest", commands: STUDY, description: "output folder" },
  { name: "index", type: "integer", group: "study", default: 0, min: 0, commands: ["instance"], description: "instance index (0-based)" },
  { name: "from", type: "string", group: "family", commands: INSTANCE, description: "folder of input files (families cnf and ising)" },
  { name: "k", type: "integer", group: "family", default: 3, min: 2, max: 16, commands: INSTANCE, description: "ksat: literals per clause" },
  { name: "density", type: "number", group: "family", min: 0, unit: "clauses/variable", commands: INSTANCE, description: "ksat: clause density α (default: the satisfiability threshold for k)" },
  { name: "planted", type: "boolean", group: "family", default: false, commands: INSTANCE, description: "ksat: reject clauses violated by a hidden assignment" },
  { name: "satisfiable", type: "boolean", group: "family", default: false, commands: INSTANCE, description: "ksat: keep only satisfiable draws (decided exactly)" },
  { name: "unique", type: "boolean", group: "family", default: false, commands: INSTANCE, description: "ksat: keep only draws with exactly one model" },
  { name: "couplings", type: "string", group: "family", default: "gauss", choices: ["gauss", "pm1"], commands: INSTANCE, description: "sk: J ~ N(0,1/n) or ±1/√n" },
  { name: "p", type: "integer", group: "family", default: 3, min: 2, max: 8, commands: INSTANCE, description: "pspin: interaction order" },
  { name: "degree", type: "integer", group: "family", default: 3, min: 1, max: 64, commands: INSTANCE, description: "maxcut: vertex degree d of the random regular graph" },
  {
    name: "solvers", type: "list", group: "solvers", registry: "solvers", commands: STUDY,
    // No single default: each solver's registry entry says on which model kinds it runs by default (options.ts
    // appends them to this description).
    description: "classical solvers to time (the exact ground truth always runs: exhaustive, or count for CNF above n = 30)",
  },
  { name: "trials", type: "integer", group: "solvers", default: 200, min: 1, max: 1e9, commands: STUDY, description: "randomised solvers: independent trials per instance and run length" },
  { name: "walk-flips", type: "string", group: "solvers", default: "3n", commands: STUDY, description: "walk: flips per trial before a restart, as K·n (e.g. 3n, Schöning's choice)" },
  { name: "anneal-sweeps", aliases: ["sweeps"], type: "list", group: "solvers", default: "10,30,100,300", unit: "sweeps", commands: STUDY, description: "anneal: sweeps per trial (run lengths), one run per value" },
  { name: "anneal-cooling", aliases: ["schedule"], type: "string", group: "solvers", default: "equal-ratios", choices: COOLING_LAWS, commands: STUDY, description: "anneal: cooling law from sweep to sweep: equal-ratios (each sweep's 1/T a fixed multiple of the last) or equal-steps (1/T rises by equal steps)" },
  { name: "anneal-temperature", type: "string", group: "solvers", unit: "cost units", commands: STUDY, description: "anneal: temperature range HOT:COLD, hot end first (default: the acceptance-ratio rule on each instance, see README)" },
  { name: "anneal-beta", aliases: ["beta"], hidden: true, type: "string", group: "solvers", unit: "1/cost", commands: STUDY, description: "anneal: the range as inverse temperatures START:END (older spelling of --anneal-temperature)" },
  { name: "breakwalk-flips", type: "string", group: "solvers", default: "1000n", commands: STUDY, description: "breakwalk: flips per trial at most, as K·n (the cap of its run-length distribution; success and TTS at any shorter cut-off follow from it)" },
  { name: "breakwalk-rule", type: "string", group: "solvers", choices: ["poly", "exp"], commands: STUDY, description: "breakwalk: flip weight f(break) = (eps+break)^-cb (poly) or cb^-break (exp) (default: poly for k ≤ 3, exp above)" },
  { name: "breakwalk-cb", type: "number", group: "solvers", min: 0, commands: STUDY, description: "breakwalk: cb of the flip weight, > 0 (default per k: 2.38, 3.0, 3.6, 4.4 for k = 3, 4, 5, ≥ 6; see README)" },
  { name: "breakwalk-eps", type: "number", group: "solvers", min: 0, commands: STUDY, description: "breakwalk: eps of the polynomial weight, > 0 (default 1)" },
  { name: "tempering-replicas", type: "integer", group: "solvers", default: 8, min: 1, max: 256, commands: STUDY, description: "tempering: replicas R (temperatures geometric between the hot and the cold end)" },
  { name: "tempering-sweeps", type: "list", group: "solvers", default: "10,30,100", unit: "sweeps", commands: STUDY, description: "tempering: rounds per trial (a sweep of every replica, then neighbour exchanges), one run per value" },
  { name: "tempering-temperature", type: "string", group: "solvers", unit: "cost units", commands: STUDY, description: "tempering: temperature range HOT:COLD of the ladder, hot end first (default: the annealer's acceptance-ratio rule on each instance)" },
  { name: "tempering-beta", hidden: true, type: "string", group: "solvers", unit: "1/cost", commands: STUDY, description: "tempering: the range as inverse temperatures HOT:COLD, 0 < HOT ≤ COLD (older spelling of --tempering-temperature)" },
  { name: "external", type: "string", repeatable: true, group: "solvers", commands: STUDY, description: "NAME=COMMAND: time any solver binary as solver NAME (repeatable); placeholders {file}, {seed}, {timeout}; see README" },
  { name: "predict", type: "list", group: "predictors", default: "grover,grover-unknown,min-finding,amplified-walk,amplified-anneal", registry: "predictors", commands: STUDY, description: "quantum predictors (query counts, never timings)" },
  { name: "spectral-b", aliases: ["b"], type: "number", group: "predictors", default: 0.7, min: 0, commands: ["run", "slurm", "spectral"], description: "spectral: filter strength b" },
  { name: "spectral-b-scan", aliases: ["b-scan"], type: "string", group: "predictors", commands: ["run", "slurm", "spectral"], description: "spectral: scan b over FROM:TO:STEP (overrides --spectral-b)" },
  { name: "spectral-eta", aliases: ["eta"], type: "number", group: "predictors", default: 0.5, min: 0, max: 0.999, commands: ["run", "slurm", "spectral"], description: "spectral: filter depth η (costs shallower than η of the optimum are flattened)" },
  { name: "spectral-memory", type: "string", group: "predictors", unit: "GiB", commands: ["run", "slurm", "spectral", "adiabatic"], description: "spectral, adiabatic: memory one cell may use, as GiB or with MiB/GiB/TiB (default: 75% of physical memory)" },
  { name: "adiabatic-grid", type: "integer", group: "predictors", default: 21, min: 3, max: 10001, commands: ["run", "slurm", "adiabatic"], description: "adiabatic: evenly spaced points s in [0, 1] searched for the minimum gap before Brent refinement" },
  { name: "threads", type: "integer", group: "run", min: 1, max: 64, commands: ["spectral", "adiabatic"], description: "threads sharing each product of the one instance (default: available cores)" },
  { name: "toffoli-us", type: "number", group: "cost model", default: 170, min: 0, unit: "µs", commands: COST_MODEL, description: "time per Toffoli gate with one magic-state factory" },
  { name: "factories", type: "integer", group: "cost model", default: 1, min: 1, commands: COST_MODEL, description: "magic-state factories working in parallel" },
  { name: "classical-parallelism", type: "number", group: "cost model", default: 1, min: 1, commands: COST_MODEL, description: "classical cores S the measured time is divided by" },
  { name: "oracle-toffolis", type: "number", group: "cost model", min: 1, commands: COST_MODEL, description: "override Toffolis per oracle query" },
  { name: "walk-step-toffolis", type: "number", group: "cost model", min: 1, commands: COST_MODEL, description: "override Toffolis per reversible Schöning step" },
  { name: "anneal-step-toffolis", type: "number", group: "cost model", min: 1, commands: COST_MODEL, description: "override Toffolis per reversible Metropolis update" },
  { name: "workers", type: "integer", group: "run", min: 1, max: 256, commands: ["run", "solve"], description: "worker threads (default: available cores)" },
  { name: "budget", type: "duration", group: "run", commands: STUDY, description: "wall-clock budget for the whole study (e.g. 90s, 6h); later cells are skipped, running ones censored" },
  { name: "cell-limit", type: "duration", group: "run", commands: STUDY, description: "wall-clock limit per cell (e.g. 10m); a stopped cell is recorded as censored" },
  { name: "shard", type: "string", group: "run", commands: ["run"], description: "run only slice K/N of the cells (1-based K)" },
  { name: "fit-from", type: "integer", group: "report", min: 1, commands: ["run", "slurm", "report"], description: "smallest n used in scaling fits (default: drop the smallest third of the sizes)" },
  { name: "resamples", type: "integer", group: "report", default: 2000, min: 100, max: 1e6, commands: ["run", "slurm", "report"], description: "bootstrap resamples for quantile and exponent intervals" },
  { name: "floor-factor", type: "number", group: "report", default: 10, min: 1, commands: ["run", "slurm", "report"], description: "time fits use only sizes whose median cell time is at least this many times the solver's fixed per-cell cost" },
  { name: "json", type: "boolean", group: "output", commands: ["solve", "spectral", "adiabatic"], description: "print one JSON object" },
  { name: "tolerance", type: "number", group: "output", default: 0.25, min: 0, commands: ["compare"], description: "relative change in time per step that counts as a change" },
  { name: "shards", type: "integer", group: "cluster", min: 1, commands: ["slurm"], description: "number of array tasks (study slices); required" },
  { name: "cpus-per-task", type: "integer", group: "cluster", default: 2, min: 1, commands: ["slurm"], description: "cores per array task (the run's --workers)" },
  { name: "time", type: "string", group: "cluster", commands: ["slurm"], description: "time limit per array task (Slurm format, e.g. 04:00:00)" },
  { name: "partition", type: "string", group: "cluster", commands: ["slurm"], description: "Slurm partition" },
  { name: "account", type: "string", group: "cluster", commands: ["slurm"], description: "Slurm account" },
  { name: "mem-per-cpu", type: "string", group: "cluster", commands: ["slurm"], description: "memory per core (Slurm format, e.g. 2G)" },
  { name: "job-name", type: "string", group: "cluster", default: "speedbound", commands: ["slurm"], description: "job name" },
] as const satisfies ReadonlyArray<OptionSpec>;

/** Names of every declared option. */
export type OptionName = (typeof OPTION_TABLE)[number]["name"];

/** The declarations of the options a command takes, in table order (registry choices not filled in). */
export function declaredOptionsOf(command: CommandName): OptionSpec[] {
  return (OPTION_TABLE as ReadonlyArray<OptionSpec>).filter((o) => o.commands.includes(command));
}
