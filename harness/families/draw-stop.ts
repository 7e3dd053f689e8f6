/**
 * Lets the study's limits (--budget, --cell-limit, a signal) stop a generator that redraws whole formulas
 * (ksat --satisfiable / --unique), which can run long before any solver starts. The run loop (main thread) and the
 * worker install a check around generation; the generator asks between draws, and hands it to the model counter,
 * which polls it while deciding one draw (issue 16: above n = 30 a single count can run long). Without an installed
 * check (tests, `instance`) nothing stops it. The check never changes which formula is drawn or accepted: it can
 * only end the loop early.
 */

/** Start of the message of a generation stopped by a limit (it crosses the worker boundary as text). */
export const GENERATION_STOPPED = "generation stopped by a time limit";

let current: (() => boolean) | null = null;

/** Runs `generate` with `stopped` consulted between draws. */
export function withDrawStop<T>(stopped: () => boolean, generate: () => T): T {
  const outer = current;
  current = stopped;
  try {
    return generate();
  } finally {
    current = outer;
  }
}

/** The installed check (null when none), for work inside one draw that can poll it (the model counter). */
export function drawStopCheck(): (() => boolean) | null {
  return current;
}

/** The error that ends a generation stopped by a limit after `draws` rejected draws. */
export function drawStopped(draws: number): Error {
  return new Error(`${GENERATION_STOPPED} after ${draws} rejected draws`);
}

/** Throws (with {@link GENERATION_STOPPED}) when the installed check says a limit has passed. */
export function checkDrawStop(draws: number): void {
  if (current !== null && current()) throw drawStopped(draws);
}
