/**
 * manifest.json: everything needed to say where a table came from — command line, resolved study, seeds,
 * package version, git commit, Node version, CPU model, cores, start and end times.
 */
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { cpus, totalmem } from "node:os";
import { fileURLToPath } from "node:url";
import type { StudySpec } from "./study.js";
import type { RunSummary } from "./run-summary.js";

/** Root of the installed package (three levels above the compiled harness/engine/). */
function packageRoot(): string {
  const here = fileURLToPath(import.meta.url);
  const levels = here.includes(`${"/"}dist${"/"}`) ? "../../../" : "../../";
  return fileURLToPath(new URL(levels, import.meta.url));
}

/** The package version from package.json. */
export function packageVersion(): string {
  try {
    return (JSON.parse(readFileSync(`${packageRoot()}package.json`, "utf8")) as { version: string }).version;
  } catch {
    return "unknown";
  }
}

/** The git commit of the tool's checkout (with "-dirty" when it has uncommitted changes), or null. */
export function gitCommit(): string | null {
  try {
    const cwd = packageRoot();
    const head = execFileSync("git", ["rev-parse", "HEAD"], { cwd, stdio: ["ignore", "pipe", "ignore"] }).toString().trim();
    const dirty = execFileSync("git", ["status", "--porcelain", "--untracked-files=no"], { cwd, stdio: ["ignore", "pipe", "ignore"] }).toString().trim();
    return dirty ? `${head}-dirty` : head;
  } catch {
    return null;
  }
}

/** Builds the manifest object. */
export function buildManifest(args: {
  argv: ReadonlyArray<string>;
  spec: StudySpec;
  workers: number;
  shard: { k: number; count: number } | null;
  started: Date;
  ended: Date;
  summary: RunSummary | null;
  extra?: Record<string, unknown>;
}): Record<string, unknown> {
  const cpu = cpus();
  return {
    tool: "speedbound",
    version: packageVersion(),
    git_commit: gitCommit(),
    command_line: ["speedbound", ...args.argv].join(" "),
    study: args.spec,
    master_seed: args.spec.seed,
    seed_derivation: "sha256 of JSON [master seed, family, sorted family parameters, n, instance, method, run length]; trial t: trialRng(trialKey(cell seed), t) in solvers/trial-seeds.ts (sha256 of [cell seed, 'trial'] once, then a SplitMix-style mix of t)",
    workers: args.workers,
    shard: args.shard,
    node_version: process.version,
    platform: `${process.platform} ${process.arch}`,
    cpu_model: cpu[0]?.model ?? "unknown",
    cores: cpu.length,
    memory_bytes: totalmem(),
    started_at: args.started.toISOString(),
    ended_at: args.ended.toISOString(),
    summary: args.summary,
    ...args.extra,
  };
}
