/** Helpers shared by the commands. */
import { availableParallelism } from "node:os";
import { resolve } from "node:path";
import { ensureWritableFolder } from "../../engine/fs-guard.js";
import { numberOption } from "../option-values.js";

export type Args = Readonly<Record<string, unknown>>;

export function workersOf(argv: Args): number {
  return numberOption(argv, "workers") ?? Math.max(1, availableParallelism());
}

/** --threads of the one-instance numerics commands (spectral, adiabatic): default the available cores. */
export function threadsOf(argv: Args): number {
  return numberOption(argv, "threads") ?? Math.max(1, availableParallelism());
}

/** Creates a folder (and its parents) or ends the command with one line, exit 2; never spins (see engine/fs-guard.ts). */
export function mkdirOrFail(dir: string, label: string): void {
  ensureWritableFolder(dir, label);
}
