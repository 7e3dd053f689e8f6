/**
 * The exact CNF kernel (solvers/exhaustive-cnf.ts) against independent references: brute-force evaluation of
 * every assignment with violatedBy (harness/model/cnf.ts), and the MiniSat port `logic-solver` (npm) for
 * satisfiability of formulas too large to brute-force here.
 */
import { createRequire } from "node:module";
import { Worker } from "node:worker_threads";
import { describe, expect, it } from "vitest";
import { type Cnf, cnfFromClauses, violatedBy, violatedByValues } from "../harness/model/cnf.js";
import { deriveSeed, Rng } from "../harness/random.js";
import { type CnfExactOptions, CNF_EXACT_MAX_VARIABLES, exhaustiveCnfSlice } from "../solvers/exhaustive-cnf.js";
import { randomKsat, randomMixedCnf } from "./helpers/structured-cnf.js";

/** Violated clauses of every assignment z (reference: violatedBy), computed once per formula. */
const tables = new WeakMap<Cnf, Int32Array>();
function costTable(cnf: Cnf): Int32Array {
  let table = tables.get(cnf);
  if (!table) {
    table = new Int32Array(2 ** cnf.variables);
    for (let z = 0; z < table.length; z++) table[z] = violatedBy(cnf, z);
    tables.set(cnf, table);
  }
  return table;
}

/** Minimum violated clauses and its count over the assignments z with z >>> (n − prefixBits) = prefix. */
function bruteForce(cnf: Cnf, prefixBits = 0, prefix = 0): { optimum: number; degeneracy: number } {
  const table = costTable(cnf);
  const size = 2 ** (cnf.variables - prefixBits);
  let optimum = Infinity;
  let degeneracy = 0;
  for (let z = prefix * size; z < (prefix + 1) * size; z++) {
    const v = table[z];
    if (v < optimum) {
      optimum = v;
      degeneracy = 1;
    } else if (v === optimum) {
      degeneracy++;
    }
  }
  return { optimum, degeneracy };
}

/** Every lane width class (fewer lanes than one word, exactly one word, several words) and both skipping modes. */
const SETTINGS: CnfExactOptions[] = [
  {},
  { laneBits: 0 },
  { laneBits: 3 },
  { laneBits: 5 },
  { laneBits: 8 },
  { skipping: "block" },
  { skipping: "block", laneBits: 2 },
  { skipping: "block", laneBits: 10 },
];

/** Seeded random formulas with clause lengths 1..5 (repeats and tautologies possible), n = 1..14. */
function mixedFormulas(count: number): Cnf[] {
  const out: Cnf[] = [];
  for (let i = 0; i < count; i++) {
    const rng = new Rng(deriveSeed("exhaustive-cnf test mixed", i));
    const n = 1 + (i % 14);
    // Densities from sparse (mostly satisfiable) to dense (unit clauses make most unsatisfiable).
    const m = rng.below(6 * n + 4);
    out.push(randomMixedCnf(rng, n, m, 5));
  }
  return out;
}

