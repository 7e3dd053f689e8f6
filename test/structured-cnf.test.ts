/**
 * Exact model counts of the CNF kernel on structured formulas with published or closed-form answers
 * (encoders in test/helpers/structured-cnf.ts).
 */
import { describe, expect, it } from "vitest";
import type { Cnf } from "../harness/model/cnf.js";
import { exhaustiveCnfSlice } from "../solvers/exhaustive-cnf.js";
import { cycleColouringCnf, pigeonholeCnf, queensCnf } from "./helpers/structured-cnf.js";

/** Minimum and count with the default settings, checked against the plain block enumerator when n ≤ 25. */
function exact(cnf: Cnf): { optimum: number; degeneracy: number } {
  const r = exhaustiveCnfSlice(cnf, 0, 0, null);
  expect(r.complete).toBe(true);
  expect(r.assignments).toBe(2 ** cnf.variables);
  if (cnf.variables <= 25) {
    const plain = exhaustiveCnfSlice(cnf, 0, 0, null, { skipping: "block" });
    // Same answer; the evaluated counts differ by design (different pruning and lane widths).
    expect({ ...plain, evaluated: 0 }).toEqual({ ...r, evaluated: 0 });
  }
  return { optimum: r.optimum, degeneracy: r.degeneracy };
}

/** Chromatic polynomial of the cycle C_n: (q−1)^n + (−1)^n (q−1) (e.g. Biggs, Algebraic Graph Theory, 1993). */
function cycleColourings(n: number, q: number): number {
  return (q - 1) ** n + (n % 2 === 0 ? 1 : -1) * (q - 1);
}

describe("n-queens", () => {
  // Solutions of the n-queens problem: OEIS A000170 (1, 0, 0, 2, 10, 4, 40, 92, …).
  it.each([
    [4, 2],
    [5, 10],
    [6, 4],
  ])("%i-queens has %i solutions", (n, solutions) => {
    expect(exact(queensCnf(n))).toEqual({ optimum: 0, degeneracy: solutions });
  });
});

describe("proper colourings of a cycle, one-hot", () => {
  it.each([
    [3, 3], // 6 (= 3!, a triangle)
    [4, 3], // 18
    [5, 3], // 30
    [13, 3], // 8190, 39 variables
    [5, 4], // 240
    [8, 4], // 6564, 32 variables
  ])("C_%i with %i colours: the chromatic polynomial", (n, q) => {
    expect(exact(cycleColouringCnf(n, q))).toEqual({ optimum: 0, degeneracy: cycleColourings(n, q) });
  });

  it("slices of C_8 with 4 colours merge to the same count", () => {
    const cnf = cycleColouringCnf(8, 4);
    let total = 0;
    for (let prefix = 0; prefix < 8; prefix++) {
      const r = exhaustiveCnfSlice(cnf, 3, prefix, null);
      // The top three variables are vertex 7's colours 1..3 (one-hot), so slices with two or three of them
      // set contain no proper colouring; every other slice does.
      if (r.optimum === 0) total += r.degeneracy;
    }
    expect(total).toBe(cycleColourings(8, 4)); // closed form, 6564
  });
});

describe("pigeonhole PHP(h+1 pigeons, h holes)", () => {
  /*
   * Unsatisfiable: h+1 pigeons cannot sit injectively in h holes. Optimum 1: seat pigeons 1..h one per hole and
   * leave pigeon h+1 in no hole; only its "at least one hole" clause is violated. Degeneracy, counted by hand:
   * assignments violating exactly one clause either
   *  (a) violate one pigeon's "at least one hole" clause and no "two in a hole" clause: the other h pigeons
   *      occupy pairwise disjoint non-empty sets of the h holes, so one hole each: (h+1)·h! assignments; or
   *  (b) violate exactly one "pigeons i, i' both in hole j" clause: hole j holds exactly i and i'; the other h−1
   *      pigeons need disjoint non-empty sets of the other h−1 holes, so one each ((h−1)! ways), which fills those
   *      holes and keeps i, i' out of them: h·C(h+1, 2)·(h−1)! = (h+1)!·h/2 assignments.
   * Total (h+1)!·(1 + h/2): 60 for h = 3, 360 for h = 4, 2520 for h = 5.
   */
  it.each([
    [3, 60],
    [4, 360],
    [5, 2520],
  ])("h = %i: unsatisfiable, optimum 1, degeneracy %i", (h, degeneracy) => {
    let factorial = 1;
    for (let i = 2; i <= h + 1; i++) factorial *= i;
    expect(degeneracy).toBe(factorial * (1 + h / 2)); // the closed form above, restated
    expect(exact(pigeonholeCnf(h + 1, h))).toEqual({ optimum: 1, degeneracy });
  });

  it("PHP(h, h) is satisfiable with h! models (the permutations)", () => {
    // Closed form: with as many holes as pigeons, models are the bijections, h! of them.
    expect(exact(pigeonholeCnf(4, 4))).toEqual({ optimum: 0, degeneracy: 24 });
    expect(exact(pigeonholeCnf(5, 5))).toEqual({ optimum: 0, degeneracy: 120 });
  });
});
