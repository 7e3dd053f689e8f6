/** Runs the compiled CLI as a user would, and reads its tables back for comparisons. */
import { spawn, spawnSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { CLI, REPO_ROOT } from "./paths.js";

/** Result of one CLI invocation. */
export interface CliResult {
  readonly code: number | null;
  readonly signal: NodeJS.Signals | null;
  readonly stdout: string;
  readonly stderr: string;
}

/** Runs `speedbound ARGS` to completion. */
export function cli(args: ReadonlyArray<string>, env: Record<string, string> = {}): CliResult {
  const r = spawnSync(process.execPath, [CLI, ...args], { cwd: REPO_ROOT, encoding: "utf8", env: { ...process.env, ...env }, timeout: 300_000 });
  return { code: r.status, signal: r.signal, stdout: r.stdout, stderr: r.stderr };
}

/** Starts `speedbound ARGS` in the background. */
export function cliAsync(args: ReadonlyArray<string>, env: Record<string, string> = {}) {
  return spawn(process.execPath, [CLI, ...args], { cwd: REPO_ROOT, env: { ...process.env, ...env }, stdio: ["ignore", "pipe", "pipe"] });
}

/** Columns whose values come from the clock (they differ between two runs of the same study). */
export function isTimingColumn(name: string): boolean {
  return /(^|_)ns($|_)|wall|seconds|_s$/.test(name);
}

/** Parses a CSV written by speedbound (no embedded newlines in our cells) into header and rows. */
export function readCsv(path: string): { header: string[]; rows: string[][] } {
  const lines = readFileSync(path, "utf8").trimEnd().split("\n");
  const split = (line: string): string[] => {
    const out: string[] = [];
    let cur = "";
    let quoted = false;
    for (let i = 0; i < line.length; i++) {
      const ch = line[i];
      if (quoted) {
        if (ch === '"' && line[i + 1] === '"') {
          cur += '"';
          i++;
        } else if (ch === '"') quoted = false;
        else cur += ch;
      } else if (ch === '"') quoted = true;
      else if (ch === ",") {
        out.push(cur);
        cur = "";
      } else cur += ch;
    }
    out.push(cur);
    return out;
  };
  const [head, ...rest] = lines;
  return { header: split(head), rows: rest.map(split) };
}

/** A table with its timing columns removed, for equality across runs. */
export function withoutTiming(dir: string, file: string): string[][] {
  const { header, rows } = readCsv(join(dir, file));
  const keep = header.map((h, i) => (isTimingColumn(h) ? -1 : i)).filter((i) => i >= 0);
  return [keep.map((i) => header[i]), ...rows.map((r) => keep.map((i) => r[i]))];
}
