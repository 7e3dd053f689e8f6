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
      return { result, wall_ns: elapsed(start), meta: inst.meta, seed: inst.seed, mean: meanCost(inst.problem) };
    }
    case "trials": {
      injectFault(task.ctx);
      const solver = trialsSolverNamed(task.solver);
      const inst = instanceFor(task.ctx);
      // Instance-dependent set-up (e.g. the annealer's temperature range) is not part of the timed run.
      const settings = solver.prepare ? solver.prepare(inst.problem, task.settings) : task.settings;
      const tolerance = costTolerance(inst.problem);
      const start = process.hrtime.bigint();
      const result = solver.run(inst.problem, {
        trials: task.trials, runLength: task.runLength, seed: task.seed, target: task.target, tolerance, settings, stop: task.stop,
      });
      return { result, wall_ns: elapsed(start) };
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
