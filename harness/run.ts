/**
 * Drives a study's cells through the worker pool: ground truth first for each instance (its slices spread over
 * the pool), then the solver and spectral cells that need it; size after size, so a budget cut leaves whole
 * sizes. Every finished cell goes to the journal at once; tables are rebuilt from the journal at the end, so a
 * killed run resumes where it stopped and ends with the same tables.
 */
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { InputError } from "./errors.js";
import type { InstanceContext } from "./families/registry.js";
import { JournalWriter, readJournal, type JournalRecord, type RunRecord, type SpectralRecord, type TruthRecord } from "./journal.js";
import { WorkerPool } from "./pool.js";
import type { Progress } from "./progress.js";
import { type Cell, type InstanceRef, type StudySpec, cellsOfInstance, instancesOf, shardInstances } from "./study.js";
import type { SpectralAnswer, TrialsAnswer, TruthSliceAnswer } from "./tasks.js";
import { writeFileAtomic } from "./files.js";
import { mergeExact, planSlices } from "../solvers/exhaustive.js";
import { materialise } from "./families/registry.js";
import { costTolerance } from "./model/problem.js";
import { ensureWritableFolder } from "./fs-guard.js";
import { lockFolder } from "./folder-lock.js";
import { GENERATION_STOPPED, withDrawStop } from "./families/draw-stop.js";
import { assertResumable, buildStamp, type BuildStamp } from "./build-info.js";

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

/** What a run did. */
export interface RunSummary {
  readonly cellsTotal: number;
  readonly cellsDone: number;
  readonly cellsResumed: number;
  readonly errors: number;
  readonly censored: number;
  readonly skipped: number;
  readonly completeSizes: number[];
  readonly incompleteSizes: number[];
  readonly interrupted: NodeJS.Signals | null;
  readonly tornJournalLine: boolean;
}

/** How often the cell limit is checked (ms); a cell may overrun its limit by about this much. */
export const LIMIT_POLL_MS = 25;

/** File names inside an output folder. */
export const OUT_FILES = { spec: "spec.json", journal: "journal.jsonl", manifest: "manifest.json" } as const;

/**
 * Checks the output folder: creates it, or, when it already holds a study, insists it is the same study
 * (compared on the resolved spec, not the command line), so that a rerun resumes instead of mixing studies.
 */
