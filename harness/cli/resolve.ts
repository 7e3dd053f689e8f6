/**
 * Validation at the edge: turns parsed command-line values into a frozen {@link StudySpec}. Every problem
 * becomes an InputError naming the option and the value (exit code 2).
 */
import { existsSync, readdirSync, statSync } from "node:fs";
import { join, resolve } from "node:path";
import { InputError } from "../errors.js";
import { familyNamed, folderFamily } from "../families/registry.js";
import type { Family, FamilyParams, ParamReader } from "../families/types.js";
import { COOLING_INTERNAL, COOLING_LAWS, optionSpec, type OptionSpec } from "./options.js";
import { numberOption } from "./option-values.js";
import { type StudySpec, methodOptionsOf } from "../engine/study.js";
import { sizeOf } from "../model/problem.js";
import { PREDICTOR_NAMES, predictorNamed } from "../predict/registry.js";
import { EXACT_SOLVER_NAMES, SOLVER_NAMES, defaultSolvers, groundTruthSolver, trialsSolverNamed } from "../../solvers/registry.js";
import { parseExternalOption } from "../engine/external-solver.js";
import type { MethodOptions } from "../../solvers/types.js";
import type { CellSizeTarget } from "../predict/types.js";
import { defaultSpectralMemory, formatGiB, parseMemory } from "../predict/numerics/memory.js";

type Argv = Readonly<Record<string, unknown>>;

// Numeric options are read by option-values.ts (so `solve` reads --workers without this module); re-exported for
// the commands that import it from here.
export { numberOption } from "./option-values.js";

/** Parses `FROM:TO[:STEP]` (or a single size) into the list of sizes. */
export function parseSizeRange(text: string, option = "--n"): number[] {
  const parts = String(text).split(":");
  if (parts.length < 1 || parts.length > 3 || parts.some((p) => !/^\d+$/.test(p.trim()))) {
    throw new InputError(`${option}: '${text}' is not FROM:TO[:STEP] with whole numbers`);
  }
  const [from, to = from, step = 1] = parts.map((p) => Number(p));
  if (from < 1) throw new InputError(`${option}: sizes start at 1, got ${from}`);
  if (to < from) throw new InputError(`${option}: range ${text} runs backwards (TO ${to} < FROM ${from})`);
  if (step < 1) throw new InputError(`${option}: step must be at least 1, got ${step}`);
  const out: number[] = [];
  for (let n = from; n <= to; n += step) out.push(n);
  return out;
}

/** Parses a duration such as 90s, 10m, 6h, 1d or a plain number of seconds into milliseconds. */
export function parseDuration(text: string, option: string): number {
  const m = /^(\d+(?:\.\d+)?)\s*(ms|s|m|h|d)?$/.exec(String(text).trim());
  if (!m) throw new InputError(`${option}: '${text}' is not a duration (e.g. 90s, 10m, 6h)`);
  const scale = { ms: 1, s: 1000, m: 60_000, h: 3_600_000, d: 86_400_000 }[(m[2] ?? "s") as "ms" | "s" | "m" | "h" | "d"];
  const ms = Number(m[1]) * scale;
  if (!(ms > 0)) throw new InputError(`${option}: duration must be positive, got '${text}'`);
  return ms;
}

/** Parses `K/N` for --shard. */
export function parseShard(text: string): { k: number; count: number } {
  const m = /^(\d+)\/(\d+)$/.exec(String(text).trim());
  if (!m) throw new InputError(`--shard: '${text}' is not K/N (e.g. 2/5)`);
  const k = Number(m[1]);
  const count = Number(m[2]);
  if (count < 1 || k < 1 || k > count) throw new InputError(`--shard: need 1 ≤ K ≤ N, got ${text}`);
  return { k, count };
}

function spec(name: string): OptionSpec {
  return optionSpec(name);
}

function listOption(argv: Argv, name: string, allowed: ReadonlyArray<string>, fallback?: string): string[] {
  const raw = argv[name] ?? fallback ?? spec(name).default ?? "";
  const items = String(raw).split(",").map((s) => s.trim()).filter((s) => s !== "");
  for (const item of items) {
    if (!allowed.includes(item)) throw new InputError(`--${name}: unknown value '${item}' (choose from ${allowed.join(", ")})`);
  }
  return [...new Set(items)];
}