describe("exhaustiveCnfSlice agrees with brute force", () => {
  const formulas = mixedFormulas(168);

  it("on 168 random mixed-length formulas, n = 1..14, every lane width and skipping mode", () => {
    let satisfiable = 0;
    let unsatisfiable = 0;
    for (const cnf of formulas) {
      const want = bruteForce(cnf); // reference: violatedBy over all 2^n assignments
      if (want.optimum === 0) satisfiable++;
      else unsatisfiable++;
      for (const options of SETTINGS) {
        const got = exhaustiveCnfSlice(cnf, 0, 0, null, options);
        expect({ optimum: got.optimum, degeneracy: got.degeneracy }).toEqual(want);
        expect(got.assignments).toBe(2 ** cnf.variables);
        expect(got.complete).toBe(true);
      }
    }
    // The draw must exercise both outcomes, or the check above would prove less than it claims.
    expect(satisfiable).toBeGreaterThan(30);
    expect(unsatisfiable).toBeGreaterThan(30);
  });

  it("on dense formulas whose optimum is far above zero (large per-block budgets)", () => {
    let highest = 0;
    for (let i = 0; i < 12; i++) {
      const n = 8 + (i % 7);
      const cnf = randomKsat(new Rng(deriveSeed("exhaustive-cnf test dense", i)), n, 3, 20 * n);
      const want = bruteForce(cnf); // reference: violatedBy over all 2^n assignments
      highest = Math.max(highest, want.optimum);
      for (const options of SETTINGS) {
        const got = exhaustiveCnfSlice(cnf, 0, 0, null, options);
        expect({ optimum: got.optimum, degeneracy: got.degeneracy }).toEqual(want);
      }
    }
    // Optima this high make evaluated blocks exceed the thermometer's budget limit (3) and use binary counters.
    expect(highest).toBeGreaterThanOrEqual(10);
  });

  it("on slices: each slice matches brute force on it, and the slices merge to the full result", () => {
    for (const cnf of formulas.filter((f) => f.variables >= 3)) {
      const full = bruteForce(cnf);
      for (let prefixBits = 1; prefixBits <= 3; prefixBits++) {
        let optimum = Infinity;
        let degeneracy = 0;
        let assignments = 0;
        for (let prefix = 0; prefix < 2 ** prefixBits; prefix++) {
          const want = bruteForce(cnf, prefixBits, prefix); // reference: violatedBy on the slice
          for (const options of [{}, { skipping: "block" } as const]) {
            const got = exhaustiveCnfSlice(cnf, prefixBits, prefix, null, options);
            expect({ optimum: got.optimum, degeneracy: got.degeneracy }).toEqual(want);
            expect(got.assignments).toBe(2 ** (cnf.variables - prefixBits));
          }
          const got = exhaustiveCnfSlice(cnf, prefixBits, prefix, null);
          if (got.optimum < optimum) {
            optimum = got.optimum;
            degeneracy = got.degeneracy;
          } else if (got.optimum === optimum) {
            degeneracy += got.degeneracy;
          }
          assignments += got.assignments;
        }
        expect({ optimum, degeneracy }).toEqual(full);
        expect(assignments).toBe(2 ** cnf.variables);
      }
    }
  });

  it("with all variables fixed by the prefix (a single assignment)", () => {
    for (const cnf of formulas.slice(0, 40)) {
      const n = cnf.variables;
      for (let z = 0; z < Math.min(2 ** n, 8); z++) {
        const got = exhaustiveCnfSlice(cnf, n, z, null);
        // reference: violatedBy(z), one assignment
        expect(got).toMatchObject({ optimum: violatedBy(cnf, z), degeneracy: 1, assignments: 1, complete: true });
      }
    }
  });
});

describe("evaluated assignments (the work the search really does)", () => {
  it("is every assignment when nothing can be pruned, and far fewer on random 3-SAT", () => {
    // No clauses: one pass with bound 0 and no block skippable, so all 2^20 assignments are evaluated (hand count).
    expect(exhaustiveCnfSlice(cnfFromClauses(20, []), 0, 0, null).evaluated).toBe(2 ** 20);
    // Random 3-SAT near the threshold: tree skipping evaluates a small fraction of 2^n (measured 7e-6 of 2^34 in
    // the A/B run of this change; here only a loose bound), yet covers all of them.
    for (let i = 0; i < 5; i++) {
      const cnf = randomKsat(new Rng(deriveSeed("exhaustive-cnf test evaluated", i)), 30, 3, Math.round(4.26 * 30));
      const r = exhaustiveCnfSlice(cnf, 0, 0, null);
      expect(r.assignments).toBe(2 ** cnf.variables);
      expect(r.evaluated).toBeGreaterThan(0);
      expect(r.evaluated).toBeLessThan(2 ** cnf.variables / 4);
    }
  });
});

