/**
 * The commands of the tool, one file each (cli.ts dispatches to them). Each command's module is loaded only
 * when that command runs: the report modules (vega, vega-lite, tables, summaries) cost a few hundred ms of
 * start-up, more than `solve` needs to count a 100-variable formula, and only run, demo, report, merge and
 * compare use them. Measured (issue 16): `solve` of a counted 100-variable formula took 0.50–0.71 s of user
 * CPU before, 0.27–0.38 s after this and the in-thread ground truth (engine/ground-truth.ts).
 */
import type { Args } from "./shared.js";

type Command<A extends unknown[]> = (...args: A) => Promise<number>;

/** A command whose module is imported on its first call. */
function lazy<A extends unknown[]>(load: () => Promise<Command<A>>): Command<A> {
  return async (...args: A) => (await load())(...args);
}

export const run = lazy<[Args, ReadonlyArray<string>]>(async () => (await import("./run.js")).run);
export const demo = lazy<[]>(async () => (await import("./demo.js")).demo);
export const solve = lazy<[Args]>(async () => (await import("./solve.js")).solve);
export const instance = lazy<[Args]>(async () => (await import("./instance.js")).instance);
export const report = lazy<[Args, ReadonlyArray<string>?]>(async () => (await import("./report.js")).report);
export const spectral = lazy<[Args]>(async () => (await import("./spectral.js")).spectral);
export const adiabatic = lazy<[Args]>(async () => (await import("./adiabatic.js")).adiabatic);
export const cost = lazy<[Args]>(async () => (await import("./cost.js")).cost);
export const merge = lazy<[Args, ReadonlyArray<string>]>(async () => (await import("./merge.js")).merge);
export const compare = lazy<[Args]>(async () => (await import("./compare.js")).compare);
export const slurm = lazy<[Args, ReadonlyArray<string>]>(async () => (await import("./slurm.js")).slurm);
