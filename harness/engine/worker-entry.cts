/**
 * The file piscina loads in each worker thread: a CommonJS shim that starts loading the ESM worker (worker.ts)
 * with `import()` and hands every task to its default export.
 *
 * Why a shim: piscina loads its `filename` with `require()` first. On Node ≥ 20.19 `require()` of an ES module
 * runs the synchronous require(esm) path, and when the pool is destroyed while a worker is still inside it
 * (a short command such as `solve` ends before the idle second worker has finished loading), the thread's
 * termination interrupts module instantiation and Node aborts the whole process ("FATAL ERROR:
 * v8::Module::IsGraphAsync ... must be used on an instantiated module", exit 134). Node's synchronous
 * instantiate path reads the graph's asynchronicity without checking that instantiation succeeded; the
 * asynchronous `import()` path checks it. Loading this CommonJS file with `require()` runs no require(esm),
 * so terminating a worker at any moment is safe. Measured with a loop that starts a 2-thread pool and destroys it
 * after 0..199 ms (test/stress/pool-entry-race.ts): 7 aborts in 1700 cycles with the ESM entry, none in 900 with
 * this one; and 0 abnormal exits in 1000 quick commands (test/stress/quick-commands.ts). See README, "Reliability".
 */
import type { Task } from "./tasks.js";

// Started at once, so loading overlaps the pool's start-up; a task awaits it only the first time.
const loading = import("./worker.js");
// A rejected load is reported by the first task; this keeps it from being an unhandled rejection before then.
loading.catch(() => undefined);

async function handle(task: Task): Promise<unknown> {
  return (await loading).default(task);
}

export = handle;
