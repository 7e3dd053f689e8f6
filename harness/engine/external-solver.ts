/**
 * Any solver binary as a baseline: `--external NAME=COMMAND`. Engine-side code (it spawns processes and reads
 * the clock), kept apart from the pure solvers.
 *
 * The command is split into words like a shell would (single and double quotes group, no other shell syntax),
 * then placeholders are replaced inside each word: `{file}` by the instance written to a temporary file (DIMACS
 * CNF for CNF families, the coupling list for Ising families), `{seed}` by a trial seed (an integer in
 * [1, 2^31 − 1]; with it the solver counts as randomised and runs `--trials` times), `{timeout}` by the whole
 * seconds left of the cell limit (86400 without a limit).
 *
 * Output conventions:
 * - CNF: the SAT competitions' — a line `s SATISFIABLE`, `s UNSATISFIABLE` or `s UNKNOWN`, and for a satisfiable
 *   answer `v` lines of literals ending with 0; exit code 10 (satisfiable), 20 (unsatisfiable) or 0. Any other
 *   exit code is an error.
 * - Ising: the last line starting with `v ` holds the n spins in index order, as ±1 (`1`, `+1`, `-1`) or as bits
 *   in speedbound's convention (`0` for s = +1, `1` for s = −1); a line with a `0` is read as bits, any other as ±1.
 *   Exit code 0.
 * Nothing is trusted: a model is checked against every clause; an energy is recomputed from the spins; both are
 * compared with the exact ground truth. An answer that fails a check (an invalid model, a claimed
 * unsatisfiability of a satisfiable formula, malformed spins, an energy below the exact optimum) makes the cell a
 * `wrong` row, never a success.
 */
import { spawn } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { writeDimacs } from "../formats/dimacs.js";
import { writeCouplingList } from "../formats/coupling-list.js";
import type { Cnf } from "../model/cnf.js";
import { isingFromTerms, type Ising } from "../model/ising.js";
import type { Problem } from "../model/problem.js";
import { InputError } from "../errors.js";
import { deriveSeed } from "../random.js";
import { SOLVER_NAMES } from "../../solvers/registry.js";
import { energyFromTerms } from "../../solvers/anneal-ising.js";

/** One `--external NAME=COMMAND`. */
export interface ExternalSolver {
  readonly name: string;
  readonly command: string;
}

/** Names an external solver may not take: the registered solvers' (they share the `solver` column and cell keys). */
const RESERVED: ReadonlySet<string> = new Set(SOLVER_NAMES);

/** Parses the repeatable option; bad values are {@link InputError}s naming the option. */
export function parseExternalOption(raw: unknown): ExternalSolver[] {
  if (raw === undefined) return [];
  const items = (Array.isArray(raw) ? raw : [raw]).map(String);
  const out: ExternalSolver[] = [];
  for (const item of items) {
    const eq = item.indexOf("=");
    const name = eq < 0 ? "" : item.slice(0, eq).trim();
    const command = eq < 0 ? "" : item.slice(eq + 1).trim();
    if (!/^[A-Za-z][A-Za-z0-9_.-]*$/.test(name) || command === "") {
      throw new InputError(`--external: '${item}' is not NAME=COMMAND (NAME: a letter, then letters, digits, _ . -)`);
    }
    if (RESERVED.has(name)) throw new InputError(`--external: the name '${name}' is a built-in solver's; choose another`);
    if (out.some((e) => e.name === name)) throw new InputError(`--external: the name '${name}' is given twice`);
    const words = splitCommand(command);
    if (words === null || words.length === 0) throw new InputError(`--external: '${command}' has an unmatched quote`);
    if (!command.includes("{file}")) throw new InputError(`--external: the command of '${name}' does not use {file}`);
    out.push({ name, command });
  }
  return out;
}

/** True when the command takes a seed (a randomised solver, run once per trial). */
export function isRandomised(solver: ExternalSolver): boolean {
  return solver.command.includes("{seed}");
}

/** Shell-like word splitting: whitespace separates, quotes group; null on an unmatched quote. */
export function splitCommand(command: string): string[] | null {
  const words: string[] = [];
  let word = "";
  let inWord = false;
  let quote: string | null = null;
  for (const ch of command) {
    if (quote !== null) {
      if (ch === quote) quote = null;
      else word += ch;
    } else if (ch === "'" || ch === '"') {
      quote = ch;
      inWord = true;
    } else if (/\s/.test(ch)) {
      if (inWord) words.push(word);
      word = "";
      inWord = false;
    } else {
      word += ch;
      inWord = true;
    }
  }
  if (quote !== null) return null;
  if (inWord) words.push(word);
  return words;
}

