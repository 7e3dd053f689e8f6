/** `speedbound spectral FILE`: one spectral computation, printed. */
import { EXIT } from "../../errors.js";
import { numberOption, resolveBValues, resolveSpectralMemory } from "../resolve.js";
import { sizeOf } from "../../model/problem.js";
import { computeSpectral } from "../../predict/spectral-cell.js";
import { type Args, threadsOf } from "./shared.js";
import { readProblemFile } from "./solve.js";

/** `speedbound spectral FILE`: one spectral computation per b (`--spectral-b`, or each b of `--spectral-b-scan`), printed. */
export async function spectral(argv: Args): Promise<number> {
  const file = String(argv.file);
  const problem = readProblemFile(file);
  const eta = numberOption(argv, "spectral-eta") as number;
  const bValues = resolveBValues(argv); // --spectral-b-scan FROM:TO:STEP gives one result per b (JSON: one object a line)
  const memory = resolveSpectralMemory(argv);
  const threads = threadsOf(argv);
  for (const [i, b] of bValues.entries()) {
    const start = process.hrtime.bigint();
    // One instance on its own: every core works on its products (--threads).
    const row = computeSpectral(problem, null, b, eta, memory, threads);
    const result = { file, n: sizeOf(problem), ...row, wall_ns: Number(process.hrtime.bigint() - start) };
    if (argv.json) process.stdout.write(JSON.stringify(result) + "\n");
    else {
      if (i > 0) process.stdout.write("\n");
      for (const [k, v] of Object.entries(result)) process.stdout.write(`${k.padEnd(22)} ${String(v)}\n`);
    }
  }
  return EXIT.ok;
}
