/**
 * Drives a study's cells through the worker pool: ground truth first for each instance (its slices spread over
 * the pool), then the solver and spectral cells that need it; size after size, so a budget cut leaves whole
 * sizes. Every finished cell goes to the journal at once; tables are rebuilt from the journal at the end, so a
 * killed run resumes where it stopped and ends with the same tables.
 */
import { join } from "node:path";
import type { InstanceContext } from "../families/registry.js";
import { JournalWriter, readJournal, type JournalRecord, type RunRecord, type SpectralRecord, type TruthRecord } from "./journal.js";
import { WorkerPool } from "./pool.js";
import { StopControl } from "./stop.js";
import { computeGroundTruth, slicesElapsed } from "./ground-truth.js";
import type { Progress } from "./progress.js";
import { InputError } from "../errors.js";
import { OUT_FILES, prepareOutput } from "./output-folder.js";
import type { RunSummary } from "./run-summary.js";
import { type Cell, type InstanceRef, type StudySpec, cellsOfInstance, instancesOf, methodOptionsOf, shardInstances, solverStudyOf } from "./study.js";
import type { PredictAnswer, TrialsAnswer } from "./tasks.js";
import { trialsSolverNamed } from "../../solvers/registry.js";
import { familyNamed, materialise } from "../families/registry.js";
import { costTolerance } from "../model/problem.js";
import { FLOOR_LIMIT_MS, measureStartupFloor, ProcessSlots, runExternalCell } from "./external-solver.js";
import { lockFolder } from "./folder-lock.js";
import { GENERATION_STOPPED, withDrawStop } from "../families/draw-stop.js";

/** How a run is carried out (not part of the study's identity). */
export interface RunOptions {
  readonly out: string;
  readonly workers: number;
  /** Whole-study wall-clock budget, ms (null = none). */
  readonly budgetMs: number | null;
  /** Per-cell wall-clock limit, ms (null = none). */
  readonly cellLimitMs: number | null;
  /** Shard K of N (1-based), or null for all cells. */
  readonly shard: { readonly k: number; readonly count: number } | null;
  readonly progress: Progress;
  /** Time running cells get to finish after SIGINT/SIGTERM before they are stopped (ms). */
  readonly graceMs: number;
}

export { LIMIT_POLL_MS } from "./stop.js";

/** Runs (or resumes) a study. Resolves when every cell is journalled, skipped by the budget, or interrupted. */
export async function runStudy(spec: StudySpec, options: RunOptions): Promise<RunSummary> {
  prepareOutput(spec, options.out, options.shard);
  const lock = lockFolder(options.out, "--out", "run"); // one writer per folder: no interleaved journal
  try {
    return await runLocked(spec, options);
  } finally {
    lock.release();
  }
}

