/** `speedbound solve FILE`: exact optimum and degeneracy of one instance file, over the worker pool. */
import { computeGroundTruth, computeGroundTruthHere, groundTruthIsOnePart, type GroundTruth } from "../../engine/ground-truth.js";
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { EXIT, InputError } from "../../errors.js";
import { parseDimacs } from "../../formats/dimacs.js";
import { parseCouplingList } from "../../formats/coupling-list.js";
import type { Problem } from "../../model/problem.js";
import { costTolerance, sizeOf } from "../../model/problem.js";
import { groundTruthSolver } from "../../../solvers/exact-registry.js";
import { type Args } from "./shared.js";
import { workersOf } from "./shared.js";

/** Reads an instance file by its content: DIMACS CNF when it has a `p cnf` line (or ends in .cnf), else a coupling list. */
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
  const exact = groundTruthSolver(problem.kind, false, n);
  const limit = exact.maxSize(problem.kind, false);
  if (n > limit) throw new InputError(`${file}: n = ${n} is beyond the exact ground-truth limit of ${limit} (the largest n an exact solver accepts: ${exact.name})`);
  const stop = new Int32Array(new SharedArrayBuffer(8));
  const ctx = { family: problem.kind === "cnf" ? "cnf" : "ising", params: {}, masterSeed: "", n, index: 0, file: resolve(file) };
  // One part (counting, small enumerations): computed in this thread, since starting worker threads would
  // cost more than the work (issue 16: a 100-variable count takes about 0.1 s).
  const inThread = groundTruthIsOnePart(problem, workersOf(argv));
  const workers = inThread ? 1 : workersOf(argv);
  const start = process.hrtime.bigint();
  let truth: GroundTruth;
  if (inThread) truth = computeGroundTruthHere(problem, workers, stop);
  else {
    // The pool (piscina, worker threads) is loaded only for a ground truth split into parts.
    const { WorkerPool } = await import("../../engine/pool.js");
    const pool = new WorkerPool(workers);
    try {
      truth = await computeGroundTruth(pool, problem, ctx, workers, stop);
    } finally {
      await pool.close();
    }
  }
  const wall = Number(process.hrtime.bigint() - start);
  const r = truth.merged;
  // issue 16: degeneracy stays exact beyond 2^53 (a decimal string there); the method is named.
  const degeneracy = r.degeneracy >= 2 ** 53 && r.degeneracyExact ? r.degeneracyExact : r.degeneracy;
  const result =
    problem.kind === "cnf"
      ? { file, variables: n, clauses: problem.cnf.offsets.length - 1, optimum: r.optimum, degeneracy, satisfiable: r.optimum === 0, assignments: r.assignments, method: r.method ?? "enumeration", wall_ns: wall, workers }
      : { file, spins: n, terms: problem.ising.coefficients.length, optimum: r.optimum, degeneracy: r.degeneracy, degeneracy_tolerance: costTolerance(problem), assignments: r.assignments, wall_ns: wall, workers };
  if (argv.json) process.stdout.write(JSON.stringify(result) + "\n");
  else for (const [k, v] of Object.entries(result)) process.stdout.write(`${k.padEnd(22)} ${String(v)}\n`);
  return EXIT.ok;
}
