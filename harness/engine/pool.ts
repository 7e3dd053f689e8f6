/**
 * The worker pool (piscina). Workers run compiled JavaScript from dist/ (see DEVELOPERS.md: on-the-fly
 * TypeScript loaders were measured 1.15–1.35× slower in the hot loops), so when this module itself runs
 * from source (tests under vitest) it still points the pool at the compiled worker.
 */
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { Piscina } from "piscina";
import type { Task } from "./tasks.js";
import { compiledFile } from "../compiled-file.js";

/**
 * Path of the compiled worker entry: the CommonJS shim worker-entry.cjs, never the ESM worker.js itself
 * (piscina loads its entry with require(), and require(esm) aborts the process when a worker is terminated
 * while loading; see worker-entry.cts).
 */
export function workerPath(): string {
  const compiled = fileURLToPath(compiledFile(import.meta.url, "./worker-entry.cjs"));
  if (!existsSync(compiled)) throw new Error(`compiled worker missing at ${compiled}: run 'npm run build' first`);
  return compiled;
}

/** A fixed-size pool of worker threads. */
export class WorkerPool {
  private readonly piscina: Piscina;

  constructor(readonly size: number) {
    this.piscina = new Piscina({
      filename: workerPath(),
      minThreads: size,
      maxThreads: size,
      // Each task is CPU-bound: one at a time per thread keeps timings honest.
      concurrentTasksPerWorker: 1,
      idleTimeout: 60_000,
    });
  }

  /** Runs a task on some worker. A throwing task or a dying worker rejects this promise only. */
  run<T>(task: Task): Promise<T> {
    return this.piscina.run(task) as Promise<T>;
  }

  async close(): Promise<void> {
    await this.piscina.destroy();
  }
}
