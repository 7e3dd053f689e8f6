/**
 * Imports go one way (DESIGN.md §2): cli → engine → pool/worker → families, solvers, predict → model; report
 * reads the journal (engine) and stats; nothing below the edge imports cli/. This test reads every relative
 * import of harness/ and solvers/ (type-only imports included: they couple the modules just the same) and
 * fails on any import that runs back up, naming the file and the import.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, normalize, relative } from "node:path";
import { describe, expect, it } from "vitest";
import { REPO_ROOT } from "./helpers/paths.js";

/** The layer of a source file, from its folder. */
function layerOf(file: string): string {
  const parts = file.split("/");
  if (parts[0] === "solvers") return "solvers";
  if (parts.length === 2) return "base"; // harness/errors.ts, random.ts, types.ts
  return parts[1];
}

/**
 * What each layer may import (besides itself). Read as "depends on"; anything not listed is a back-edge.
 * base = harness/errors.ts, random.ts, types.ts (the shared leaves).
 */
const ALLOWED: Readonly<Record<string, ReadonlyArray<string>>> = {
  cli: ["engine", "cluster", "report", "families", "solvers", "predict", "formats", "model", "stats", "base"],
  cluster: ["engine", "report", "families", "solvers", "predict", "formats", "model", "stats", "base"],
  engine: ["families", "solvers", "predict", "formats", "model", "stats", "base"],
  report: ["engine", "families", "predict", "stats", "model", "base"],
  families: ["solvers", "formats", "model", "base"],
  predict: ["families", "solvers", "model", "stats", "base"],
  solvers: ["model", "base"],
  formats: ["model", "base"],
  stats: ["base"],
  model: ["base"],
  base: [],
};

function sources(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(join(REPO_ROOT, dir))) {
    const rel = `${dir}/${name}`;
    if (statSync(join(REPO_ROOT, rel)).isDirectory()) out.push(...sources(rel));
    else if (name.endsWith(".ts") || name.endsWith(".cts")) out.push(rel); // .cts: the CommonJS worker shim
  }
  return out;
}

/** Relative imports of a file as repository paths (ending in .ts). */
function importsOf(file: string): string[] {
  const text = readFileSync(join(REPO_ROOT, file), "utf8");
  const found: string[] = [];
  const pattern = /(?:from\s*|import\s*\(\s*|import\s+)["'](\.{1,2}\/[^"']+)\.js["']/g;
  for (let m = pattern.exec(text); m !== null; m = pattern.exec(text)) found.push(normalize(join(dirname(file), `${m[1]}.ts`)));
  return found;
}

/** True when `file` importing `target` (repository paths) runs against {@link ALLOWED}. */
function isBackEdge(file: string, target: string): boolean {
  const from = layerOf(file);
  const to = layerOf(relative(REPO_ROOT, join(REPO_ROOT, target)));
  return to !== from && !(ALLOWED[from] ?? []).includes(to);
}

/** Every import that runs against {@link ALLOWED}. */
function backEdges(): string[] {
  const bad: string[] = [];
  for (const file of [...sources("harness"), ...sources("solvers")]) {
    for (const target of importsOf(file)) if (isBackEdge(file, target)) bad.push(`${file} imports ${target}`);
  }
  return bad;
}

describe("import direction", () => {
  it("knows every folder of harness/", () => {
    const layers = new Set([...sources("harness"), ...sources("solvers")].map(layerOf));
    for (const layer of layers) expect(Object.keys(ALLOWED), `layer '${layer}' has no rule`).toContain(layer);
  });

  it("finds a back-edge when there is one (the check can fail)", () => {
    // The back-edges issue 11 found, and their allowed reverse directions.
    expect(isBackEdge("harness/predict/cost-table.ts", "harness/cli/resolve.ts")).toBe(true);
    expect(isBackEdge("harness/cluster/merge.ts", "harness/cli/resolve.ts")).toBe(true);
    expect(isBackEdge("solvers/walk.ts", "harness/engine/study.ts")).toBe(true);
    expect(isBackEdge("harness/engine/run.ts", "harness/report/tables.ts")).toBe(true);
    expect(isBackEdge("harness/cli/resolve.ts", "harness/predict/cost-table.ts")).toBe(false);
    expect(isBackEdge("harness/engine/worker.ts", "solvers/registry.ts")).toBe(false);
    // The reader sees real imports, type-only ones included.
    expect(importsOf("harness/engine/run.ts")).toContain("harness/engine/journal.ts");
    expect(importsOf("harness/predict/types.ts")).toContain("harness/model/problem.ts");
    // The CommonJS worker shim is read too: its dynamic import() of the ESM worker counts.
    expect(sources("harness")).toContain("harness/engine/worker-entry.cts");
    expect(importsOf("harness/engine/worker-entry.cts")).toContain("harness/engine/worker.ts");
  });

  it("has no import that runs back up", () => {
    expect(backEdges()).toEqual([]);
  });
});