describe("exhaustiveCnfSlice on degenerate clauses", () => {
  it("counts an empty clause as always violated", () => {
    // (x1) ∧ () ∧ (¬x1 ∨ x2): the empty clause adds 1 everywhere; hand count over the 4 assignments
    // (x1,x2) = 00: 2, 10: 2, 01: 2, 11: 1 → optimum 1, reached once.
    const cnf = cnfFromClauses(2, [[1], [], [-1, 2]]);
    expect(exhaustiveCnfSlice(cnf, 0, 0, null)).toMatchObject({ optimum: 1, degeneracy: 1, assignments: 4, complete: true });
    // Two empty clauses beside a satisfiable part (x1 ∨ x2) ∧ (¬x1): optimum 2 at x1 = 0, x2 = 1 only.
    const twoEmpty = cnfFromClauses(2, [[], [1, 2], [], [-1]]);
    expect(exhaustiveCnfSlice(twoEmpty, 0, 0, null)).toMatchObject({ optimum: 2, degeneracy: 1, assignments: 4, complete: true });
    // Only empty clauses: every assignment violates all three (hand count).
    const empties = cnfFromClauses(3, [[], [], []]);
    expect(exhaustiveCnfSlice(empties, 0, 0, null)).toMatchObject({ optimum: 3, degeneracy: 8, assignments: 8, complete: true });
  });

  it("never counts a tautology and merges repeated literals", () => {
    // (x1 ∨ ¬x1 ∨ x2) is always true; (x2 ∨ x2 ∨ x2) is (x2); (¬x3 ∨ ¬x3) is (¬x3). Hand count: models are
    // x2 = 1, x3 = 0, any x1 → 2 of 8.
    const cnf = cnfFromClauses(3, [[1, -1, 2], [2, 2, 2], [-3, -3]]);
    expect(exhaustiveCnfSlice(cnf, 0, 0, null)).toMatchObject({ optimum: 0, degeneracy: 2, assignments: 8, complete: true });
  });

  it("handles n = 0, formulas without clauses and variables in no clause", () => {
    // n = 0: one (empty) assignment, no clause violated.
    expect(exhaustiveCnfSlice(cnfFromClauses(0, []), 0, 0, null)).toMatchObject({
      optimum: 0,
      degeneracy: 1,
      assignments: 1,
      complete: true,
    });
    // No clauses: all 2^n assignments are models (hand count).
    expect(exhaustiveCnfSlice(cnfFromClauses(20, []), 0, 0, null).degeneracy).toBe(2 ** 20);
    // (x1 ∨ x2) over 12 variables: 3 of 4 settings of x1, x2, times 2^10 for the rest.
    expect(exhaustiveCnfSlice(cnfFromClauses(12, [[1, 2]]), 0, 0, null).degeneracy).toBe(3 * 2 ** 10);
  });

  it("n = 1, 2, 3 by hand", () => {
    // (x1) ∧ (¬x1): every assignment violates exactly one clause.
    expect(exhaustiveCnfSlice(cnfFromClauses(1, [[1], [-1]]), 0, 0, null)).toMatchObject({ optimum: 1, degeneracy: 2 });
    // XOR of two variables as CNF: (x1 ∨ x2) ∧ (¬x1 ∨ ¬x2): models 01 and 10.
    expect(exhaustiveCnfSlice(cnfFromClauses(2, [[1, 2], [-1, -2]]), 0, 0, null)).toMatchObject({
      optimum: 0,
      degeneracy: 2,
    });
    // All eight 3-clauses over x1..x3: each assignment falsifies exactly the one clause that negates it.
    const all: number[][] = [];
    for (let s = 0; s < 8; s++) all.push([1, 2, 3].map((v, i) => ((s >> i) & 1 ? v : -v)));
    expect(exhaustiveCnfSlice(cnfFromClauses(3, all), 0, 0, null)).toMatchObject({ optimum: 1, degeneracy: 8 });
  });
});

/** The part of logic-solver's API used here (the package ships no type declarations). */
interface LogicSolverApi {
  Solver: new () => {
    require(formula: unknown): void;
    solve(): { getTrueVars(): string[] } | null;
  };
  or(...operands: unknown[]): unknown;
  not(operand: unknown): unknown;
}

