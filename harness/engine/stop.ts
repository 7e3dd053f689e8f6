/**
 * Stop control of a run: the whole-study budget, the grace period after SIGINT/SIGTERM, and the per-cell limit.
 * Each running cell holds a stop flag (an Int32Array on a SharedArrayBuffer: element 0 non-zero = stop now;
 * element 1 set by the worker when it starts computing) that any of the three may raise; cells poll it
 * (solvers/types.ts, StopFlag) and return what they have, marked censored.
 */

/** How often the cell limit is checked (ms); a cell may overrun its limit by about this much. */
export const LIMIT_POLL_MS = 25;

/** Limits of a run. */
export interface StopLimits {
  /** Whole-study wall-clock budget, ms (null = none). */
  readonly budgetMs: number | null;
  /** Per-cell wall-clock limit, ms (null = none); counts computing time, not time queued. */
  readonly cellLimitMs: number | null;
  /** Time running cells get to finish after SIGINT/SIGTERM before they are stopped (ms). */
  readonly graceMs: number;
  /** Where to say that a signal arrived. */
  readonly note: (line: string) => void;
}

/** Budget, signals and cell limits of one run; {@link StopControl.dispose} removes its timers and handlers. */
export class StopControl {
  /** Set once the budget ran out or a signal arrived: no new cells start. */
  stopping = false;
  /** The signal that stopped the run, if any. */
  signal: NodeJS.Signals | null = null;
  /** Wall-clock time (Date.now()) at which the budget runs out; Infinity without a budget. */
  readonly deadline: number;
  private readonly running = new Set<Int32Array>();
  private readonly started = new Map<Int32Array, number>();
  private readonly budgetTimer: NodeJS.Timeout | null;
  private readonly limitTimer: NodeJS.Timeout | null;
  private graceTimer: NodeJS.Timeout | null = null;
  private readonly onSignal: (signal: NodeJS.Signals) => void;

  constructor(private readonly limits: StopLimits) {
    this.deadline = limits.budgetMs === null ? Infinity : Date.now() + limits.budgetMs;
    this.budgetTimer =
      limits.budgetMs === null
        ? null
        : setTimeout(() => {
            this.stopping = true;
            this.stopAll();
          }, limits.budgetMs);
    this.onSignal = (signal) => {
      if (this.signal) return;
      this.signal = signal;
      this.stopping = true;
      limits.note(`${signal}: no new cells; running ones get ${limits.graceMs / 1000} s to finish`);
      this.graceTimer = setTimeout(() => this.stopAll(), limits.graceMs);
    };
    process.on("SIGINT", this.onSignal);
    process.on("SIGTERM", this.onSignal);
    // The cell limit counts from the moment the worker marks the flag (element 1), checked every LIMIT_POLL_MS.
    this.limitTimer =
      limits.cellLimitMs === null
        ? null
        : setInterval(() => {
            const now = Date.now();
            for (const flag of this.running) {
              if (Atomics.load(flag, 1) === 0) continue;
              const t0 = this.started.get(flag);
              if (t0 === undefined) this.started.set(flag, now);
              else if (now - t0 >= (limits.cellLimitMs as number)) Atomics.store(flag, 0, 1);
            }
          }, LIMIT_POLL_MS);
  }

  /** Runs one cell with a fresh stop flag, raised by the cell limit, the budget or a signal's grace period. */
  async withStopFlag<T>(body: (flag: Int32Array) => Promise<T>): Promise<T> {
    const flag = new Int32Array(new SharedArrayBuffer(8));
    this.running.add(flag);
    try {
      return await body(flag);
    } finally {
      this.running.delete(flag);
      this.started.delete(flag);
    }
  }

  /**
   * A check for work done in this thread before a cell reaches the pool (redrawing formulas for --satisfiable /
   * --unique): true once the run is stopping, the budget has passed, or the cell limit has passed since now.
   * The thread is busy meanwhile, so the timers cannot fire; the check reads the clock itself.
   */
  generationCheck(): () => boolean {
    const limitAt = this.limits.cellLimitMs === null ? Infinity : Date.now() + this.limits.cellLimitMs;
    const until = Math.min(this.deadline, limitAt);
    return () => this.stopping || Date.now() >= until;
  }

  /** Stops the run now (a storage failure): no new cells, running ones stopped. */
  stopNow(): void {
    this.stopping = true;
    this.stopAll();
  }

  /** Removes the timers and signal handlers. */
  dispose(): void {
    if (this.budgetTimer) clearTimeout(this.budgetTimer);
    if (this.limitTimer) clearInterval(this.limitTimer);
    if (this.graceTimer) clearTimeout(this.graceTimer);
    process.off("SIGINT", this.onSignal);
    process.off("SIGTERM", this.onSignal);
  }

  private stopAll(): void {
    for (const flag of this.running) Atomics.store(flag, 0, 1);
  }
}
