/**
 * breakwalk, the walk's run-length distributions and tempering inside a study: their cells, runs.csv columns,
 * family defaults and bad input. Outside references: the exact ground truth of each instance (satisfiable or not)
 * decides which breakwalk cells run; exchange acceptance rates are probabilities (in [0, 1]) of R − 1 neighbour
 * pairs; the fine-grid cut-off of the walk is recomputed here from the journal with the TTS definition of Rønnow
 * et al., "Defining and detecting quantum speedup", Science 345, 420 (2014): TTS₀.₉₉(c) = c·ln 0.01/ln(1 − p(c)).
 */
import { mkdtempSync, readFileSync } from "node:fs";
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

  it("walk rows carry their run-length distributions, and fits.csv fits the walk's TTS on the fine cut-off grid", () => {
    const out = join(dir, "walk");
    const r = cli(["run", "--family", "ksat", "--n", "8:14:2", "--instances", "4", "--satisfiable", "--trials", "40", "--solvers", "exhaustive,walk", "--predict", "grover", "--out", out]);
    expect(r.code, r.stderr).toBe(0);
    const journal = readFileSync(join(out, "journal.jsonl"), "utf8").trim().split("\n").map((l) => JSON.parse(l) as Record<string, unknown>);
    const walkRows = journal.filter((row) => row.kind === "run" && row.solver === "walk");
    expect(walkRows.length).toBe(16);
    // Per size, per instance: the recorded flips to solution (−1 = censored at the cap = 3n flips).
    const steps = new Map<number, number[][]>();
    for (const row of walkRows) {
      const n = row.n as number;
      expect(row.status).toBe("ok");
      expect(row.run_length).toBe(3 * n);
      const s = row.steps_to_solution as number[];
      expect(s.length).toBe(40);
      for (const x of s) expect(x === -1 || (Number.isInteger(x) && x >= 0 && x <= 3 * n)).toBe(true);
      // The distribution agrees with the cell's own counts: solved trials = successes, Σ flips = work.
      expect(s.filter((x) => x >= 0).length).toBe(row.successes);
      expect(s.reduce((a, x) => a + (x >= 0 ? x : 3 * n), 0)).toBe(row.work);
      steps.set(n, [...(steps.get(n) ?? []), s]);
    }
    const runs = readCsv(join(out, "runs.csv"));
    const col = (name: string): number => runs.header.indexOf(name);
    for (const row of runs.rows.filter((x) => x[col("solver")] === "walk" && Number(x[col("successes")]) > 0)) {
      expect(Number(row[col("rld_best_cutoff")])).toBeGreaterThanOrEqual(0);
      expect(Number(row[col("rld_best_cutoff")])).toBeLessThanOrEqual(Number(row[col("run_length")]));
      expect(Number(row[col("rld_best_trial_success_p")])).toBeGreaterThan(0);
    }
    // The per-size cut-off, recomputed from the journal: a grid of round(10^(j/24)) below the cap, then the cap;
    // the smallest median over instances of TTS₀.₉₉(c) in flips (ties: the shorter cut-off).
    const sizes = readCsv(join(out, "sizes.csv"));
    const sc = (name: string): number => sizes.header.indexOf(name);
    let compared = 0;
    for (const [n, perInstance] of steps) {
      const cap = 3 * n;
      const grid: number[] = [];
      for (let j = 0; Math.round(10 ** (j / 24)) < cap; j++) if (!grid.includes(Math.round(10 ** (j / 24)))) grid.push(Math.round(10 ** (j / 24)));
      grid.push(cap);
      const tts = (s: number[], c: number): number => {
        const p = s.filter((x) => x >= 0 && x <= c).length / s.length;
        return p >= 0.99 ? Math.max(c, 1) : p === 0 ? Infinity : (Math.max(c, 1) * Math.log(0.01)) / Math.log(1 - p);
      };
      const median = (v: number[]): number => {
        const w = [...v].sort((a, b) => a - b);
        return w.length % 2 === 1 ? w[(w.length - 1) / 2] : (w[w.length / 2 - 1] + w[w.length / 2]) / 2;
      };
      let best = { c: -1, t: Infinity };
      for (const c of grid) {
        const t = median(perInstance.map((s) => tts(s, c)));
        if (t < best.t) best = { c, t };
      }
      const chosen = sizes.rows.filter((x) => x[sc("method")] === "walk" && x[sc("measure")] === "tts_work" && Number(x[sc("n")]) === n && x[sc("optimal_run_length")] === "true");
      expect(chosen.length, `n=${n}`).toBe(1);
      expect(Number(chosen[0][sc("run_length")]), `n=${n}`).toBe(best.c);
      // The median itself where the censoring rule of stats/censoring.ts lets the report state it (an instance
      // with p(c) = 0 is a censored value there).
      if (chosen[0][sc("median")] !== "") {
        expect(Number(chosen[0][sc("median")]), `n=${n}`).toBeCloseTo(best.t, 6);
        compared++;
      }
    }
    expect(compared).toBeGreaterThanOrEqual(2);
    // fits.csv: the walk's TTS measures are fitted on the fine grid, its cost of runs (cpu_ns, work) at the cap.
    const fits = readCsv(join(out, "fits.csv"));
    const fc = (name: string): number => fits.header.indexOf(name);
    const walkFits = fits.rows.filter((x) => x[fc("method")] === "walk");
    expect(new Set(walkFits.map((x) => x[fc("measure")]))).toEqual(new Set(["cpu_ns", "work", "tts_ns", "tts_work"]));
    for (const row of walkFits) {
      const fine = row[fc("run_length_rule")].startsWith("per-size optimal cut-off from the run-length distributions");
      expect(fine, `${row[fc("measure")]} ${row[fc("run_length_rule")]}`).toBe(row[fc("measure")].startsWith("tts_"));
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
