/**
 * Exact enumeration through the worker pool: assignments/s covered with 1 worker and with all workers on random
 * 3-SAT at density 4.26 (n = 28, 30, 32), and the parallel speed-up (target ≥ 1.8× on 2 workers for runs of
 * 30 ms or more, issue 2).
 */
import { availableParallelism } from "node:os";
import { WorkerPool } from "../../harness/engine/pool.js";
import { ksatFamily } from "../../harness/families/ksat.js";
import { mergeExact, planSlices } from "../../solvers/exhaustive.js";
import type { TruthSliceAnswer } from "../../harness/engine/tasks.js";

const PARAMS = { k: 3, density: 4.26, planted: false, satisfiable: false, unique: false };

async function timeOnce(pool: WorkerPool, n: number, index: number): Promise<{ seconds: number; assignments: number }> {
  const problem = ksatFamily.generate("bench", PARAMS, n, index).problem;
  const ctx = { family: "ksat", params: PARAMS, masterSeed: "bench", n, index, file: "" };
  const stop = new Int32Array(new SharedArrayBuffer(8));
  // Warm the workers' instance cache and JIT on the same instance first: we time the enumeration, not start-up.
  await Promise.all(planSlices(problem, pool.size).map((slice) => pool.run<TruthSliceAnswer>({ type: "truth-slice", ctx, solver: "exhaustive", part: slice, stop })));
  const start = process.hrtime.bigint();
  const answers = await Promise.all(planSlices(problem, pool.size).map((slice) => pool.run<TruthSliceAnswer>({ type: "truth-slice", ctx, solver: "exhaustive", part: slice, stop })));
  const seconds = Number(process.hrtime.bigint() - start) / 1e9;
  return { seconds, assignments: mergeExact(answers.map((a) => a.result), 0.5).assignments };
}

export async function run(): Promise<void> {
  const all = availableParallelism();
  const one = new WorkerPool(1);
  const many = new WorkerPool(all);
  try {
    console.log(`n   instance  1 worker (assign/s)   ${all} workers (assign/s)   speed-up  wall(${all})`);
    for (const n of [28, 30, 32]) {
      for (const index of [0, 1]) {
        const a = await timeOnce(one, n, index);
        const b = await timeOnce(many, n, index);
        const r1 = a.assignments / a.seconds;
        const r2 = b.assignments / b.seconds;
        console.log(`${n}  ${String(index).padStart(8)}  ${r1.toExponential(3).padStart(20)}  ${r2.toExponential(3).padStart(22)}  ${(r2 / r1).toFixed(2).padStart(8)}  ${(b.seconds * 1000).toFixed(1)} ms`);
      }
    }
  } finally {
    await one.close();
    await many.close();
  }
}