function numberList(text: string, option: string): number[] {
  const items = String(text).split(",").map((s) => s.trim()).filter((s) => s !== "");
  if (items.length === 0) throw new InputError(`${option}: empty list`);
  return items.map((s) => {
    const v = Number(s);
    if (!Number.isFinite(v) || v <= 0) throw new InputError(`${option}: '${s}' is not a positive number`);
    return v;
  });
}

/** The option table as a family sees it (values range-checked against their declarations). */
export function paramReader(argv: Argv): ParamReader {
  return {
    number: (option) => numberOption(argv, option) as number,
    given: (option) => argv[option] !== undefined,
    flag: (option) => argv[option] === true,
    text: (option) => String(argv[option] ?? spec(option).default ?? ""),
  };
}

/** Family parameters that determine instances, resolved with defaults (these are hashed into seeds). */
export function resolveFamilyParams(argv: Argv, family: string): FamilyParams {
  return familyNamed(family).resolveParams(paramReader(argv));
}

/**
 * Every size limit of a study, checked once here at the edge (exit code 2): what the family can draw, what
 * the ground-truth solver can enumerate, and what each predictor's numerics can hold (a size cap, and for numerics
 * bounded by memory the memory the largest size needs against the allowance in `options`).
 */
export function checkLimits(
  family: Family,
  params: FamilyParams,
  sizes: ReadonlyArray<number>,
  predictors: ReadonlyArray<string>,
  folderFiles: ReadonlyArray<{ readonly file: string; readonly n: number }> | null,
  options: MethodOptions = {},
): void {
  for (const n of sizes) {
    const why = family.checkSize(n, params);
    if (why !== null) throw new InputError(why);
  }
  const largest = sizes[sizes.length - 1];
  const symmetric = family.flipSymmetric(params);
  const exact = groundTruthSolver(family.kind, symmetric, largest);
  const limit = exact.maxSize(family.kind, symmetric);
  if (largest > limit) {
    // A folder study names the (first) file that is too large, so the user knows which one to drop.
    const where = folderFiles ? `--from: ${folderFiles.find((f) => f.n === largest)?.file}: n = ${largest}` : `--n: size ${largest}`;
    throw new InputError(`${where} is beyond the exact ground-truth limit of ${limit} for this family (the largest n an exact solver accepts: ${exact.name})`);
  }
  for (const name of predictors) {
    const cell = predictorNamed(name).cell;
    if (!cell) continue;
    const max = cell.maxSize(family.kind, symmetric);
    if (largest > max) throw new InputError(`--predict: ${name} needs n ≤ ${max} (the largest size its numerics index), but --n reaches ${largest}`);
    const m = cell.memory?.(cellSizeTarget(family, params, largest), largest, options);
    if (m !== undefined && m.needed > m.allowed) {
      throw new InputError(`--predict: ${name} at n = ${largest} needs ${formatGiB(m.needed)} (${m.detail}), but --${m.option} allows ${formatGiB(m.allowed)}`);
    }
  }
}

/**
 * What a predictor's memory rule knows of a study's instances at size n: the family's kind and symmetry and, for
 * generated CNF families, the clause count its cost shape fixes (folder instances may differ: null).
 */
export function cellSizeTarget(family: Family, params: FamilyParams, n: number): CellSizeTarget {
  const clauses = family.kind === "cnf" && family.source === "generated" ? Math.round(family.costShape(params, []).clausesPerVariable * n) : null;
  return { kind: family.kind, flipSymmetric: family.flipSymmetric(params), clauses };
}

/**
 * One line per predictor whose numerics are bounded by memory: what its largest cell of the study needs and the
 * allowance (printed before a study starts, so a long run does not find out at its last size).
 */
export function memoryNotes(spec: StudySpec): string[] {
  if (spec.sizes.length === 0) return [];
  const fam = familyNamed(spec.family);
  const n = spec.sizes[spec.sizes.length - 1];
  const options = methodOptionsOf(spec);
  const lines: string[] = [];
  for (const name of spec.predictors) {
    const m = predictorNamed(name).cell?.memory?.(cellSizeTarget(fam, spec.familyParams, n), n, options);
    if (m === undefined) continue;
    lines.push(`the largest ${name} cell (n = ${n}) needs ${formatGiB(m.needed)} (${m.detail}) of the ${formatGiB(m.allowed)} allowed (--${m.option})`);
  }
  return lines;
}

