/** `speedbound demo`: a small SK spin-glass study into results/demo. */
import { run } from "./run.js";

/** `speedbound demo`: a small SK spin-glass study into results/demo. */
export async function demo(): Promise<number> {
  // SK spin glasses (issue 13): the exhaustive search's time clears its fixed-cost floor from n ≈ 16 on, the
  // annealer's TTS-optimal sweeps lie inside the grid, so the verdicts are meaningful under the rules; the earlier
  // 3-SAT demo at n ≤ 26 sat below the floor (a pruning search takes microseconds there).
  const argv = ["run", "--family", "sk", "--n", "14:26:2", "--instances", "8", "--seed", "demo-1", "--solvers", "exhaustive,anneal", "--trials", "200", "--anneal-sweeps", "1,3,10,30,100", "--predict", "grover,min-finding,amplified-anneal", "--out", "results/demo"];
  process.stderr.write(`speedbound demo: ${["speedbound", ...argv].join(" ")}\n`);
  const parsed: Record<string, unknown> = {};
  for (let i = 1; i < argv.length; i++) {
    const name = argv[i].slice(2);
    if (argv[i + 1] === undefined || argv[i + 1].startsWith("--")) parsed[name] = true;
    else parsed[name] = argv[++i];
  }
  return run(parsed, argv);
}