export function prepareOutput(spec: StudySpec, out: string, shard: RunOptions["shard"]): void {
  ensureWritableFolder(out, "--out");
  const specPath = join(out, OUT_FILES.spec);
  if (existsSync(specPath)) {
    let previous: { spec?: unknown; shard?: unknown; build?: Partial<BuildStamp> };
    try {
      previous = JSON.parse(readFileSync(specPath, "utf8")) as typeof previous;
    } catch {
      throw new InputError(`${specPath}:1: spec.json does not parse; choose another folder or remove it`);
    }
    if (JSON.stringify({ spec: previous.spec, shard: previous.shard }) !== JSON.stringify({ spec, shard })) {
      throw new InputError(`--out: '${out}' holds a different study (see its ${OUT_FILES.spec}); choose another folder or remove it`);
    }
    assertResumable(out, previous.build); // same study, but drawn from this build's streams?
    return;
  }
  writeFileAtomic(specPath, JSON.stringify({ spec, shard, build: buildStamp() }, null, 2) + "\n");
}

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

  const state = {
    done: 0,
    resumed: 0,
    errors: 0,
    censored: 0,
    skipped: 0,
    stopping: false as boolean,
    signal: null as NodeJS.Signals | null,
    deadline: options.budgetMs === null ? Infinity : Date.now() + options.budgetMs,
  };
  const running = new Set<Int32Array>();
  const stopAll = (): void => {
    for (const flag of running) Atomics.store(flag, 0, 1);
  };
  let budgetTimer: NodeJS.Timeout | null = null;
  if (options.budgetMs !== null) {
    budgetTimer = setTimeout(() => {
      state.stopping = true;
      stopAll();
    }, options.budgetMs);
  }
  let graceTimer: NodeJS.Timeout | null = null;
  const onSignal = (signal: NodeJS.Signals): void => {
    if (state.signal) return;
    state.signal = signal;
    state.stopping = true;
    options.progress.note(`${signal}: no new cells; running ones get ${options.graceMs / 1000} s to finish`);
    graceTimer = setTimeout(stopAll, options.graceMs);
  };
  process.on("SIGINT", onSignal);
  process.on("SIGTERM", onSignal);

  const pool = new WorkerPool(options.workers);
  let storageFailure: unknown = null;
  const record = (r: JournalRecord): void => {
    if (storageFailure !== null) return;
    try {
      journal.append(r);
    } catch (e) {
      // Disk full (or the like): keep what was acknowledged, start nothing new, stop running cells, report once.
      storageFailure = e;
      state.stopping = true;
      stopAll();
      return;
    }
    done.set(r.key, r);
    state.done++;
    if (r.status === "error") state.errors++;
    if (r.status === "censored") state.censored++;
    options.progress.tick(r.key);
  };

  /**
   * A fresh stop flag for one cell, raised by the cell limit, the budget or a signal's grace period. Element 1
   * is set by the worker when it starts computing, so the cell limit counts computing time, not time spent
   * waiting in the pool's queue (checked every {@link LIMIT_POLL_MS} ms).
   */
  const started = new Map<Int32Array, number>();
  const limitTimer =
    options.cellLimitMs === null
      ? null
      : setInterval(() => {
          const now = Date.now();
          for (const flag of running) {
            if (Atomics.load(flag, 1) === 0) continue;
            const t0 = started.get(flag);
            if (t0 === undefined) started.set(flag, now);
            else if (now - t0 >= (options.cellLimitMs as number)) Atomics.store(flag, 0, 1);
          }
        }, LIMIT_POLL_MS);
  const withStopFlag = async <T>(body: (flag: Int32Array) => Promise<T>): Promise<T> => {
    const flag = new Int32Array(new SharedArrayBuffer(8));
    running.add(flag);
    try {
      return await body(flag);
    } finally {
      running.delete(flag);
      started.delete(flag);
    }
  };

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
        // Generation counts against the budget and the cell limit; this thread is busy meanwhile, so the timers
        // cannot fire and the check reads the clock itself.
        const t0 = Date.now();
        const limitAt = options.cellLimitMs === null ? Infinity : t0 + options.cellLimitMs;
        const problem = withDrawStop(() => state.stopping || Date.now() >= Math.min(state.deadline, limitAt), () => materialise(ctxOf(inst))).problem;
        const slices = planSlices(problem, options.workers);
        const answers = await Promise.all(
          slices.map((slice) => pool.run<TruthSliceAnswer>({ type: "truth-slice", ctx: ctxOf(inst), slice, stop: flag })),
        );
        const merged = mergeExact(answers.map((a) => a.result), costTolerance(problem));
        const wall = answers.reduce((s, a) => s + a.wall_ns, 0);
        const status = merged.complete ? "ok" : "censored";
        return {
          ...base, status, wall_ns: wall, message: status === "ok" ? "" : "stopped by a time limit",
          seed: answers[0].seed, meta: answers[0].meta,
          optimum: merged.complete ? merged.optimum : null,
          degeneracy: merged.complete ? merged.degeneracy : null,
          assignments: merged.assignments, mean: answers[0].mean,
        };
      } catch (e) {
        if (e instanceof InputError) throw e; // an unmeetable filter (e.g. --satisfiable at a high density) ends the study: bad input
        const stopped = messageOf(e).startsWith(GENERATION_STOPPED);
        return { ...base, status: stopped ? "censored" : "error", wall_ns: 0, message: messageOf(e), seed: "", meta: {}, optimum: null, degeneracy: null, assignments: 0, mean: null };
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
      if (cell.method === "walk" && truth.optimum > 0) {
        return rec({ status: "skipped", message: "not applicable: unsatisfiable, and Schöning's walk only finds models" });
      }
      return withStopFlag(async (flag) => {
        try {
          const a = await pool.run<TrialsAnswer>({
            type: "trials", ctx: ctxOf(inst), solver: cell.method as "walk" | "anneal", runLength: cell.runLength ?? 0,
            trials: spec.trials, seed: cell.seed, target: truth.optimum as number, schedule: spec.schedule, beta: spec.beta, stop: flag,
          });
          const r = a.result;
          return rec({
            status: r.censored ? "censored" : "ok", wall_ns: a.wall_ns, trials: r.trials, successes: r.successes, work: r.work,
            best: Number.isFinite(r.best) ? r.best : null, beta_start: a.beta_start, beta_end: a.beta_end,
            message: r.censored ? `stopped by a time limit after ${r.trials} trials` : "",
          });
        } catch (e) {
          return rec({ message: messageOf(e) });
        }
      });
    }
    const rec = (extra: Partial<SpectralRecord>): SpectralRecord => ({
      ...base, kind: "spectral", b: cell.runLength ?? 0, row: {}, status: "error", wall_ns: 0, message: "", ...extra,
    });
    if (truth.status !== "ok" || truth.optimum === null) return rec(withoutTruth(truth));
    return withStopFlag(async (flag) => {
      try {
        const a = await pool.run<SpectralAnswer>({ type: "spectral", ctx: ctxOf(inst), b: cell.runLength ?? 0, eta: spec.spectral.eta, optimum: truth.optimum as number, stop: flag });
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
    if (state.stopping) {
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
        if (state.stopping) {
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
      if (!state.stopping && Date.now() < state.deadline) await Promise.all(ofSize.map(runInstance));
      else for (const inst of ofSize) await runInstance(inst);
      const complete = ofSize.every((inst) => cellsOfInstance(spec, inst).every((c) => done.has(c.key) && done.get(c.key)?.status !== "censored"));
      (complete ? completeSizes : incompleteSizes).push(n);
      options.progress.sizeDone(n, complete);
    }
  } finally {
    if (budgetTimer) clearTimeout(budgetTimer);
    if (limitTimer) clearInterval(limitTimer);
    if (graceTimer) clearTimeout(graceTimer);
    process.off("SIGINT", onSignal);
    process.off("SIGTERM", onSignal);
    journal.close();
    options.progress.stop();
    await pool.close();
  }
  if (storageFailure !== null) throw storageFailure;
  return {
    cellsTotal, cellsDone: state.done, cellsResumed: state.resumed, errors: state.errors, censored: state.censored,
    skipped: state.skipped, completeSizes, incompleteSizes, interrupted: state.signal, tornJournalLine: previous.tornLine,
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
