/**
 * Validation at the edge: turns parsed command-line values into a frozen {@link StudySpec}. Every problem
 * becomes an InputError naming the option and the value (exit code 2).
 */
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { join, resolve } from "node:path";
import { InputError } from "./errors.js";
import { FOLDER_FAMILIES, loadInstanceFile } from "./families/registry.js";
import { defaultDensity } from "./families/ksat.js";
import { FAMILY_NAMES, PREDICTOR_NAMES, SOLVER_NAMES, STUDY_OPTIONS, type OptionSpec } from "./options.js";
import type { StudySpec } from "./study.js";
import { sizeOf } from "./model/problem.js";
import { CNF_EXACT_MAX_VARIABLES } from "../solvers/exhaustive-cnf.js";
import { SPIN_EXACT_MAX } from "../solvers/exhaustive-spin.js";
import { lanczosMaxN } from "./predict/lanczos.js";
import type { BuildStamp } from "./build-info.js";

type Argv = Readonly<Record<string, unknown>>;

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
  const s = STUDY_OPTIONS.find((o) => o.name === name);
  if (!s) throw new Error(`no option ${name}`);
  return s;
}

/** Reads a numeric option with its declared range. */
export function numberOption(argv: Argv, name: string): number | null {
  const raw = argv[name];
  const decl = spec(name);
  if (raw === undefined || raw === null || raw === "") return decl.default === undefined ? null : Number(decl.default);
  const value = typeof raw === "number" ? raw : Number(String(raw).trim());
  if (!Number.isFinite(value)) throw new InputError(`--${name}: '${String(raw)}' is not a number`);
  if (decl.type === "integer" && !Number.isInteger(value)) throw new InputError(`--${name}: '${String(raw)}' is not a whole number`);
  if (decl.min !== undefined && value < decl.min) throw new InputError(`--${name}: ${value} is below the minimum ${decl.min}`);
  if (decl.max !== undefined && value > decl.max) throw new InputError(`--${name}: ${value} is above the maximum ${decl.max}`);
  return value;
}