/** --spectral-memory in bytes (default: 75% of this machine's physical memory, read now). */
export function resolveSpectralMemory(argv: Argv): number {
  if (argv["spectral-memory"] === undefined) return defaultSpectralMemory();
  const bytes = parseMemory(String(argv["spectral-memory"]));
  if (bytes === null) throw new InputError(`--spectral-memory: '${String(argv["spectral-memory"])}' is not a positive size (GiB, or a number with MiB/GiB/TiB)`);
  return bytes;
}

/** Lists a folder's instance files (sorted) for the cnf / ising families, with their sizes. */
export function listInstanceFolder(family: string, from: unknown): Array<{ file: string; n: number }> {
  const reader = folderFamily(family);
  if (from === undefined || from === "") throw new InputError(`--from: family '${family}' reads a folder of files; give --from DIR`);
  const dir = resolve(String(from));
  if (!existsSync(dir)) throw new InputError(`--from: folder '${String(from)}' does not exist`);
  if (!statSync(dir).isDirectory()) throw new InputError(`--from: '${String(from)}' is not a folder`);
  const names = readdirSync(dir).filter((f) => reader.fileExtensions.test(f)).sort();
  if (names.length === 0) {
    throw new InputError(`--from: folder '${String(from)}' has no ${reader.fileWords} files`);
  }
  return names.map((name) => {
    const file = join(dir, name);
    return { file, n: sizeOf(reader.load(file).problem) };
  });
}

