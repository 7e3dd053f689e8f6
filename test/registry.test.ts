/**
 * The registries' contracts (issue 11): every solver, predictor and family is found by name, names are unique,
 * every option a method or family says it reads is declared in the one option table, and every randomised
 * solver is pure (same cell seed ⇒ same counts) on the problem kinds it says it applies to.
 */
import { describe, expect, it } from "vitest";
import { SOLVERS, defaultSolvers, trialsSolverNamed } from "../solvers/registry.js";
import { PREDICTORS } from "../harness/predict/registry.js";
import { FAMILIES, familyNamed, generatorFor } from "../harness/families/registry.js";
import { STUDY_OPTIONS } from "../harness/cli/options.js";
import { costTolerance, type Problem } from "../harness/model/problem.js";
import { exhaustiveSolver } from "../solvers/exhaustive.js";
import type { TrialsSolver } from "../solvers/types.js";

const declared = new Set(STUDY_OPTIONS.map((o) => o.name));
const unique = (names: string[]): boolean => new Set(names).size === names.length;

describe("registries", () => {
  it("have unique names", () => {
    expect(unique(SOLVERS.map((s) => s.name))).toBe(true);
    expect(unique(PREDICTORS.map((p) => p.name))).toBe(true);
    expect(unique(FAMILIES.map((f) => f.name))).toBe(true);
  });

  it("declare every option they read in the option table", () => {
    for (const s of SOLVERS) if (s.kind === "trials") for (const o of s.options) expect(declared, `${s.name}: --${o}`).toContain(o);
    for (const p of PREDICTORS) for (const o of p.options) expect(declared, `${p.name}: --${o}`).toContain(o);
    for (const f of FAMILIES) for (const o of f.params) expect(declared, `${f.name}: --${o}`).toContain(o);
  });

  it("give the default --solvers of each model kind from the solvers' own entries (issue 12's lists)", () => {
    expect(defaultSolvers("cnf")).toEqual(["exhaustive", "walk", "breakwalk", "anneal"]);
    expect(defaultSolvers("ising")).toEqual(["exhaustive", "anneal", "tempering"]);
    for (const kind of ["cnf", "ising"] as const) {
      for (const name of defaultSolvers(kind).slice(1)) expect(trialsSolverNamed(name).appliesTo({ family: "test", kind }), name).toBeNull();
    }
  });

  it("name the solver each amplification predictor needs, and that solver exists", () => {
    for (const p of PREDICTORS.filter((x) => x.amplifies !== undefined)) expect(trialsSolverNamed(p.amplifies!).name).toBe(p.amplifies);
  });

  it("give every family a kind, and generated families draw instances of that kind", () => {
    const read = { number: (o: string) => Number(STUDY_OPTIONS.find((x) => x.name === o)?.default), given: () => false, flag: () => false, text: (o: string) => String(STUDY_OPTIONS.find((x) => x.name === o)?.default) };
    for (const f of FAMILIES) {
      expect(["cnf", "ising"]).toContain(familyNamed(f.name).kind);
      if (f.source !== "generated") continue;
      const params = f.resolveParams(read);
      const n = 8;
      expect(f.checkSize(n, params), f.name).toBeNull();
      expect(generatorFor(f.name).generate("registry", params, n, 0).problem.kind).toBe(f.kind);
    }
  });
});

describe("every randomised solver is pure", () => {
  const instances: Problem[] = FAMILIES.filter((f) => f.source === "generated").map((f) => {
    const read = { number: (o: string) => Number(STUDY_OPTIONS.find((x) => x.name === o)?.default), given: () => false, flag: () => false, text: (o: string) => String(STUDY_OPTIONS.find((x) => x.name === o)?.default) };
    return generatorFor(f.name).generate("purity", f.resolveParams(read), 10, 1).problem;
  });
  const study = {
    trials: 30,
    options: {
      "walk-flips": 3, "anneal-sweeps": [20], "anneal-cooling": "geometric", "anneal-beta": null,
      "breakwalk-flips": 100, "breakwalk-rule": null, "breakwalk-cb": null, "breakwalk-eps": null,
      "tempering-replicas": 4, "tempering-sweeps": [10], "tempering-beta": null,
    },
  };
  const trials = SOLVERS.filter((s): s is TrialsSolver<unknown> => s.kind === "trials");

  it.each(trials.map((s) => [s.name, s] as const))("%s: same cell seed, same counts; counts are consistent", (_name, solver) => {
    let checked = 0;
    for (const problem of instances) {
      if (solver.appliesTo({ family: "test", kind: problem.kind }) !== null) continue;
      const truth = exhaustiveSolver.merge([exhaustiveSolver.run(problem, { prefixBits: 0, prefix: 0, mirror: false }, null)], costTolerance(problem));
      if (solver.skipReason({ kind: problem.kind, optimum: truth.optimum }) !== null) continue;
      const base = solver.settings(study);
      const settings = solver.prepare ? solver.prepare(problem, base) : base;
      const input = { trials: 30, runLength: solver.runLengths(10, study)[0], seed: "purity-cell", target: truth.optimum, tolerance: costTolerance(problem), settings, stop: null };
      const a = solver.run(problem, input);
      const b = solver.run(problem, input);
      expect(b).toEqual(a);
      expect(a.trials).toBe(30);
      expect(a.successes).toBeGreaterThanOrEqual(0);
      expect(a.successes).toBeLessThanOrEqual(a.trials);
      expect(a.best).toBeGreaterThanOrEqual(truth.optimum - costTolerance(problem));
      expect(a.censored).toBe(false);
      checked++;
    }
    expect(checked, "the solver applies to at least one test instance").toBeGreaterThan(0);
  });
});
