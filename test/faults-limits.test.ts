// A failing cell becomes an error row and the study goes on; limits censor cells instead of dropping them;
// results do not depend on the worker count.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { cli, readCsv, withoutTiming } from "./helpers/cli.js";

let root = "";
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "speedbound-faults-"));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

const SMALL = ["--family", "ksat", "--n", "8:12:2", "--instances", "3", "--seed", "faults", "--solvers", "exhaustive,walk", "--trials", "30", "--workers", "2"];

function runsOf(dir: string): Record<string, string>[] {
  const { header, rows } = readCsv(join(dir, "runs.csv"));
  return rows.map((r) => Object.fromEntries(header.map((h, i) => [h, r[i]])));
}

describe("error isolation", () => {
  for (const mode of ["throw", "exit"]) {
    it(`a cell whose worker ${mode === "exit" ? "dies" : "throws"} becomes an error row; the others finish`, () => {
      const dir = join(root, `fault-${mode}`);
      const r = cli(["run", ...SMALL, "--out", dir], { SPEEDBOUND_TEST_FAULT: `${mode}:10:1` });
      expect(r.code).toBe(1); // errors make the exit code non-zero
      expect(r.stdout).toMatch(/1 ERRORS/);
      const runs = runsOf(dir);
      const errors = runs.filter((x) => x.status === "error");
      expect(errors).toHaveLength(1);
      expect(errors[0]).toMatchObject({ n: "10", instance: "1", solver: "walk" });
      expect(errors[0].message.length).toBeGreaterThan(0);
      expect(runs.filter((x) => x.status === "ok" || x.status === "skipped")).toHaveLength(3 * 3 * 2 - 1);
    });
  }
});

describe("limits", () => {
  it("--cell-limit censors long cells and records how far they got", () => {
    const dir = join(root, "cell-limit");
    const r = cli(["run", "--family", "ksat", "--n", "14", "--instances", "2", "--seed", "lim", "--solvers", "exhaustive,anneal", "--sweeps", "20000", "--trials", "100000", "--cell-limit", "300ms", "--workers", "2", "--predict", "grover", "--out", dir]);
    expect(r.code, r.stderr).toBe(0);
    const anneal = runsOf(dir).filter((x) => x.solver === "anneal");
    expect(anneal).toHaveLength(2);
    for (const row of anneal) {
      expect(row.status).toBe("censored");
      expect(Number(row.trials)).toBeLessThan(100000);
    }
  });

  it("--budget stops the study, keeps finished sizes whole and says which are complete", () => {
    const dir = join(root, "budget");
    const r = cli(["run", "--family", "ksat", "--n", "10:30:10", "--instances", "2", "--seed", "bud", "--solvers", "exhaustive,anneal", "--sweeps", "5000", "--trials", "100000", "--budget", "2s", "--workers", "2", "--predict", "grover", "--out", dir]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/complete sizes: /);
    expect(r.stdout).toMatch(/incomplete: /);
    const manifest = JSON.parse(readFileSync(join(dir, "manifest.json"), "utf8"));
    expect(manifest.summary.incompleteSizes.length).toBeGreaterThan(0);
  });
});

describe("determinism", () => {
  it("the same seed gives identical tables with 1 and 2 workers", () => {
    const a = join(root, "w1");
    const b = join(root, "w2");
    const study = ["--family", "ksat", "--n", "10:14:2", "--instances", "3", "--seed", "det", "--solvers", "exhaustive,walk,anneal", "--trials", "40", "--sweeps", "20"];
    expect(cli(["run", ...study, "--workers", "1", "--out", a]).code).toBe(0);
    expect(cli(["run", ...study, "--workers", "2", "--out", b]).code).toBe(0);
    for (const t of ["instances.csv", "runs.csv", "predictions.csv"]) expect(withoutTiming(a, t), t).toEqual(withoutTiming(b, t));
  });
});
