/**
 * Worker entry for the piscina pool: rebuilds the instance from its seed (or file), runs one solver or
 * predictor, and returns a small result. The wall clock is read here, around the pure computation.
 */
import { materialise, type InstanceContext } from "./families/registry.js";
import type { GeneratedInstance } from "./families/types.js";
import { costTolerance, meanCost } from "./model/problem.js";
import type { SpectralAnswer, Task, TrialsAnswer, TruthSliceAnswer } from "./tasks.js";
import { exhaustiveSlice } from "../solvers/exhaustive.js";
import { walkTrials } from "../solvers/walk.js";
import { annealTrials, defaultBetaRange } from "../solvers/anneal.js";
import { computeSpectral } from "./predict/spectral-cell.js";
import { withDrawStop } from "./families/draw-stop.js";

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

/** Piscina calls the default export once per task. */
export default function handle(task: Task): TruthSliceAnswer | TrialsAnswer | SpectralAnswer {
  // Tell the run loop that computing starts now: cell limits count from here, not from the queue.
  Atomics.store(task.stop, 1, 1);
  currentStop = task.stop;
  switch (task.type) {
    case "truth-slice": {
      const inst = instanceFor(task.ctx);
      const start = process.hrtime.bigint();
      const result = exhaustiveSlice(inst.problem, task.slice, task.stop);
      return { result, wall_ns: elapsed(start), meta: inst.meta, seed: inst.seed, mean: meanCost(inst.problem) };
    }
    case "trials": {
      injectFault(task.ctx);
      const inst = instanceFor(task.ctx);
      if (task.solver === "walk") {
        if (inst.problem.kind !== "cnf") throw new Error("walk applies to CNF instances only");
        const start = process.hrtime.bigint();
        const result = walkTrials(inst.problem.cnf, { trials: task.trials, maxFlips: task.runLength, seed: task.seed, stop: task.stop, firstTrial: 0 });
        return { result, wall_ns: elapsed(start), beta_start: null, beta_end: null };
      }
      const range = task.beta ?? (() => {
        const r = defaultBetaRange(inst.problem);
        return [r.betaStart, r.betaEnd] as const;
      })();
      const tolerance = costTolerance(inst.problem);
      const start = process.hrtime.bigint();
      const result = annealTrials(inst.problem, {
        trials: task.trials,
        sweeps: task.runLength,
        betaStart: range[0],
        betaEnd: range[1],
        schedule: task.schedule,
        target: task.target,
        tolerance,
        seed: task.seed,
        stop: task.stop,
        firstTrial: 0,
      });
      return { result, wall_ns: elapsed(start), beta_start: range[0], beta_end: range[1] };
    }
    case "spectral": {
      const inst = instanceFor(task.ctx);
      const start = process.hrtime.bigint();
      const row = computeSpectral(inst.problem, task.optimum, task.b, task.eta);
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
