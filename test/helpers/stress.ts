/**
 * The quick-command stress loop of issue 14: runs short commands (solve, a tiny run, spectral) and bare pool
 * start/stop cycles over and over, counting abnormal exits (a signal such as SIGABRT, exit 134, or any exit code
 * other than the one the command promises). Used by test/stress-quick-commands.test.ts (a few dozen commands) and
 * test/stress/quick-commands.ts (the long count that .ci/run runs).
 */
import { spawn } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { REPO_ROOT as HELPER_ROOT } from "./paths.js";

// paths.ts resolves the root from its own place, which is dist/ when this runs compiled (test/stress/quick-commands).
const REPO_ROOT = existsSync(join(HELPER_ROOT, "package.json")) ? HELPER_ROOT : dirname(HELPER_ROOT);
const CLI = join(REPO_ROOT, "dist/harness/cli/cli.js");

/** One kind of quick command. */
export type StressKind = "solve" | "run" | "spectral" | "pool";

/** The outcome of a stress loop. */
export interface StressResult {
  readonly commands: number;
  readonly byKind: Readonly<Record<StressKind, number>>;
  /** Commands that ended with a signal or an unexpected exit code, with the first stderr line. */
  readonly abnormal: ReadonlyArray<{ kind: StressKind; code: number | null; signal: string | null; stderr: string }>;
}

/** A 3-SAT formula small enough that every command ends in well under a second (n = 10, 42 clauses). */
function tinyCnf(): string {
  const lines = ["p cnf 10 42"];
  let x = 12345;
  for (let c = 0; c < 42; c++) {
    const lits: number[] = [];
    while (lits.length < 3) {
      x = (x * 1103515245 + 12345) % 2147483648;
      const v = (x % 10) + 1;
      if (!lits.some((l) => Math.abs(l) === v)) lits.push(x % 2 === 0 ? v : -v);
    }
    lines.push(`${lits.join(" ")} 0`);
  }
  return lines.join("\n") + "\n";
}

/**
 * A process that starts the tool's worker pool (2 threads) and closes it after `delayMs`: the shutdown race of
 * issue 14 without the rest of a command, at delays spread over the workers' loading time.
 */
function poolCycleScript(delayMs: number): string {
  const pool = JSON.stringify(join(REPO_ROOT, "dist/harness/engine/pool.js"));
  return `import(${pool}).then(({ WorkerPool }) => { const p = new WorkerPool(2); setTimeout(() => p.close().then(() => process.exit(0)), ${delayMs}); });`;
}

function runOnce(args: string[], timeoutMs: number): Promise<{ code: number | null; signal: string | null; stderr: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, args, { cwd: REPO_ROOT, stdio: ["ignore", "ignore", "pipe"] });
    let stderr = "";
    child.stderr.on("data", (d: Buffer) => (stderr += d.toString()));
    const timer = setTimeout(() => child.kill("SIGKILL"), timeoutMs);
    child.on("close", (code, signal) => {
      clearTimeout(timer);
      resolve({ code, signal, stderr });
    });
  });
}

/**
 * Runs `count` quick commands (kinds in rotation), `parallel` at a time. Each must exit 0 within `timeoutMs`.
 * Deterministic apart from scheduling: the pool cycles' delays step through 0..199 ms.
 */
export async function stressQuickCommands(count: number, parallel = 2, timeoutMs = 60_000): Promise<StressResult> {
  const dir = mkdtempSync(join(tmpdir(), "speedbound-stress-"));
  const file = join(dir, "tiny.cnf");
  writeFileSync(file, tinyCnf());
  const kinds: StressKind[] = ["solve", "run", "spectral", "pool"];
  const byKind: Record<StressKind, number> = { solve: 0, run: 0, spectral: 0, pool: 0 };
  const abnormal: Array<{ kind: StressKind; code: number | null; signal: string | null; stderr: string }> = [];
  let next = 0;
  const worker = async (): Promise<void> => {
    while (next < count) {
      const i = next++;
      const kind = kinds[i % kinds.length];
      const out = join(dir, `run-${i}`);
      const args =
        kind === "solve" ? [CLI, "solve", file, "--json", "--workers", "2"]
        : kind === "spectral" ? [CLI, "spectral", file, "--json"]
        : kind === "run" ? [CLI, "run", "--n", "6", "--instances", "1", "--trials", "4", "--anneal-sweeps", "10", "--predict", "grover", "--seed", `s${i}`, "--workers", "2", "--out", out]
        : ["--input-type=module", "-e", poolCycleScript((i * 37) % 200)];
      const r = await runOnce(args, timeoutMs);
      byKind[kind]++;
      if (r.code !== 0 || r.signal !== null) abnormal.push({ kind, code: r.code, signal: r.signal, stderr: r.stderr.split("\n").slice(0, 2).join(" | ") });
      if (kind === "run") rmSync(out, { recursive: true, force: true });
    }
  };
  mkdirSync(dir, { recursive: true });
  await Promise.all(Array.from({ length: parallel }, worker));
  rmSync(dir, { recursive: true, force: true });
  return { commands: count, byKind, abnormal };
}
