/**
 * breakwalk and tempering inside a study: their cells, runs.csv columns, family defaults and bad input.
 * Outside reference: the exact ground truth of each instance (satisfiable or not) decides which breakwalk cells
 * run; exchange acceptance rates are probabilities (in [0, 1]) of R − 1 neighbour pairs.
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cli, readCsv } from "./helpers/cli.js";

const dir = mkdtempSync(join(tmpdir(), "sb-baselines-"));

describe("baselines in a study", () => {
  it("k-SAT defaults include breakwalk; its rows carry the run-length summary; unsatisfiable draws are skipped", () => {
    const out = join(dir, "ksat");
    const r = cli(["run", "--family", "ksat", "--n", "10:12:2", "--instances", "3", "--trials", "20", "--predict", "grover", "--out", out]);
    expect(r.code, r.stderr).toBe(0);
    const runs = readCsv(join(out, "runs.csv"));
    const inst = readCsv(join(out, "instances.csv"));
    const col = (name: string): number => runs.header.indexOf(name);
    const satisfiable = new Map(inst.rows.map((row) => [`${row[inst.header.indexOf("n")]}|${row[inst.header.indexOf("instance")]}`, row[inst.header.indexOf("satisfiable")]]));
    const rows = runs.rows.filter((row) => row[col("solver")] === "breakwalk");
    expect(rows.length).toBe(6);
    expect(new Set(runs.rows.map((row) => row[col("solver")]))).toEqual(new Set(["exhaustive", "walk", "breakwalk", "anneal"]));
    for (const row of rows) {
      const sat = satisfiable.get(`${row[col("n")]}|${row[col("instance")]}`);
      expect(row[col("run_length")]).toBe(String(1000 * Number(row[col("n")])));
      if (sat === "true") {
        expect(row[col("status")]).toBe("ok");
        expect(row[col("successes")]).toBe("20"); // n ≤ 12 with a cap of 1000n flips
        expect(row[col("breakwalk_rule")]).toBe("poly cb=2.38 eps=1");
        expect(Number(row[col("rld_median_flips")])).toBeGreaterThanOrEqual(0);
        expect(Number(row[col("rld_best_trial_success_p")])).toBeGreaterThan(0);
      } else {
        expect(row[col("status")]).toBe("skipped");
      }
    }
  });

  it("spin families default to exhaustive, anneal and tempering; tempering rows carry exchange acceptance", () => {
    const out = join(dir, "sk");
    const r = cli(["run", "--family", "sk", "--n", "8:10:2", "--instances", "2", "--trials", "10", "--tempering-replicas", "5", "--tempering-sweeps", "5,20", "--predict", "grover", "--out", out]);
    expect(r.code, r.stderr).toBe(0);
    const runs = readCsv(join(out, "runs.csv"));
    const col = (name: string): number => runs.header.indexOf(name);
    expect(new Set(runs.rows.map((row) => row[col("solver")]))).toEqual(new Set(["exhaustive", "anneal", "tempering"]));
    const rows = runs.rows.filter((row) => row[col("solver")] === "tempering");
    expect(rows.length).toBe(8);
    for (const row of rows) {
      expect(row[col("status")]).toBe("ok");
      expect(row[col("work")]).toBe(String(10 * Number(row[col("run_length")]) * 5 * Number(row[col("n")])));
      const rates = row[col("exchange_acceptance")].split(";").map(Number);
      expect(rates.length).toBe(4);
      for (const x of rates) expect(x >= 0 && x <= 1).toBe(true);
    }
  });

  it("bad baseline options exit with code 2 and one line naming the option", () => {
    for (const [args, pattern] of [
      [["--family", "ksat", "--breakwalk-rule", "cubic"], /--breakwalk-rule/],
      [["--family", "ksat", "--breakwalk-flips", "ten"], /--breakwalk-flips/],
      [["--family", "sk", "--solvers", "breakwalk"], /breakwalk applies to k-SAT/],
      [["--family", "sk", "--tempering-beta", "3:1"], /--tempering-beta/],
      [["--family", "sk", "--tempering-temperature", "1:3"], /--tempering-temperature/],
      [["--family", "sk", "--tempering-temperature", "3:1", "--tempering-beta", "0.3:1"], /--tempering-temperature/],
      [["--family", "ksat", "--external", "walk=foo {file}"], /--external/],
      [["--family", "ksat", "--tempering-temperature", "1:3"], /--tempering-temperature/], // checked without tempering too
    ] as const) {
      const r = cli(["run", "--n", "8:8", "--instances", "1", ...args, "--out", join(dir, "bad")]);
      expect(r.code).toBe(2);
      expect(r.stderr.trim().split("\n").length).toBe(1);
      expect(r.stderr).toMatch(pattern);
    }
  });
});
