/** Helpers shared by the commands. */
import { mkdirSync } from "node:fs";
import { availableParallelism } from "node:os";
import { resolve } from "node:path";
import { InputError } from "../../errors.js";
import { numberOption } from "../resolve.js";

export type Args = Readonly<Record<string, unknown>>;

export function workersOf(argv: Args): number {
  return numberOption(argv, "workers") ?? Math.max(1, availableParallelism());
}

/** Creates a folder (and its parents), or fails with one line naming it. */
export function mkdirOrFail(dir: string): void {
  try {
    mkdirSync(dir, { recursive: true });
  } catch (e) {
    throw new InputError(`${dir}: cannot create (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
  }
}
