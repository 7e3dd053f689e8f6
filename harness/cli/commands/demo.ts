/** `speedbound demo`: a small 3-SAT study into results/demo. */
import { run } from "./run.js";

/** `speedbound demo`: a small 3-SAT study into results/demo. */
export async function demo(): Promise<number> {
  // Satisfiable draws only, so that every solver (Schöning's walk included) is measured on the same instances.
  const argv = ["run", "--family", "ksat", "--k", "3", "--n", "12:26:2", "--instances", "8", "--satisfiable", "--seed", "demo-1", "--trials", "1000", "--anneal-sweeps", "10,30,100,300", "--out", "results/demo"];
  process.stderr.write(`speedbound demo: ${["speedbound", ...argv].join(" ")}\n`);
  const parsed: Record<string, unknown> = {};
  for (let i = 1; i < argv.length; i++) {
    const name = argv[i].slice(2);
    if (argv[i + 1] === undefined || argv[i + 1].startsWith("--")) parsed[name] = true;
    else parsed[name] = argv[++i];
  }
  return run(parsed, argv);
}
