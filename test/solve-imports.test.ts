/**
 * What a plain `solve FILE` loads before it counts (issue 16: its whole-process time against clasp is mostly
 * start-up). The compiled entry (dist/harness/cli/cli.js, built by `npm test`'s pretest step) and the solve command
 * are followed through their static imports — what Node loads before any code runs; `import()` is followed only
 * when it runs — and none of the heavy modules may be among them: yargs and the command tree, the registries of
 * randomised solvers, families and predictors, the option table with their names, study validation, the worker
 * pool (piscina). A regression guard on structure, not on time (the times are the count bench's).
 */
import { readFileSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { REPO_ROOT } from "./helpers/paths.js";

const DIST = join(REPO_ROOT, "dist");

/** Static imports of one compiled module: relative ones as absolute paths, packages by name. */
function staticImports(file: string): { files: string[]; packages: string[] } {
  const text = readFileSync(file, "utf8");
  const files: string[] = [];
  const packages: string[] = [];
  // `import … from "x"`, `export … from "x"`, `import "x"` at the start of a line (tsc's output form).
  const pattern = /^(?:import|export)\s(?:[^;]*?\sfrom\s)?\s*["']([^"']+)["']/gm;
  for (let m = pattern.exec(text); m !== null; m = pattern.exec(text)) {
    if (m[1].startsWith(".")) files.push(resolve(dirname(file), m[1]));
    else packages.push(m[1]);
  }
  return { files, packages };
}

/** Every module loaded statically from the entries, and the packages they name. */
function loadedFrom(entries: ReadonlyArray<string>): { files: Set<string>; packages: Set<string> } {
  const files = new Set<string>();
  const packages = new Set<string>();
  const queue = entries.map((e) => join(DIST, e));
  while (queue.length > 0) {
    const f = queue.pop()!;
    if (files.has(f)) continue;
    files.add(f);
    const found = staticImports(f);
    for (const p of found.packages) packages.add(p);
    queue.push(...found.files);
  }
  return { files, packages };
}

describe("solve's start-up", () => {
  const { files, packages } = loadedFrom(["harness/cli/cli.js", "harness/cli/commands/solve.js"]);
  const loaded = [...files].map((f) => relative(DIST, f));

  it("loads the exact solvers and the file readers (the guard follows real imports)", () => {
    for (const needed of ["harness/cli/plain-solve.js", "harness/cli/option-table.js", "solvers/exact-registry.js", "solvers/count-cnf.js", "harness/formats/dimacs.js"]) {
      expect(loaded, needed).toContain(needed);
    }
  });

  it("loads no package but Node's own modules", () => {
    expect([...packages].filter((p) => !p.startsWith("node:"))).toEqual([]);
  });

  it("loads none of the heavy modules", () => {
    const heavy = [
      "harness/cli/command-tree.js", "harness/cli/options.js", "harness/cli/resolve.js", "harness/engine/pool.js",
      "solvers/registry.js", "harness/families/registry.js", "harness/predict/registry.js", "harness/engine/study.js",
    ];
    expect(loaded.filter((f) => heavy.includes(f))).toEqual([]);
  });
});