/** What one process run of an external solver gave. */
export interface ExternalRun {
  /** "solved": a checked answer reaching the optimum (or a correct unsatisfiability); "unsolved": a valid but
   * non-optimal or unknown answer; "wrong": an answer failing a check; "timeout": killed by the limit;
   * "error": not started, or an unexpected exit code. */
  readonly outcome: "solved" | "unsolved" | "wrong" | "timeout" | "error";
  readonly wall_ns: number;
  readonly message: string;
}

/** Options of {@link runExternal}. */
export interface ExternalRunOptions {
  /** Exact optimum (violated clauses or energy) and the tolerance for Ising energies. */
  readonly optimum: number;
  readonly tolerance: number;
  readonly seed: number;
  /** Seconds left of the cell limit for {timeout} (null = no limit). */
  readonly timeoutSeconds: number | null;
  /** Polled every 25 ms; when it returns true the process gets SIGTERM, then SIGKILL after `killGraceMs`. */
  readonly shouldStop: () => boolean;
  readonly killGraceMs?: number;
}

/** Writes the instance for {file}: DIMACS for CNF, the coupling list for Ising. Returns the path and a cleanup. */
export function writeInstanceFile(problem: Problem): { path: string; cleanup: () => void } {
  const dir = mkdtempSync(join(tmpdir(), "speedbound-ext-"));
  const path = join(dir, problem.kind === "cnf" ? "instance.cnf" : "instance.txt");
  writeFileSync(path, problem.kind === "cnf" ? writeDimacs(problem.cnf) : writeCouplingList(problem.ising));
  return { path, cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}

/** Trial seed for {seed}: a positive 31-bit integer derived from the cell seed and the trial. */
export function externalSeed(cellSeed: string, trial: number): number {
  return (parseInt(deriveSeed(cellSeed, "external", trial).slice(0, 8), 16) % 2147483646) + 1;
}

/** Runs the command once on an instance file and checks its answer. Never throws for process failures. */
export async function runExternal(solver: ExternalSolver, problem: Problem, file: string, options: ExternalRunOptions): Promise<ExternalRun> {
  const words = (splitCommand(solver.command) ?? []).map((w) =>
    w
      .replaceAll("{file}", file)
      .replaceAll("{seed}", String(options.seed))
      .replaceAll("{timeout}", String(options.timeoutSeconds === null ? 86400 : Math.max(1, Math.ceil(options.timeoutSeconds)))),
  );
  const started = process.hrtime.bigint();
  const result = await new Promise<{ code: number | null; signal: NodeJS.Signals | null; stdout: string; spawnError: string | null; killed: boolean }>((resolve) => {
    const child = spawn(words[0], words.slice(1), { stdio: ["ignore", "pipe", "ignore"] });
    const chunks: Buffer[] = [];
    let killed = false;
    let spawnError: string | null = null;
    child.stdout.on("data", (c: Buffer) => chunks.push(c));
    const timer = setInterval(() => {
      if (!killed && options.shouldStop()) {
        killed = true;
        child.kill("SIGTERM");
        setTimeout(() => child.exitCode === null && child.signalCode === null && child.kill("SIGKILL"), options.killGraceMs ?? 2000).unref();
      }
    }, 25);
    child.on("error", (e: NodeJS.ErrnoException) => {
      spawnError = e.code === "ENOENT" ? `command not found: ${words[0]}` : `cannot start ${words[0]}: ${e.message}`;
    });
    child.on("close", (code, signal) => {
      clearInterval(timer);
      resolve({ code, signal, stdout: Buffer.concat(chunks).toString("utf8"), spawnError, killed });
    });
  });
  const wall_ns = Number(process.hrtime.bigint() - started);
  if (result.spawnError !== null) return { outcome: "error", wall_ns, message: result.spawnError };
  if (result.killed) return { outcome: "timeout", wall_ns, message: "killed by the cell limit" };
  if (result.code === null) return { outcome: "error", wall_ns, message: `${solver.name} ended by signal ${result.signal}` };
  return problem.kind === "cnf"
    ? { ...checkCnfAnswer(problem.cnf, result.stdout, result.code, options.optimum), wall_ns }
    : { ...checkIsingAnswer(problem.ising, result.stdout, result.code, options.optimum, options.tolerance), wall_ns };
}

/** Checks SAT-competition output against the formula and the exact optimum (0 = satisfiable). Pure. */
export function checkCnfAnswer(cnf: Cnf, stdout: string, exitCode: number, optimum: number): { outcome: ExternalRun["outcome"]; message: string } {
  if (exitCode !== 0 && exitCode !== 10 && exitCode !== 20) return { outcome: "error", message: `exit code ${exitCode} (expected 0, 10 or 20)` };
  const lines = stdout.split(/\r?\n/);
  const status = lines.filter((l) => /^s\s/.test(l)).map((l) => l.slice(1).trim().toUpperCase());
  const claim = status.length > 0 ? status[status.length - 1] : exitCode === 10 ? "SATISFIABLE" : exitCode === 20 ? "UNSATISFIABLE" : "UNKNOWN";
  if ((exitCode === 10 && claim !== "SATISFIABLE") || (exitCode === 20 && claim !== "UNSATISFIABLE")) {
    return { outcome: "wrong", message: `exit code ${exitCode} contradicts 's ${claim}'` };
  }
  if (claim === "UNSATISFIABLE") {
    return optimum > 0 ? { outcome: "solved", message: "" } : { outcome: "wrong", message: "claimed UNSATISFIABLE, but the formula has a model" };
  }
  if (claim !== "SATISFIABLE") return { outcome: "unsolved", message: `answer ${claim}` };
  const n = cnf.variables;
  const value = new Int8Array(n + 1); // 1 true, -1 false, 0 unassigned
  let ended = false;
  for (const line of lines) {
    if (!/^v(\s|$)/.test(line)) continue;
    for (const token of line.slice(1).trim().split(/\s+/)) {
      if (token === "") continue;
      const lit = Number(token);
      if (!Number.isInteger(lit) || Math.abs(lit) > n) return { outcome: "wrong", message: `model literal '${token}' is not a variable of 1..${n}` };
      if (lit === 0) {
        ended = true;
        continue;
      }
      const v = Math.abs(lit);
      const sign = lit > 0 ? 1 : -1;
      if (value[v] === -sign) return { outcome: "wrong", message: `model sets variable ${v} both ways` };
      value[v] = sign;
    }
  }
  if (!ended) return { outcome: "wrong", message: "claimed SATISFIABLE without a model ending in 0" };
  for (let c = 0; c + 1 < cnf.offsets.length; c++) {
    let sat = false;
    for (let i = cnf.offsets[c]; i < cnf.offsets[c + 1] && !sat; i++) {
      const lit = cnf.literals[i];
      sat = value[Math.abs(lit)] === (lit > 0 ? 1 : -1);
    }
    if (!sat) return { outcome: "wrong", message: `the model violates clause ${c + 1}` };
  }
  if (optimum > 0) return { outcome: "wrong", message: "the model checks, but the exact ground truth says unsatisfiable (report this)" };
  return { outcome: "solved", message: "" };
}

/** Checks an Ising answer (last `v ` line) by recomputing the energy. Pure. */
export function checkIsingAnswer(model: Ising, stdout: string, exitCode: number, optimum: number, tolerance: number): { outcome: ExternalRun["outcome"]; message: string } {
  if (exitCode !== 0) return { outcome: "error", message: `exit code ${exitCode} (expected 0)` };
  const lines = stdout.split(/\r?\n/).filter((l) => l.startsWith("v "));
  if (lines.length === 0) return { outcome: "unsolved", message: "no 'v ' line" };
  const tokens = lines[lines.length - 1].slice(2).trim().split(/\s+/).filter((t) => t !== "");
  const n = model.spins;
  if (tokens.length !== n) return { outcome: "wrong", message: `the 'v ' line has ${tokens.length} values, expected ${n}` };
  const bits = tokens.includes("0");
  const spins = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = tokens[i];
    if (bits) {
      if (t !== "0" && t !== "1") return { outcome: "wrong", message: `spin ${i}: '${t}' in a 0/1 line` };
      spins[i] = t === "0" ? 1 : -1;
    } else {
      if (t !== "1" && t !== "+1" && t !== "-1") return { outcome: "wrong", message: `spin ${i}: '${t}' is not ±1` };
      spins[i] = t === "-1" ? -1 : 1;
    }
  }
  const energy = energyFromTerms(model, spins);
  if (energy < optimum - tolerance) return { outcome: "wrong", message: `energy ${energy} is below the exact optimum ${optimum} (report this)` };
  return energy <= optimum + tolerance ? { outcome: "solved", message: "" } : { outcome: "unsolved", message: `energy ${energy} above the optimum ${optimum}` };
}