/** Turns parsed options into a frozen study spec, validating everything. */
export function resolveStudy(argv: Argv): StudySpec {
  const family = String(argv.family ?? spec("family").default);
  const fam = familyNamed(family);
  const folder = fam.source === "folder";
  const files = folder ? listInstanceFolder(family, argv.from) : [];
  const sizes = folder ? [...new Set(files.map((f) => f.n))].sort((a, b) => a - b) : parseSizeRange(String(argv.n ?? spec("n").default));
  const familyParams = fam.resolveParams(paramReader(argv));
  const target = { family, kind: fam.kind };
  // Without --solvers: the registry's default list for the family's kind (each solver's `defaultFor`); exact
  // solvers are the ground truth, which always runs.
  const solvers = listOption(argv, "solvers", SOLVER_NAMES, defaultSolvers(fam.kind).join(",")).filter((s) => !EXACT_SOLVER_NAMES.includes(s));
  for (const name of [...solvers]) {
    const why = trialsSolverNamed(name).appliesTo(target);
    if (why === null) continue;
    if (argv.solvers !== undefined) throw new InputError(`--solvers: ${why}`);
    solvers.splice(solvers.indexOf(name), 1); // the default list names every solver
  }
  const predictors = listOption(argv, "predict", PREDICTOR_NAMES);
  for (const name of [...predictors]) {
    const p = predictorNamed(name);
    const why = p.appliesTo(target) ?? (p.amplifies !== undefined && !solvers.includes(p.amplifies) ? `${name} needs the ${p.amplifies} solver in --solvers` : null);
    if (why === null) continue;
    if (argv.predict !== undefined) throw new InputError(`--predict: ${why}`);
    predictors.splice(predictors.indexOf(name), 1);
  }
  // The allowance joins the study's identity only when given: the default depends on the machine, and shards of
  // one study may run on nodes of different sizes (each then applies its own default).
  const spectralMemory = argv["spectral-memory"] !== undefined ? resolveSpectralMemory(argv) : undefined;
  const adiabaticGrid = predictors.includes("adiabatic") ? (numberOption(argv, "adiabatic-grid") as number) : undefined;
  checkLimits(fam, familyParams, sizes, predictors, folder ? files : null, { "spectral-memory": spectralMemory ?? null });
  const walkFlipsText = String(argv["walk-flips"] ?? spec("walk-flips").default);
  const wf = /^(\d+(?:\.\d+)?)n$/.exec(walkFlipsText);
  if (!wf) throw new InputError(`--walk-flips: '${walkFlipsText}' is not of the form Kn (e.g. 3n)`);
  const walkFlipsPerVariable = Number(wf[1]);
  if (!(walkFlipsPerVariable > 0)) throw new InputError(`--walk-flips: must be positive, got '${walkFlipsText}'`);
  const sweeps = numberList(String(argv["anneal-sweeps"] ?? spec("anneal-sweeps").default), "--anneal-sweeps").map((s) => {
    if (!Number.isInteger(s)) throw new InputError(`--anneal-sweeps: '${s}' is not a whole number`);
    return s;
  });
  const cooling = String(argv["anneal-cooling"] ?? spec("anneal-cooling").default);
  const schedule = COOLING_INTERNAL[cooling];
  if (schedule === undefined) throw new InputError(`--anneal-cooling: '${cooling}' is not ${COOLING_LAWS.join(" or ")}`);
  let beta: [number, number] | null = null;
  if (argv["anneal-temperature"] !== undefined && argv["anneal-beta"] !== undefined) {
    throw new InputError(`--anneal-temperature: give the range once (not also as --anneal-beta/--beta)`);
  }
  if (argv["anneal-temperature"] !== undefined) {
    const text = String(argv["anneal-temperature"]);
    const parts = text.split(":").map(Number);
    if (parts.length !== 2 || !parts.every((x) => Number.isFinite(x) && x > 0) || parts[1] > parts[0]) {
      throw new InputError(`--anneal-temperature: '${text}' is not HOT:COLD with HOT ≥ COLD > 0 (hot end first)`);
    }
    beta = [1 / parts[0], 1 / parts[1]];
  }
  if (argv["anneal-beta"] !== undefined) {
    const parts = String(argv["anneal-beta"]).split(":").map(Number);
    if (parts.length !== 2 || !parts.every((x) => Number.isFinite(x) && x > 0) || parts[1] < parts[0]) {
      throw new InputError(`--anneal-beta: '${String(argv["anneal-beta"])}' is not START:END with 0 < START ≤ END`);
    }
    beta = [parts[0], parts[1]];
  }
  const bValues = resolveBValues(argv);
  const study: StudySpec = {
    family,
    familyParams,
    sizes,
    instances: folder ? 0 : (numberOption(argv, "instances") as number),
    seed: String(argv.seed ?? spec("seed").default),
    files: files.map((f) => ({ file: f.file, n: f.n })),
    solvers,
    trials: numberOption(argv, "trials") as number,
    walkFlipsPerVariable,
    sweeps,
    schedule,
    beta,
    ...resolveBaselines(argv, solvers),
    predictors,
    spectral: { bValues, eta: numberOption(argv, "spectral-eta") as number, ...(spectralMemory !== undefined ? { memory: spectralMemory } : {}) },
    ...(adiabaticGrid !== undefined ? { adiabatic: { grid: adiabaticGrid } } : {}),
    costModel: resolveCostModel(argv),
    report: { fitFrom: optionalNumber(argv, "fit-from"), resamples: numberOption(argv, "resamples") as number, floorFactor: numberOption(argv, "floor-factor") as number },
  };
  return deepFreeze(study);
}

/**
 * Breakwalk's and tempering's options, always checked but kept in the spec only when the solver is in the study (so
 * that the spec.json of a study without it keeps its text), and the external solver binaries (only when given).
 */
