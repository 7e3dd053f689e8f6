/** Helpers shared by the commands. */
import { availableParallelism } from "node:os";
import { resolve } from "node:path";
import { numberOption } from "../resolve.js";

export type Args = Readonly<Record<string, unknown>>;

export function workersOf(argv: Args): number {
  return numberOption(argv, "workers") ?? Math.max(1, availableParallelism());
}