function listOption(argv: Argv, name: string, allowed: ReadonlyArray<string>): string[] {
  const raw = argv[name] ?? spec(name).default ?? "";
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

/** Family parameters that determine instances, resolved with defaults (these are hashed into seeds). */
export function resolveFamilyParams(argv: Argv, family: string): Record<string, number | string | boolean> {
  switch (family) {
    case "ksat": {
      const k = numberOption(argv, "k") as number;
      const density = argv.density === undefined ? defaultDensity(k) : (numberOption(argv, "density") as number);
      if (!(density > 0)) throw new InputError(`--density: must be positive, got ${density}`);
      const unique = argv.unique === true;
      return { k, density, planted: argv.planted === true, satisfiable: argv.satisfiable === true || unique, unique };
    }
    case "sk": {
      const couplings = String(argv.couplings ?? "gauss");
      if (!["gauss", "pm1"].includes(couplings)) throw new InputError(`--couplings: '${couplings}' is not gauss or pm1`);
      return { couplings };
    }
    case "pspin":
      return { p: numberOption(argv, "p") as number };
    case "maxcut":
      return { degree: numberOption(argv, "degree") as number };
    default:
      return {};
  }
}

/** Lists a folder's instance files (sorted) for the cnf / ising families, with their sizes. */
export function listInstanceFolder(family: string, from: unknown): Array<{ file: string; n: number }> {
  if (from === undefined || from === "") throw new InputError(`--from: family '${family}' reads a folder of files; give --from DIR`);
  const dir = resolve(String(from));
  if (!existsSync(dir)) throw new InputError(`--from: folder '${String(from)}' does not exist`);
  if (!statSync(dir).isDirectory()) throw new InputError(`--from: '${String(from)}' is not a folder`);
  const ext = family === "cnf" ? /\.cnf$/i : /\.(txt|ising|couplings)$/i;
  const names = readdirSync(dir).filter((f) => ext.test(f)).sort();
  if (names.length === 0) {
    throw new InputError(`--from: folder '${String(from)}' has no ${family === "cnf" ? ".cnf" : ".txt/.ising/.couplings"} files`);
  }
  return names.map((name) => {
    const file = join(dir, name);
    return { file, n: sizeOf(loadInstanceFile(family, file).problem) };
  });
}

/** Turns parsed options into a frozen study spec, validating everything. */
export function resolveStudy(argv: Argv): StudySpec {
  const family = String(argv.family ?? "ksat");
  if (!(FAMILY_NAMES as ReadonlyArray<string>).includes(family)) {
    throw new InputError(`--family: unknown family '${family}' (choose from ${FAMILY_NAMES.join(", ")})`);
  }
  const folder = FOLDER_FAMILIES.has(family);
  const files = folder ? listInstanceFolder(family, argv.from) : [];
  const sizes = folder ? [...new Set(files.map((f) => f.n))].sort((a, b) => a - b) : parseSizeRange(String(argv.n ?? spec("n").default));
  const familyParams = resolveFamilyParams(argv, family);
  const isCnf = family === "ksat" || family === "cnf";
  const limit = isCnf ? CNF_EXACT_MAX_VARIABLES : SPIN_EXACT_MAX;
  const largest = sizes[sizes.length - 1];
  if (largest > limit) {
    const where = folder ? `--from: ${files.find((f) => f.n === largest)?.file}: n = ${largest}` : `--n: size ${largest}`;
    throw new InputError(`${where} is beyond the exact-enumeration limit of ${limit} for this family (ground truth needs all 2^n configurations)`);
  }
  if (family === "ksat" && sizes[0] < (familyParams.k as number)) {
    throw new InputError(`--n: size ${sizes[0]} is smaller than k = ${familyParams.k}`);
  }
  if (family === "pspin" && sizes[0] < (familyParams.p as number)) {
    throw new InputError(`--n: size ${sizes[0]} is smaller than p = ${familyParams.p}`);
  }
  if (family === "maxcut") {
    const d = familyParams.degree as number;
    for (const n of sizes) {
      if (n <= d || (n * d) % 2 === 1) throw new InputError(`--n: no simple ${d}-regular graph on ${n} vertices (need n > d and n·d even)`);
    }
  }
  const solvers = listOption(argv, "solvers", SOLVER_NAMES).filter((s) => s !== "exhaustive");
  if (solvers.includes("walk") && !isCnf) {
    if (argv.solvers !== undefined) throw new InputError(`--solvers: walk (Schöning) applies to k-SAT/CNF families only, not '${family}'`);
    solvers.splice(solvers.indexOf("walk"), 1); // the default list names it for k-SAT studies
  }
  const predictors = listOption(argv, "predict", PREDICTOR_NAMES);
  if (predictors.includes("amplified-walk") && !solvers.includes("walk")) {
    if (argv.predict !== undefined) throw new InputError(`--predict: amplified-walk needs the walk solver in --solvers`);
    predictors.splice(predictors.indexOf("amplified-walk"), 1);
  }
  if (predictors.includes("amplified-anneal") && !solvers.includes("anneal")) {
    if (argv.predict !== undefined) throw new InputError(`--predict: amplified-anneal needs the anneal solver in --solvers`);
    predictors.splice(predictors.indexOf("amplified-anneal"), 1);
  }
  // Spectral numerics keep a few 2^n state vectors: 2 GiB allows n ≤ 24 (25 for spin-flip-symmetric models).
  const spectralMax = lanczosMaxN(family === "sk" || family === "maxcut" ? "symmetric" : "all");
  if (predictors.includes("spectral") && largest > spectralMax) {
    throw new InputError(`--predict: spectral needs n ≤ ${spectralMax} (state vectors within 2 GiB), but --n reaches ${largest}`);
  }
  const walkFlipsText = String(argv["walk-flips"] ?? spec("walk-flips").default);
  const wf = /^(\d+(?:\.\d+)?)n$/.exec(walkFlipsText);
  if (!wf) throw new InputError(`--walk-flips: '${walkFlipsText}' is not of the form Kn (e.g. 3n)`);
  const walkFlipsPerVariable = Number(wf[1]);
  if (!(walkFlipsPerVariable > 0)) throw new InputError(`--walk-flips: must be positive, got '${walkFlipsText}'`);
  const sweeps = numberList(String(argv.sweeps ?? spec("sweeps").default), "--sweeps").map((s) => {
    if (!Number.isInteger(s)) throw new InputError(`--sweeps: '${s}' is not a whole number`);
    return s;
  });
  const schedule = String(argv.schedule ?? "geometric");
  if (schedule !== "linear" && schedule !== "geometric") throw new InputError(`--schedule: '${schedule}' is not linear or geometric`);
  let beta: [number, number] | null = null;
  if (argv.beta !== undefined) {
    const parts = String(argv.beta).split(":").map(Number);
    if (parts.length !== 2 || !parts.every((x) => Number.isFinite(x) && x > 0) || parts[1] < parts[0]) {
      throw new InputError(`--beta: '${String(argv.beta)}' is not START:END with 0 < START ≤ END`);
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
    predictors,
    spectral: { bValues, eta: numberOption(argv, "eta") as number },
    costModel: resolveCostModel(argv),
    report: { fitFrom: optionalNumber(argv, "fit-from"), resamples: numberOption(argv, "resamples") as number },
  };
  return deepFreeze(study);
}

/** The spectral filter strengths: `--b-scan FROM:TO:STEP` when given (it overrides `--b`), else `--b`. */
export function resolveBValues(argv: Argv): number[] {
  if (argv["b-scan"] === undefined) return [numberOption(argv, "b") as number];
  const text = String(argv["b-scan"]);
  const parts = text.split(":").map((p) => (p.trim() === "" ? NaN : Number(p)));
  if (parts.length !== 3 || !parts.every(Number.isFinite) || parts[2] <= 0 || parts[1] < parts[0] || parts[0] < 0) {
    throw new InputError(`--b-scan: '${text}' is not FROM:TO:STEP with 0 ≤ FROM ≤ TO and STEP > 0`);
  }
  const values: number[] = [];
  for (let i = 0; parts[0] + i * parts[2] <= parts[1] + 1e-12; i++) {
    values.push(Number((parts[0] + i * parts[2]).toPrecision(12)));
    if (values.length > 10_000) throw new InputError(`--b-scan: '${text}' gives more than 10000 values of b`);
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

/** Reads the study spec a folder holds (spec.json), for `report`, `compare` and `merge`. */
export function readStudyFolder(dir: string): { spec: StudySpec; shard: { k: number; count: number } | null; build?: Partial<BuildStamp> } {
  const path = join(dir, "spec.json");
  if (!existsSync(dir)) throw new InputError(`${dir}: folder does not exist`);
  if (!existsSync(path)) throw new InputError(`${dir}: not a speedbound output folder (no spec.json)`);
  try {
    return JSON.parse(readFileSync(path, "utf8")) as { spec: StudySpec; shard: { k: number; count: number } | null; build?: Partial<BuildStamp> };
  } catch {
    throw new InputError(`${path}:1: spec.json does not parse`);
  }
}