async function runLocked(spec: StudySpec, options: RunOptions): Promise<RunSummary> {
  const journalPath = join(options.out, OUT_FILES.journal);
  const previous = readJournal(journalPath, true);
  const done = new Map<string, JournalRecord>();
  for (const r of previous.records) done.set(r.key, r);
  const journal = new JournalWriter(journalPath);

  const all = instancesOf(spec);
  const mine = options.shard ? shardInstances(all, options.shard.k, options.shard.count) : all;
  const sizes = [...new Set(mine.map((i) => i.n))].sort((a, b) => a - b);
  const cellsTotal = mine.reduce((s, inst) => s + cellsOfInstance(spec, inst).length, 0);

  const state = { done: 0, resumed: 0, errors: 0, censored: 0, skipped: 0 };
  const stop = new StopControl({ budgetMs: options.budgetMs, cellLimitMs: options.cellLimitMs, graceMs: options.graceMs, note: (line) => options.progress.note(line) });
  const withStopFlag = <T>(body: (flag: Int32Array) => Promise<T>): Promise<T> => stop.withStopFlag(body);

  const pool = new WorkerPool(options.workers);
  const problemKind = familyNamed(spec.family).kind;
  // External solver binaries: at most --workers processes at once, and each command's start-up floor measured
  // once per run on a trivial instance (recorded in its rows, so start-up cost can be told from scaling).
  const processSlots = new ProcessSlots(options.workers);
  const floors = new Map<string, number | null>();
  for (const ext of spec.external ?? []) {
    floors.set(ext.name, (await measureStartupFloor(ext, problemKind, 5, Math.min(FLOOR_LIMIT_MS, options.cellLimitMs ?? Infinity))).floor_ns);
  }
  let storageFailure: unknown = null;
  const record = (r: JournalRecord): void => {
    if (storageFailure !== null) return;
    try {
      journal.append(r);
    } catch (e) {
      // Disk full (or the like): keep what was acknowledged, start nothing new, stop running cells, report once.
      storageFailure = e;
      stop.stopNow();
      return;
    }
    done.set(r.key, r);
    killAtTestPoint(done.size);
    state.done++;
    if (r.status === "error" || r.status === "wrong") state.errors++; // a wrong external answer fails the run too
    if (r.status === "censored") state.censored++;
    options.progress.tick(r.key);
  };

  const solverStudy = solverStudyOf(spec);
  const methodOptions = methodOptionsOf(spec);
  const ctxOf = (inst: InstanceRef): InstanceContext => ({
    family: spec.family, params: spec.familyParams, masterSeed: spec.seed, n: inst.n, index: inst.index, file: inst.file,
  });

  const runTruth = async (cell: Cell): Promise<TruthRecord> => {
    const inst = cell.instance;
    const base = { key: cell.key, kind: "truth" as const, n: inst.n, index: inst.index, file: inst.file };
    return withStopFlag(async (flag) => {
      try {
        // The slice plan needs the problem's kind and symmetry only; generating in the main thread is cheap
        // except for --satisfiable/--unique, which the first worker answer would repeat anyway.
        // Generation counts against the budget and the cell limit (see StopControl.generationCheck).
        const problem = withDrawStop(stop.generationCheck(), () => materialise(ctxOf(inst))).problem;
        const { merged, answers } = await computeGroundTruth(pool, problem, ctxOf(inst), options.workers, flag);
        const elapsed = slicesElapsed(answers);
        const wall = answers.reduce((s, a) => s + a.wall_ns, 0);
        const floor = answers.every((a) => a.floor_ns !== null) ? answers.reduce((s, a) => s + (a.floor_ns ?? 0), 0) : null;
        const status = merged.complete ? "ok" : "censored";
        return {
          ...base, status, wall_ns: wall, elapsed_ns: elapsed, message: status === "ok" ? "" : "stopped by a time limit",
          seed: answers[0].seed, meta: answers[0].meta,
          optimum: merged.complete ? merged.optimum : null,
          degeneracy: merged.complete ? merged.degeneracy : null,
          assignments: merged.assignments, evaluated: merged.evaluated, floor_ns: floor, mean: answers[0].mean,
          // issue 16: which exact method answered, and its exact count.
          truth_method: merged.method ?? "enumeration",
          ...(merged.complete ? { degeneracy_exact: merged.degeneracyExact ?? String(merged.degeneracy) } : {}),
          ...(merged.nodes === undefined ? {} : { nodes: merged.nodes }),
        };
      } catch (e) {
        if (e instanceof InputError) throw e; // an unmeetable filter (e.g. --satisfiable at a high density) ends the study: bad input
        const stopped = messageOf(e).startsWith(GENERATION_STOPPED);
        // No exact method ran (the instance was never drawn, or the method failed before answering).
        return { ...base, status: stopped ? "censored" : "error", wall_ns: 0, message: messageOf(e), seed: "", meta: {}, optimum: null, degeneracy: null, assignments: 0, mean: null, truth_method: "none" };
      }
    });
  };

  const runOther = async (cell: Cell, truth: TruthRecord): Promise<JournalRecord> => {
    const inst = cell.instance;
    const base = { key: cell.key, n: inst.n, index: inst.index, file: inst.file };
    if (cell.kind === "run") {
      const rec = (extra: Partial<RunRecord>): RunRecord => ({
        ...base, kind: "run", solver: cell.method, run_length: cell.runLength ?? 0, trials: 0, successes: 0, work: 0,
        best: null, beta_start: null, beta_end: null, status: "error", wall_ns: 0, message: "", ...extra,
      });
      if (truth.status !== "ok" || truth.optimum === null) return rec(withoutTruth(truth));
      const external = spec.external?.find((e) => e.name === cell.method);
      if (external) {
        return withStopFlag(async (flag) => {
          try {
            const problem = materialise(ctxOf(inst)).problem;
            const x = await runExternalCell(external, problem, truth.optimum as number, costTolerance(problem), spec.trials, cell.seed, flag,
              options.cellLimitMs, processSlots, floors.get(external.name) ?? null);
            return rec({ status: x.status, trials: x.trials, successes: x.successes, work: x.work, wall_ns: x.wall_ns, message: x.message, ...(x.details as Partial<RunRecord>),
              // The fixed-cost floor of an external cell is its command's start-up, once per process run.
              floor_ns: typeof x.details.startup_floor_ns === "number" ? x.details.startup_floor_ns * Math.max(1, x.trials) : null });
          } catch (e) {
            return rec({ message: messageOf(e) });
          }
        });
      }
      const solver = trialsSolverNamed(cell.method);
      const skip = solver.skipReason({ kind: problemKind, optimum: truth.optimum });
      if (skip !== null) return rec({ status: "skipped", message: skip });
      return withStopFlag(async (flag) => {
        try {
          const a = await pool.run<TrialsAnswer>({
            type: "trials", ctx: ctxOf(inst), solver: cell.method, runLength: cell.runLength ?? 0,
            trials: spec.trials, seed: cell.seed, target: truth.optimum as number, settings: solver.settings(solverStudy), stop: flag,
          });
          const r = a.result;
          return rec({
            status: r.censored ? "censored" : "ok", wall_ns: a.wall_ns, trials: r.trials, successes: r.successes, work: r.work,
            best: Number.isFinite(r.best) ? r.best : null, ...(r.extra as Partial<RunRecord> | undefined), floor_ns: a.floor_ns,
            ...(r.stepsToSolution === undefined ? {} : { steps_to_solution: r.stepsToSolution }),
            ...(r.exchangeAcceptance === undefined ? {} : { exchange_acceptance: r.exchangeAcceptance }),
            message: r.censored ? `stopped by a time limit after ${r.trials} trials` : "",
          });
        } catch (e) {
          return rec({ message: messageOf(e) });
        }
      });
    }
    const rec = (extra: Partial<SpectralRecord>): SpectralRecord => ({
      ...base, kind: "spectral", ...(cell.method === "spectral" ? {} : { predictor: cell.method }), b: cell.runLength ?? 0, row: {}, status: "error", wall_ns: 0, message: "", ...extra,
    });
    if (truth.status !== "ok" || truth.optimum === null) return rec(withoutTruth(truth));
    return withStopFlag(async (flag) => {
      try {
        const a = await pool.run<PredictAnswer>({ type: "predict", ctx: ctxOf(inst), predictor: cell.method, param: cell.runLength ?? 0, options: methodOptions, optimum: truth.optimum as number, stop: flag });
        // A cell whose numerics do not apply to this instance says so in its row (predict/types.ts PredictorCell).
        if (a.row.status === "skipped") return rec({ status: "skipped", row: a.row, wall_ns: a.wall_ns, message: String(a.row.reason ?? "") });
        return rec({ status: "ok", row: a.row, wall_ns: a.wall_ns });
      } catch (e) {
        return rec({ message: messageOf(e) });
      }
    });
  };

  const runInstance = async (inst: InstanceRef): Promise<void> => {
    const cells = cellsOfInstance(spec, inst);
    const todo = cells.filter((c) => !done.has(c.key));
    state.resumed += cells.length - todo.length;
    if (todo.length === 0) return;
    if (stop.stopping) {
      state.skipped += todo.length;
      return;
    }
    let truth = done.get(cells[0].key) as TruthRecord | undefined;
    if (!truth) {
      truth = await runTruth(cells[0]);
      record(truth);
    }
    const rest = todo.filter((c) => c.kind !== "truth");
    await Promise.all(
      rest.map(async (cell) => {
        if (stop.stopping) {
          state.skipped++;
          return;
        }
        record(await runOther(cell, truth as TruthRecord));
      }),
    );
  };

  options.progress.start(cellsTotal, mine.reduce((s, i) => s + cellsOfInstance(spec, i).filter((c) => done.has(c.key)).length, 0));
  const completeSizes: number[] = [];
  const incompleteSizes: number[] = [];
  try {
    for (const n of sizes) {
      const ofSize = mine.filter((i) => i.n === n);
      if (!stop.stopping && Date.now() < stop.deadline) await Promise.all(ofSize.map(runInstance));
      else for (const inst of ofSize) await runInstance(inst);
      const complete = ofSize.every((inst) => cellsOfInstance(spec, inst).every((c) => done.has(c.key) && done.get(c.key)?.status !== "censored"));
      (complete ? completeSizes : incompleteSizes).push(n);
      options.progress.sizeDone(n, complete);
    }
  } finally {
    stop.dispose();
    journal.close();
    options.progress.stop();
    await pool.close();
  }
  if (storageFailure !== null) throw storageFailure;
  return {
    cellsTotal, cellsDone: state.done, cellsResumed: state.resumed, errors: state.errors, censored: state.censored,
    skipped: state.skipped, completeSizes, incompleteSizes, interrupted: stop.signal, tornJournalLine: previous.tornLine,
  };
}

/**
 * A cell that cannot run because its instance has no ground truth: censored (nothing measured, a lower bound of
 * zero) when a limit stopped the enumeration, an error when the enumeration failed.
 */
function withoutTruth(truth: TruthRecord): { status: "censored" | "error"; message: string } {
  return truth.status === "censored"
    ? { status: "censored", message: "not run: the ground truth was stopped by a time limit" }
    : { status: "error", message: `not run: no ground truth (${truth.message})` };
}

/** One-line message of an error (worker crashes arrive as Errors too). */
export function messageOf(e: unknown): string {
  const text = e instanceof Error ? e.message : String(e);
  return text.split("\n")[0];
}

/**
 * Test hook: SPEEDBOUND_TEST_KILL_AT=K kills this process with SIGKILL as soon as the journal holds K records,
 * so the resume test kills at exact points. (Killing from outside once the test sees K lines raced the study:
 * the last 8 cells of that test take 20–55 ms, and a test process descheduled that long let the study finish
 * before the kill.) Unset in normal use.
 */
function killAtTestPoint(records: number): void {
  const at = process.env.SPEEDBOUND_TEST_KILL_AT;
  if (at !== undefined && records === Number(at)) process.kill(process.pid, "SIGKILL");
}