/** The trivial instance of the start-up floor: one variable and the clause (x1), or one spin with a field. */
export function trivialInstance(kind: Problem["kind"]): { problem: Problem; optimum: number } {
  if (kind === "cnf") return { problem: { kind: "cnf", cnf: { variables: 1, offsets: Int32Array.of(0, 1), literals: Int32Array.of(1) } }, optimum: 0 };
  return { problem: { kind: "ising", ising: isingFromTerms(1, [{ spins: [0], J: 1 }]) }, optimum: -1 };
}

/**
 * The command's start-up floor: the median whole-process wall time of `repeats` runs on the trivial instance
 * (ns), with the outcome of the first run (a command that fails here fails every cell too).
 */
export async function measureStartupFloor(
  solver: ExternalSolver, kind: Problem["kind"], repeats = 5, limitMs = FLOOR_LIMIT_MS,
): Promise<{ floor_ns: number | null; message: string }> {
  const { problem, optimum } = trivialInstance(kind);
  const { path, cleanup } = writeInstanceFile(problem);
  try {
    const times: number[] = [];
    for (let r = 0; r < repeats; r++) {
      const t0 = Date.now();
      const run = await runExternal(solver, problem, path, { optimum, tolerance: 1e-9, seed: r + 1, timeoutSeconds: limitMs / 1000, shouldStop: () => Date.now() - t0 > limitMs });
      if (run.outcome === "error") return { floor_ns: null, message: run.message };
      if (run.outcome === "timeout") return { floor_ns: null, message: `no answer on the trivial instance within ${limitMs / 1000} s` };
      times.push(run.wall_ns);
    }
    times.sort((a, b) => a - b);
    return { floor_ns: times[Math.floor(times.length / 2)], message: "" };
  } finally {
    cleanup();
  }
}