function resolveBaselines(argv: Argv, solvers: ReadonlyArray<string>): Pick<StudySpec, "breakwalk" | "tempering" | "external"> {
  // Every option is checked (a bad value is refused even when its solver is not in the study, as for the annealer's).
  const rule = argv["breakwalk-rule"] === undefined ? null : String(argv["breakwalk-rule"]);
  if (rule !== null && rule !== "poly" && rule !== "exp") throw new InputError(`--breakwalk-rule: '${rule}' is not poly or exp`);
  const cb = optionalNumber(argv, "breakwalk-cb");
  if (cb !== null && !(cb > 0)) throw new InputError(`--breakwalk-cb: must be positive, got ${cb}`);
  const eps = optionalNumber(argv, "breakwalk-eps");
  if (eps !== null && !(eps > 0)) throw new InputError(`--breakwalk-eps: must be positive, got ${eps}`);
  const flipsText = String(argv["breakwalk-flips"] ?? spec("breakwalk-flips").default);
  const bf = /^(\d+(?:\.\d+)?)n$/.exec(flipsText);
  if (!bf || !(Number(bf[1]) > 0)) throw new InputError(`--breakwalk-flips: '${flipsText}' is not of the form Kn with K > 0 (e.g. 1000n)`);
  const sweeps = numberList(String(argv["tempering-sweeps"] ?? spec("tempering-sweeps").default), "--tempering-sweeps").map((s) => {
    if (!Number.isInteger(s)) throw new InputError(`--tempering-sweeps: '${s}' is not a whole number`);
    return s;
  });
  if (argv["tempering-temperature"] !== undefined && argv["tempering-beta"] !== undefined) {
    throw new InputError(`--tempering-temperature: give the range once (not also as --tempering-beta)`);
  }
  let beta: [number, number] | null = null;
  if (argv["tempering-temperature"] !== undefined) {
    const text = String(argv["tempering-temperature"]);
    const parts = text.split(":").map(Number);
    if (parts.length !== 2 || !parts.every((x) => Number.isFinite(x) && x > 0) || parts[1] > parts[0]) {
      throw new InputError(`--tempering-temperature: '${text}' is not HOT:COLD with HOT ≥ COLD > 0 (hot end first)`);
    }
    beta = [1 / parts[0], 1 / parts[1]];
  }
  if (argv["tempering-beta"] !== undefined) {
    const text = String(argv["tempering-beta"]);
    const parts = text.split(":").map(Number);
    if (parts.length !== 2 || !parts.every((x) => Number.isFinite(x) && x > 0) || parts[1] < parts[0]) {
      throw new InputError(`--tempering-beta: '${text}' is not HOT:COLD with 0 < HOT ≤ COLD (inverse temperatures)`);
    }
    beta = [parts[0], parts[1]];
  }
  const replicas = numberOption(argv, "tempering-replicas") as number;
  const external = parseExternalOption(argv.external);
  return {
    ...(solvers.includes("breakwalk") ? { breakwalk: { rule, cb, eps, flipsPerVariable: Number(bf[1]) } } : {}),
    ...(solvers.includes("tempering") ? { tempering: { replicas, sweeps, beta } } : {}),
    ...(external.length > 0 ? { external } : {}),
  };
}

/**
 * The spectral filter strengths: `--spectral-b-scan FROM:TO:STEP` when given (it overrides `--spectral-b`), else
 * `--spectral-b`. Used by `run` (one cell per b) and `spectral` (one result per b).
 */
export function resolveBValues(argv: Argv): number[] {
  if (argv["spectral-b-scan"] === undefined) return [numberOption(argv, "spectral-b") as number];
  const text = String(argv["spectral-b-scan"]);
  const parts = text.split(":").map((p) => (p.trim() === "" ? NaN : Number(p)));
  if (parts.length !== 3 || !parts.every(Number.isFinite) || parts[2] <= 0 || parts[1] < parts[0] || parts[0] < 0) {
    throw new InputError(`--spectral-b-scan: '${text}' is not FROM:TO:STEP with 0 ≤ FROM ≤ TO and STEP > 0`);
  }
  const values: number[] = [];
  for (let i = 0; parts[0] + i * parts[2] <= parts[1] + 1e-12; i++) {
    values.push(Number((parts[0] + i * parts[2]).toPrecision(12)));
    if (values.length > 10_000) throw new InputError(`--spectral-b-scan: '${text}' gives more than 10000 values of b`);
  }
  return values;
}

/** A numeric option that has no default: null when not given. */
function optionalNumber(argv: Argv, name: string): number | null {
  return argv[name] === undefined ? null : numberOption(argv, name);
}

/** The cost-model options (group "cost model"), resolved with their defaults. */
export function resolveCostModel(argv: Argv): StudySpec["costModel"] {
  return {
    // Division (not × 1e-6) so the default 170 µs gives exactly the literal 170e-6 the cost model knows as its default.
    toffoliSeconds: (numberOption(argv, "toffoli-us") as number) / 1e6,
    factories: numberOption(argv, "factories") as number,
    classicalParallelism: numberOption(argv, "classical-parallelism") as number,
    oracleToffolis: optionalNumber(argv, "oracle-toffolis"),
    walkStepToffolis: optionalNumber(argv, "walk-step-toffolis"),
    annealStepToffolis: optionalNumber(argv, "anneal-step-toffolis"),
  };
}

function deepFreeze<T>(o: T): T {
  if (o && typeof o === "object") {
    for (const v of Object.values(o as object)) deepFreeze(v);
    Object.freeze(o);
  }
  return o;
}
