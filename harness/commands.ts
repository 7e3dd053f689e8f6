/**
 * What each CLI command does, on typed inputs. cli.ts parses; this file runs the harness and prints.
 */
import { availableParallelism } from "node:os";
import { chmodSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { join, resolve } from "node:path";
import { EXIT, InputError } from "./errors.js";
import { OUT_FILES, runStudy, type RunSummary } from "./run.js";
import { numberOption, parseDuration, parseShard, readStudyFolder, resolveBValues, resolveFamilyParams, resolveStudy, parseSizeRange } from "./resolve.js";
import { sizeRangeNote } from "./argv-guard.js";
import { consoleProgress } from "./progress.js";
import { writeOutputs } from "./report/outputs.js";
import { buildManifest } from "./manifest.js";
import { writeFileAtomic } from "./files.js";
import { generatorFor } from "./families/registry.js";
import { parseDimacs, writeDimacs } from "./formats/dimacs.js";
import { parseCouplingList, writeCouplingList } from "./formats/coupling-list.js";
import type { Problem } from "./model/problem.js";
import { costTolerance, sizeOf } from "./model/problem.js";
import { WorkerPool } from "./pool.js";
import { exactLimit, mergeExact, planSlices } from "../solvers/exhaustive.js";
import type { TruthSliceAnswer } from "./tasks.js";
import { canonicalParams } from "./families/params.js";
import { FAMILY_NAMES } from "./options.js";
import { formatComparison } from "./report/paper.js";
import { computeSpectral } from "./predict/spectral-cell.js";
import { costModelRows } from "./predict/cost-table.js";
import { mergeShards, writeMerged } from "./merge.js";
import { DEFAULT_SPEED_TOLERANCE, compareFolders } from "./compare.js";
import { SLURM_FILES, slurmScripts } from "./slurm.js";
import { assertWritableFolder, ensureWritableFolder, guardWrite } from "./fs-guard.js";
import { lockFolder } from "./folder-lock.js";
import { resolvedOptions } from "./resolved-options.js";
import { STREAM_SCHEME, streamsNote } from "./build-info.js";

type Args = Readonly<Record<string, unknown>>;

function workersOf(argv: Args): number {
  return numberOption(argv, "workers") ?? Math.max(1, availableParallelism());
}

/** `speedbound run`: resolve, run (or resume), write tables and manifest, print the comparison. */
export async function run(argv: Args, rawArgs: ReadonlyArray<string>): Promise<number> {
  const spec = resolveStudy(argv);
  const note = sizeRangeNote(argv.n, spec.sizes);
  if (note) process.stderr.write(`speedbound: note: ${note}\n`);
  const out = resolve(String(argv.out ?? "results/latest"));
  const workers = workersOf(argv);
  const shard = argv.shard === undefined ? null : parseShard(String(argv.shard));
  const budgetMs = argv.budget === undefined ? null : parseDuration(String(argv.budget), "--budget");
  const cellLimitMs = argv["cell-limit"] === undefined ? null : parseDuration(String(argv["cell-limit"]), "--cell-limit");
  const started = new Date();
  const summary = await runStudy(spec, { out, workers, budgetMs, cellLimitMs, shard, progress: consoleProgress(), graceMs: 10_000 });
  if (summary.tornJournalLine) process.stderr.write(`speedbound: warning: the journal's last line was torn (a killed run) and was dropped\n`);
  const { paper } = await writeOutputs(spec, out);
  const extra = { resolved_options: resolvedOptions(argv, { out, workers, budgetMs, cellLimitMs, shard }), stream_scheme: STREAM_SCHEME };
  writeFileAtomic(join(out, OUT_FILES.manifest), JSON.stringify(buildManifest({ argv: rawArgs, spec, workers, shard, started, ended: new Date(), summary, extra }), null, 2) + "\n");
  process.stdout.write(formatComparison(paper) + "\n");
  process.stdout.write(summaryLine(summary, out) + "\n");
  if (summary.interrupted === "SIGINT") return EXIT.interrupted;
  if (summary.interrupted === "SIGTERM") return EXIT.terminated;
  return summary.errors > 0 ? EXIT.failures : EXIT.ok;
}

function summaryLine(s: RunSummary, out: string): string {
  const parts = [
    `${s.cellsDone} cells run`,
    s.cellsResumed ? `${s.cellsResumed} resumed from the journal` : "",
    s.censored ? `${s.censored} censored by limits` : "",
    s.errors ? `${s.errors} ERRORS (see runs.csv 'message')` : "",
    s.skipped ? `${s.skipped} skipped (budget or signal)` : "",
    `complete sizes: ${s.completeSizes.join(",") || "none"}`,
    s.incompleteSizes.length ? `incomplete: ${s.incompleteSizes.join(",")}` : "",
  ].filter((x) => x !== "");
  return `speedbound: ${parts.join("; ")}\nspeedbound: tables in ${out}`;
}

/** `speedbound demo` (npm start): a small 3-SAT study with a summary. */
export async function demo(): Promise<number> {
  // Satisfiable draws only, so that every solver (Schöning's walk included) is measured on the same instances.
  const argv = ["run", "--family", "ksat", "--k", "3", "--n", "12:26:2", "--instances", "8", "--satisfiable", "--seed", "demo-1", "--trials", "1000", "--sweeps", "10,30,100,300", "--out", "results/demo"];
  process.stderr.write(`speedbound demo: ${["speedbound", ...argv].join(" ")}\n`);
  const parsed: Record<string, unknown> = {};
  for (let i = 1; i < argv.length; i++) {
    const name = argv[i].slice(2);
    if (argv[i + 1] === undefined || argv[i + 1].startsWith("--")) parsed[name] = true;
    else parsed[name] = argv[++i];
  }
  return run(parsed, argv);
}

/** Reads an instance file as DIMACS CNF (when it has a 'p cnf' header) or as a coupling list. */
export function readProblemFile(file: string): Problem {
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (e) {
    throw new InputError(`${file}: cannot read (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
  }
  if (/^\s*p\s+cnf\b/m.test(text) || /\.cnf$/i.test(file)) return { kind: "cnf", cnf: parseDimacs(text, file) };
  return { kind: "ising", ising: parseCouplingList(text, file) };
}

/** `speedbound solve FILE`: exact optimum and degeneracy, over the worker pool. */
export async function solve(argv: Args): Promise<number> {
  const file = String(argv.file);
  const problem = readProblemFile(file);
  const n = sizeOf(problem);
  if (n > exactLimit(problem)) throw new InputError(`${file}: n = ${n} is beyond the exact-enumeration limit of ${exactLimit(problem)}`);
  const workers = workersOf(argv);
  const pool = new WorkerPool(workers);
  const stop = new Int32Array(new SharedArrayBuffer(8));
  const ctx = { family: problem.kind === "cnf" ? "cnf" : "ising", params: {}, masterSeed: "", n, index: 0, file: resolve(file) };
  const start = process.hrtime.bigint();
  let answers: TruthSliceAnswer[];
  try {
    answers = await Promise.all(planSlices(problem, workers).map((slice) => pool.run<TruthSliceAnswer>({ type: "truth-slice", ctx, slice, stop })));
  } finally {
    await pool.close();
  }
  const wall = Number(process.hrtime.bigint() - start);
  const r = mergeExact(answers.map((a) => a.result), costTolerance(problem));
  const result =
    problem.kind === "cnf"
      ? { file, variables: n, clauses: problem.cnf.offsets.length - 1, optimum: r.optimum, degeneracy: r.degeneracy, satisfiable: r.optimum === 0, assignments: r.assignments, wall_ns: wall, workers }
      : { file, spins: n, terms: problem.ising.coefficients.length, optimum: r.optimum, degeneracy: r.degeneracy, degeneracy_tolerance: costTolerance(problem), assignments: r.assignments, wall_ns: wall, workers };
  if (argv.json) process.stdout.write(JSON.stringify(result) + "\n");
  else for (const [k, v] of Object.entries(result)) process.stdout.write(`${k.padEnd(22)} ${String(v)}\n`);
  return EXIT.ok;
}

/** `speedbound instance`: one generated instance to stdout. */
export async function instance(argv: Args): Promise<number> {
  const family = String(argv.family ?? "ksat");
  if (!(FAMILY_NAMES as ReadonlyArray<string>).includes(family) || family === "cnf" || family === "ising") {
    throw new InputError(`--family: '${family}' is not a generated family (ksat, sk, pspin, maxcut)`);
  }
  const sizes = parseSizeRange(String(argv.n ?? "20"));
  if (sizes.length !== 1) throw new InputError(`--n: give one size for 'instance', got '${String(argv.n)}'`);
  const index = Number(argv.index ?? 0);
  if (!Number.isInteger(index) || index < 0) throw new InputError(`--index: '${String(argv.index)}' is not a whole number ≥ 0`);
  const params = resolveFamilyParams(argv, family);
  const seed = String(argv.seed ?? "1");
  const inst = generatorFor(family).generate(seed, params, sizes[0], index);
  const header = [
    `generated by speedbound: family ${family}, ${canonicalParams(params)}, n ${sizes[0]}, master seed ${seed}, index ${index}`,
    `instance seed ${inst.seed}`,
    ...Object.entries(inst.meta).map(([k, v]) => `${k} ${String(v)}`),
  ];
  process.stdout.write(inst.problem.kind === "cnf" ? writeDimacs(inst.problem.cnf, header) : writeCouplingList(inst.problem.ising, header));
  return EXIT.ok;
}

/** `speedbound report DIR`: rebuild tables from the journal (optionally with other fit settings). */
export async function report(argv: Args): Promise<number> {
  const dir = resolve(String(argv.dir));
  const { spec } = readStudyFolder(dir);
  assertWritableFolder(dir, "report");
  const lock = lockFolder(dir, "report", "report"); // not while a run writes the same folder
  const fitFrom = argv["fit-from"] === undefined ? spec.report.fitFrom : numberOption(argv, "fit-from");
  const resamples = argv.resamples === undefined ? spec.report.resamples : (numberOption(argv, "resamples") as number);
  const { paper } = await writeOutputs({ ...spec, report: { fitFrom, resamples } }, dir).finally(() => lock.release());
  process.stdout.write(formatComparison(paper) + "\n");
  process.stdout.write(`speedbound: tables rebuilt in ${dir}\n`);
  return EXIT.ok;
}

/** `speedbound spectral FILE`: one spectral computation, printed. */
export async function spectral(argv: Args): Promise<number> {
  const file = String(argv.file);
  const problem = readProblemFile(file);
  const eta = numberOption(argv, "eta") as number;
  const bValues = resolveBValues(argv); // --b-scan FROM:TO:STEP gives one result per b (JSON: one object a line)
  for (const [i, b] of bValues.entries()) {
    const start = process.hrtime.bigint();
    const row = computeSpectral(problem, null, b, eta);
    const result = { file, n: sizeOf(problem), ...row, wall_ns: Number(process.hrtime.bigint() - start) };
    if (argv.json) process.stdout.write(JSON.stringify(result) + "\n");
    else {
      if (i > 0) process.stdout.write("\n");
      for (const [k, v] of Object.entries(result)) process.stdout.write(`${k.padEnd(22)} ${String(v)}\n`);
    }
  }
  return EXIT.ok;
}

/** `speedbound cost`: the cost model's assumptions and a worked example. */
export async function cost(argv: Args): Promise<number> {
  const rows = costModelRows(argv);
  const w = [0, 0];
  for (const r of rows) {
    w[0] = Math.max(w[0], r.quantity.length);
    w[1] = Math.max(w[1], r.value.length);
  }
  for (const r of rows) process.stdout.write(`${r.quantity.padEnd(w[0])}  ${r.value.padEnd(w[1])}  ${r.source}\n`);
  return EXIT.ok;
}

/** `speedbound merge OUT DIR…`: join shard folders and write the tables. */
export async function merge(argv: Args, rawArgs: ReadonlyArray<string>): Promise<number> {
  const out = resolve(String(argv.out));
  const dirs = ((argv.dirs as string[] | undefined) ?? []).map((d) => resolve(d));
  const merged = mergeShards(dirs);
  mkdirOrFail(out, "merge");
  writeMerged(out, merged);
  const started = new Date();
  const { paper } = await writeOutputs(merged.spec, out);
  writeFileAtomic(
    join(out, OUT_FILES.manifest),
    JSON.stringify(buildManifest({ argv: rawArgs, spec: merged.spec, workers: 0, shard: null, started, ended: new Date(), summary: null, extra: { merged_from: dirs } }), null, 2) + "\n",
  );
  process.stdout.write(formatComparison(paper) + "\n");
  process.stdout.write(`speedbound: merged ${merged.shards} shard(s), ${merged.records.length} cells, into ${out}\n`);
  return EXIT.ok;
}

function mkdirOrFail(dir: string, label: string): void {
  ensureWritableFolder(dir, label); // one-level-at-a-time mkdir: never spins (see fs-guard.ts)
}

/** `speedbound compare OLD NEW`: exit 1 on a regression. */
export async function compare(argv: Args): Promise<number> {
  const tolerance = argv.tolerance === undefined ? DEFAULT_SPEED_TOLERANCE : Number(argv.tolerance);
  if (!(tolerance > 0) || !Number.isFinite(tolerance)) throw new InputError(`--tolerance: '${String(argv.tolerance)}' is not a positive number`);
  const findings = compareFolders(resolve(String(argv.old)), resolve(String(argv.new)), tolerance);
  const streams = streamsNote(readStudyFolder(resolve(String(argv.old))).build, readStudyFolder(resolve(String(argv.new))).build);
  if (streams) process.stdout.write(`note        streams       ${streams}\n`);
  if (findings.length === 0) process.stdout.write("speedbound compare: no change beyond intervals and tolerance\n");
  for (const f of findings) process.stdout.write(`${f.regression ? "REGRESSION" : "change    "}  ${f.kind.padEnd(12)}  ${f.what}: ${f.detail}\n`);
  return findings.some((f) => f.regression) ? EXIT.failures : EXIT.ok;
}

/** Options of `speedbound slurm` that are not study options (removed before the study is passed on). */
const SLURM_ONLY = ["shards", "cpus-per-task", "time", "partition", "account", "mem-per-cpu", "job-name", "out", "workers", "shard"];

/** `speedbound slurm …study options… --shards N`: writes the sbatch scripts of a job array and its merge. */
export async function slurm(argv: Args, rawArgs: ReadonlyArray<string>): Promise<number> {
  resolveStudy(argv); // refuse a bad study now, not on the cluster
  const shards = Number(argv.shards);
  if (!Number.isInteger(shards) || shards < 1) throw new InputError(`--shards: '${String(argv.shards)}' is not a whole number ≥ 1`);
  const cpus = Number(argv["cpus-per-task"] ?? 2);
  if (!Number.isInteger(cpus) || cpus < 1) throw new InputError(`--cpus-per-task: '${String(argv["cpus-per-task"])}' is not a whole number ≥ 1`);
  const out = resolve(String(argv.out ?? "results/latest"));
  const studyArgs = stripOptions(rawArgs.slice(1), SLURM_ONLY);
  const scripts = slurmScripts({
    studyArgs, out, shards, cpusPerTask: cpus,
    ...(argv["mem-per-cpu"] === undefined ? {} : { memPerCpu: String(argv["mem-per-cpu"]) }),
    ...(argv.time === undefined ? {} : { time: String(argv.time) }),
    ...(argv.partition === undefined ? {} : { partition: String(argv.partition) }),
    ...(argv.account === undefined ? {} : { account: String(argv.account) }),
    node: process.execPath,
    cli: fileURLToPath(new URL("./cli.js", import.meta.url)),
    jobName: String(argv["job-name"] ?? "speedbound"),
    workDir: process.cwd(),
  });
  const dir = join(out, "slurm");
  mkdirOrFail(dir, "--out");
  for (const [name, file] of Object.entries(SLURM_FILES) as Array<[keyof typeof SLURM_FILES, string]>) {
    writeFileAtomic(join(dir, file), scripts[name]);
    guardWrite("slurm", join(dir, file), () => chmodSync(join(dir, file), 0o755));
  }
  process.stdout.write(`speedbound: wrote ${Object.values(SLURM_FILES).map((f) => join(dir, f)).join(", ")}\n`);
  process.stdout.write(`speedbound: submit with: bash ${join(dir, SLURM_FILES.submit)}\n`);
  return EXIT.ok;
}

/** Removes `--name value` / `--name=value` pairs (and bare boolean flags of those names) from an argument list. */
function stripOptions(args: ReadonlyArray<string>, names: ReadonlyArray<string>): string[] {
  const out: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const m = /^--?([^=]+)(=.*)?$/.exec(args[i]);
    if (m && names.includes(m[1])) {
      if (m[2] === undefined && i + 1 < args.length && !args[i + 1].startsWith("--")) i++;
      continue;
    }
    out.push(args[i]);
  }
  return out;
}
