/**
 * Errors the user can act on. An InputError is printed as its one-line message and exits with code 2
 * (DESIGN.md §6); anything else is a bug or a crash and keeps its stack.
 */

/** Bad input: the message names the file and line, or the option and value, and what is wrong. */
export class InputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "InputError";
  }
}

/** Exit codes used by the CLI. */
export const EXIT = {
  ok: 0,
  /** A regression found by `compare`, or cells that ended in errors. */
  failures: 1,
  /** Bad input (option, file, folder). */
  badInput: 2,
  /** Stopped by SIGINT / SIGTERM (128 + signal number). */
  interrupted: 130,
  terminated: 143,
} as const;
