/** `speedbound adiabatic FILE`: the minimum gap along the adiabatic path for one instance, printed. */
import { EXIT } from "../../errors.js";
import { numberOption, resolveSpectralMemory } from "../resolve.js";
import { computeAdiabatic } from "../../predict/adiabatic-cell.js";
import { type Args, threadsOf } from "./shared.js";
import { readProblemFile } from "./solve.js";

/** `speedbound adiabatic FILE`: the minimum gap along the adiabatic path for one instance, printed. */
export async function adiabatic(argv: Args): Promise<number> {
  const file = String(argv.file);
  const problem = readProblemFile(file);
  const grid = numberOption(argv, "adiabatic-grid") as number;
  const start = process.hrtime.bigint();
  // One instance on its own: every core works on its products (--threads).
  const row = computeAdiabatic(problem, null, grid, resolveSpectralMemory(argv), threadsOf(argv));
  const result = { file, ...row, wall_ns: Number(process.hrtime.bigint() - start) };
  if (argv.json) process.stdout.write(JSON.stringify(result) + "\n");
  else for (const [k, v] of Object.entries(result)) process.stdout.write(`${k.padEnd(22)} ${String(v)}\n`);
  return EXIT.ok;
}
