/**
 * Worker entry for the piscina pool: rebuilds the instance from its seed (or file), runs one solver or
 * predictor, and returns a small result. The wall clock is read here, around the pure computation.
 */
import { materialise, type InstanceContext } from "../families/registry.js";
import type { GeneratedInstance } from "../families/types.js";
import { costTolerance, meanCost } from "../model/problem.js";
import type { PredictAnswer, Task, TrialsAnswer, TruthSliceAnswer } from "./tasks.js";
import { exactSolverNamed, trialsSolverNamed } from "../../solvers/registry.js";
import { predictorNamed } from "../predict/registry.js";
import { withDrawStop } from "../families/draw-stop.js";

// Slices and runs of one instance usually reach the same worker in a row; regenerating is cheap for plain
// draws but costs exact enumerations for --satisfiable/--unique, so the last instance is kept.
let cachedKey = "";
let cached: GeneratedInstance | null = null;
/** The running task's stop flag: a limit raised while redrawing formulas stops the redraws too. */
let currentStop: Int32Array | null = null;

function instanceFor(ctx: InstanceContext): GeneratedInstance {
  const key = JSON.stringify(ctx);
  if (key !== cachedKey || cached === null) {
    cached = withDrawStop(() => currentStop !== null && Atomics.load(currentStop, 0) === 1, () => materialise(ctx));
    cachedKey = key;
  }
  return cached;
}

function elapsed(start: bigint): number {
  return Number(process.hrtime.bigint() - start);
}

/**
 * The fixed cost of a cell (issue 13, the fixed-cost floor): the same call with zero-length work, timed after the
 * real call so it runs warm (instance cached), the median of 3 calls: the first zero-length call after a real one
 * measured 10–20 ms against 0.1–0.5 ms for the next ones (pspin n = 12–22, spin kernel; a one-off cost of the
 * new call shape, not a per-cell cost), and a shared machine adds occasional stalls. Null when not accepted.
 */
function floorOf(call: () => unknown): number | null {
  try {
    const times: number[] = [];
    for (let i = 0; i < 3; i++) {
      const start = process.hrtime.bigint();
      call();
      times.push(elapsed(start));
    }
    return times.sort((x, y) => x - y)[1]!;
  } catch {
    return null;
  }
}

/** Piscina calls the default export once per task; the method comes from its registry, never a switch on names. */
export default function handle(task: Task): TruthSliceAnswer | TrialsAnswer | PredictAnswer {
  // Tell the run loop that computing starts now: cell limits count from here, not from the queue.
  Atomics.store(task.stop, 1, 1);
  currentStop = task.stop;
  switch (task.type) {
    case "truth-slice": {
      const solver = exactSolverNamed(task.solver);
      const inst = instanceFor(task.ctx);
      const start = process.hrtime.bigint();
      const result = solver.run(inst.problem, task.part, task.stop);
      const wall_ns = elapsed(start);
      // Zero-length run: the solver's smallest part of the same shape (one configuration for enumeration).
      const least = solver.leastPart?.(inst.problem, task.part);
      const floor_ns = least === undefined ? null : floorOf(() => solver.run(inst.problem, least, null));
      return { result, wall_ns, start_ns: String(start), floor_ns, meta: inst.meta, seed: inst.seed, mean: meanCost(inst.problem) };
    }
    case "trials": {
      injectFault(task.ctx);
      const solver = trialsSolverNamed(task.solver);
      const inst = instanceFor(task.ctx);
      // Instance-dependent set-up (e.g. the annealer's temperature range) is not part of the timed run.
      const settings = solver.prepare ? solver.prepare(inst.problem, task.settings) : task.settings;
      const tolerance = costTolerance(inst.problem);
      const input = {
        trials: task.trials, runLength: task.runLength, seed: task.seed, target: task.target, tolerance, settings, stop: task.stop,
      };
      const start = process.hrtime.bigint();
      const result = solver.run(inst.problem, input);
      const wall_ns = elapsed(start);
      // Zero-length run: the same call with zero trials leaves only the per-call set-up.
      const floor_ns = floorOf(() => solver.run(inst.problem, { ...input, trials: 0, stop: null }));
      return { result, wall_ns, floor_ns };
    }
    case "predict": {
      const cell = predictorNamed(task.predictor).cell;
      if (!cell) throw new Error(`predictor '${task.predictor}' has no worker-side numerics`);
      const inst = instanceFor(task.ctx);
      const start = process.hrtime.bigint();
      const row = cell.run(inst.problem, { param: task.param, optimum: task.optimum, options: task.options, stop: task.stop });
      return { row, wall_ns: elapsed(start) };
    }
  }
}

/**
 * Test hook: SPEEDBOUND_TEST_FAULT=MODE:N:INDEX makes the trials cells of instance (N, INDEX) fail, with
 * MODE "throw" (an exception) or "exit" (the worker thread dies), so tests can check that one failing cell
 * becomes an error row and the study goes on. Unset in normal use.
 */
function injectFault(ctx: InstanceContext): void {
  const spec = process.env.SPEEDBOUND_TEST_FAULT;
  if (!spec) return;
  const [mode, n, index] = spec.split(":");
  if (Number(n) !== ctx.n || Number(index) !== ctx.index) return;
  if (mode === "exit") process.exit(70);
  throw new Error(`injected fault for n=${ctx.n} instance ${ctx.index} (SPEEDBOUND_TEST_FAULT)`);
}