describe("exhaustiveCnfSlice agrees with the MiniSat port logic-solver", () => {
  // logic-solver is CommonJS exporting the Logic namespace as module.exports.
  const Logic = createRequire(import.meta.url)("logic-solver") as LogicSolverApi;

  it("on satisfiability of 60 random 3-SAT formulas, n = 30..40, density ≈ 4.26", () => {
    let satisfiable = 0;
    for (let i = 0; i < 60; i++) {
      const n = 30 + (i % 11);
      const cnf = randomKsat(new Rng(deriveSeed("exhaustive-cnf test minisat", i)), n, 3, Math.round(4.26 * n));
      const solver = new Logic.Solver();
      for (let c = 0; c + 1 < cnf.offsets.length; c++) {
        const terms: unknown[] = [];
        for (let j = cnf.offsets[c]; j < cnf.offsets[c + 1]; j++) {
          const lit = cnf.literals[j];
          terms.push(lit > 0 ? `v${lit}` : Logic.not(`v${-lit}`));
        }
        solver.require(Logic.or(...terms));
      }
      const model = solver.solve(); // reference: MiniSat (logic-solver 2.0.1)
      const got = exhaustiveCnfSlice(cnf, 0, 0, null);
      expect(got.complete).toBe(true);
      expect(got.optimum === 0).toBe(model !== null);
      if (model !== null) {
        satisfiable++;
        // MiniSat's model really satisfies the formula, so it is one of the assignments we counted.
        const values = new Uint8Array(n);
        for (const name of model.getTrueVars()) values[Number(name.slice(1)) - 1] = 1;
        expect(violatedByValues(cnf, values)).toBe(0);
        expect(got.degeneracy).toBeGreaterThanOrEqual(1);
      } else {
        expect(got.optimum).toBeGreaterThanOrEqual(1);
      }
    }
    // Near the threshold both outcomes occur (about half each at these n); both must be exercised.
    expect(satisfiable).toBeGreaterThan(10);
    expect(satisfiable).toBeLessThan(50);
  });
});

describe("exhaustiveCnfSlice stop flag and limits", () => {
  const cnf = randomKsat(new Rng(deriveSeed("exhaustive-cnf test stop")), 30, 3, 128);

  it("returns complete: false when the flag is raised", () => {
    const stop = new Int32Array(new SharedArrayBuffer(4));
    Atomics.store(stop, 0, 1);
    for (const options of [{}, { skipping: "block" } as const]) {
      const got = exhaustiveCnfSlice(cnf, 0, 0, stop, options);
      expect(got.complete).toBe(false);
      expect(got.assignments).toBeLessThan(2 ** 30);
    }
  });

  it("stops mid-run when another thread raises the flag, reporting only what it covered", () => {
    // The plain block enumerator needs ≥ 1 s for n = 34 (2^34 assignments at ≈ 10^10/s, the bench figure),
    // so a flag raised 30 ms after the start always lands mid-run.
    const big = randomKsat(new Rng(deriveSeed("exhaustive-cnf test stop mid-run")), 34, 3, 145);
    const shared = new SharedArrayBuffer(8);
    const stop = new Int32Array(shared, 0, 1);
    const ready = new Int32Array(shared, 4, 1);
    const worker = new Worker(
      `const { workerData } = require("node:worker_threads");
       const stop = new Int32Array(workerData, 0, 1);
       const ready = new Int32Array(workerData, 4, 1);
       Atomics.store(ready, 0, 1);
       Atomics.notify(ready, 0);
       Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 30);
       Atomics.store(stop, 0, 1);`,
      { eval: true, workerData: shared },
    );
    Atomics.wait(ready, 0, 0, 10_000);
    const got = exhaustiveCnfSlice(big, 0, 0, stop, { skipping: "block", laneBits: 10 });
    void worker.terminate();
    expect(got.complete).toBe(false);
    expect(got.assignments).toBeGreaterThan(0);
    expect(got.assignments).toBeLessThan(2 ** 34);
    expect(got.assignments % 1024).toBe(0); // whole blocks of 2^10 lanes
  });

  it("runs to completion with a lowered flag, as with no flag", () => {
    const stop = new Int32Array(new SharedArrayBuffer(4));
    const withFlag = exhaustiveCnfSlice(cnf, 0, 0, stop);
    expect(withFlag.complete).toBe(true);
    expect(withFlag).toEqual(exhaustiveCnfSlice(cnf, 0, 0, null));
  });

  it("refuses more than CNF_EXACT_MAX_VARIABLES variables and invalid slices or literals", () => {
    expect(() => exhaustiveCnfSlice(cnfFromClauses(CNF_EXACT_MAX_VARIABLES + 1, [[1]]), 0, 0, null)).toThrow(
      /at most 40 variables/,
    );
    const small = cnfFromClauses(4, [[1, -2]]);
    expect(() => exhaustiveCnfSlice(small, 5, 0, null)).toThrow(RangeError);
    expect(() => exhaustiveCnfSlice(small, 2, 4, null)).toThrow(RangeError);
    expect(() => exhaustiveCnfSlice(cnfFromClauses(4, [[5]]), 0, 0, null)).toThrow(/out of range/);
    expect(() => exhaustiveCnfSlice(cnfFromClauses(4, [[0]]), 0, 0, null)).toThrow(/out of range/);
  });
});