/** Longest a run on the trivial instance of the start-up floor may take (ms; the cell limit when shorter). */
export const FLOOR_LIMIT_MS = 10_000;

/** At most `limit` external processes at once (the run's --workers). */
export class ProcessSlots {
  private free: number;
  private readonly waiting: Array<() => void> = [];
  constructor(limit: number) {
    this.free = Math.max(1, limit);
  }
  async use<T>(body: () => Promise<T>): Promise<T> {
    if (this.free > 0) this.free--;
    else await new Promise<void>((resolve) => this.waiting.push(resolve));
    try {
      return await body();
    } finally {
      const next = this.waiting.shift();
      if (next) next();
      else this.free++;
    }
  }
}

/** What an external cell reports to the run loop (the fields of its runs.csv row). */
export interface ExternalCellResult {
  readonly status: "ok" | "censored" | "error" | "wrong";
  readonly trials: number;
  readonly successes: number;
  /** Process runs (an external solver reports no elementary steps). */
  readonly work: number;
  readonly wall_ns: number;
  readonly message: string;
  readonly details: Readonly<Record<string, number | string | null>>;
}

/**
 * One external cell: `trials` process runs for a randomised command (one with {seed}), else one; each run waits
 * for a process slot. `stop` is the cell's stop flag (element 0 raised by the cell limit or the budget; element 1
 * set here when the first process starts, so the limit counts from then). A wrong answer ends the cell as `wrong`;
 * a kill by the limit ends it as censored; a start failure or unexpected exit code as an error.
 */
export async function runExternalCell(
  solver: ExternalSolver, problem: Problem, optimum: number, tolerance: number, trials: number, cellSeed: string,
  stop: Int32Array, cellLimitMs: number | null, slots: ProcessSlots, floorNs: number | null,
): Promise<ExternalCellResult> {
  const runs = isRandomised(solver) ? trials : 1;
  const { path, cleanup } = writeInstanceFile(problem);
  const details = { startup_floor_ns: floorNs, randomised: isRandomised(solver) ? "yes" : "no" };
  let done = 0;
  let successes = 0;
  let wall = 0;
  let firstStart: number | null = null;
  try {
    for (let t = 0; t < runs; t++) {
      if (Atomics.load(stop, 0) !== 0) {
        return { status: "censored", trials: done, successes, work: done, wall_ns: wall, message: `stopped by a time limit after ${done} runs`, details };
      }
      const run = await slots.use(() => {
        if (firstStart === null) {
          firstStart = Date.now();
          Atomics.store(stop, 1, 1);
        }
        const left = cellLimitMs === null ? null : (cellLimitMs - (Date.now() - firstStart)) / 1000;
        return runExternal(solver, problem, path, { optimum, tolerance, seed: externalSeed(cellSeed, t), timeoutSeconds: left, shouldStop: () => Atomics.load(stop, 0) !== 0 });
      });
      if (run.outcome === "error") return { status: "error", trials: done, successes, work: done, wall_ns: wall, message: run.message, details };
      if (run.outcome === "timeout") {
        return { status: "censored", trials: done, successes, work: done, wall_ns: wall + run.wall_ns, message: `run ${t + 1} killed by the cell limit`, details };
      }
      if (run.outcome === "wrong") return { status: "wrong", trials: done + 1, successes, work: done + 1, wall_ns: wall + run.wall_ns, message: `WRONG ANSWER (run ${t + 1}): ${run.message}`, details };
      done++;
      wall += run.wall_ns;
      if (run.outcome === "solved") successes++;
    }
    return { status: "ok", trials: done, successes, work: done, wall_ns: wall, message: "", details };
  } finally {
    cleanup();
  }
}
