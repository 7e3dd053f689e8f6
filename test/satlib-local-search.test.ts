/**
 * Outside check data: SATLIB uniform random 3-SAT at n = 50, m = 218 (Hoos & Stützle, "SATLIB: An Online
 * Resource for Research on SAT", SAT 2000). Every uf50-218 file is satisfiable and every uuf50-218 file is
 * unsatisfiable, as SATLIB states. Budgets (ours, stated here, common practice):
 * - walk: Schöning trials of 3n = 150 flips, at most 100 000 trials (1.5e7 flips) per file, run in blocks of
 *   1000 until the first success; the per-trial success probability measured on such files is 5e−4…3e−2.
 * - anneal: 300 sweeps a trial (15 000 flip attempts), linear schedule over the default β range, at most
 *   100 trials per file, run in blocks of 5 until the first success (measured: about half or more of the
 *   trials succeed).
 * - unsatisfiable files: 2000 walk trials and 10 anneal trials each, none may report a solution.
 */
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { parseDimacs } from "../harness/formats/dimacs.js";
import type { Cnf } from "../harness/model/cnf.js";
import type { Problem } from "../harness/model/problem.js";
import { deriveSeed, Rng } from "../harness/random.js";
import { annealTrials, defaultBetaRange } from "../solvers/anneal.js";
import { walkTrials } from "../solvers/walk.js";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const datasets = path.resolve(root, "../shared/datasets/satlib");
const present = existsSync(path.join(datasets, "uf50-218")) && existsSync(path.join(datasets, "uuf50-218"));

/** A seeded sample of `count` files of a folder (partial Fisher–Yates over the sorted names). */
function sample(folder: string, count: number): string[] {
  const names = readdirSync(path.join(datasets, folder)).filter((f) => f.endsWith(".cnf")).sort();
  const rng = new Rng(deriveSeed("satlib-local-search", folder));
  for (let i = 0; i < count && i < names.length; i++) {
    const j = i + rng.below(names.length - i);
    [names[i], names[j]] = [names[j], names[i]];
  }
  return names.slice(0, count);
}

function load(folder: string, name: string): Cnf {
  return parseDimacs(readFileSync(path.join(datasets, folder, name), "utf8"), name);
}

function annealOptions(problem: Problem, trials: number, firstTrial: number, seed: string) {
  const { betaStart, betaEnd } = defaultBetaRange(problem);
  return { trials, firstTrial, sweeps: 300, betaStart, betaEnd, schedule: "linear" as const, target: 0, tolerance: 0.5, seed, stop: null };
}

describe.skipIf(!present)("SATLIB uf50-218 / uuf50-218 (Hoos & Stützle 2000)", () => {
  const satisfiable = present ? sample("uf50-218", 25) : [];
  const unsatisfiable = present ? sample("uuf50-218", 25) : [];

  it("walk solves each of 25 sampled uf50-218 files within 100 000 trials of 3n flips", () => {
    for (const name of satisfiable) {
      const cnf = load("uf50-218", name);
      let solved = false;
      for (let first = 0; first < 100_000 && !solved; first += 1000) {
        const r = walkTrials(cnf, { trials: 1000, firstTrial: first, seed: name, stop: null });
        solved = r.successes > 0;
      }
      expect(solved, name).toBe(true);
    }
  });

  it("anneal solves each of 25 sampled uf50-218 files within 100 trials of 300 sweeps", () => {
    for (const name of satisfiable) {
      const problem: Problem = { kind: "cnf", cnf: load("uf50-218", name) };
      let solved = false;
      for (let first = 0; first < 100 && !solved; first += 5) {
        const r = annealTrials(problem, annealOptions(problem, 5, first, name));
        solved = r.successes > 0;
      }
      expect(solved, name).toBe(true);
    }
  });

  it("neither solver ever reports a solution on 25 sampled uuf50-218 files", () => {
    for (const name of unsatisfiable) {
      const problem: Problem = { kind: "cnf", cnf: load("uuf50-218", name) };
      const w = walkTrials(problem.cnf, { trials: 2000, seed: name, stop: null });
      expect(w.successes, name).toBe(0);
      expect(w.best, name).toBeGreaterThanOrEqual(1);
      expect(w.work).toBe(2000 * 150); // no trial may stop early on an unsatisfiable formula
      const a = annealTrials(problem, annealOptions(problem, 10, 0, name));
      expect(a.successes, name).toBe(0);
      expect(a.best, name).toBeGreaterThanOrEqual(1);
    }
  });
});
