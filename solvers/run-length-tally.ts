/**
 * The per-trial bookkeeping shared by the local-search solvers that record run lengths (walk.ts, breakwalk.ts):
 * flips to solution and success per finished trial, the work and the fewest violated clauses seen. Called once a
 * trial, outside the flip loops, so it costs nothing there.
 */
import type { RunLengths } from "../harness/types.js";

/** Counts of finished trials; see {@link RunLengthTally.add}. */
export class RunLengthTally {
  private readonly flips: Float64Array;
  private readonly solved: Uint8Array;
  /** Finished trials. */
  done = 0;
  successes = 0;
  /** Flips over the finished trials. */
  work = 0;
  /** Fewest violated clauses seen in any finished trial (+Infinity before the first). */
  best = Infinity;

  /** @param trials - the most trials that will be added. */
  constructor(trials: number) {
    this.flips = new Float64Array(trials);
    this.solved = new Uint8Array(trials);
  }

  /** A finished trial: its flips, whether it ended with every clause satisfied, the fewest violated it saw. */
  add(flips: number, solved: boolean, fewest: number): void {
    this.flips[this.done] = flips;
    this.solved[this.done] = solved ? 1 : 0;
    this.done++;
    this.work += flips;
    if (solved) this.successes++;
    if (fewest < this.best) this.best = fewest;
  }

  /** The run-length distribution of the finished trials, censored at `cap`. */
  runLengths(cap: number): RunLengths {
    return { flips: this.flips.slice(0, this.done), solved: this.solved.slice(0, this.done), cap };
  }
}
