/**
 * Exact MaxSAT optimum and degeneracy (solvers/maxsat-bound.ts) against outside references: exhaustive
 * enumeration (solvers/exhaustive-cnf.ts) for n ≤ 24; Debian's clasp on the weighted-CNF relaxation
 * (`--opt-mode=optN`, its "Optimal" count) on SATLIB uuf50-218 and random 3-SAT above the threshold; and, for
 * optimum 1, the identity degeneracy = Σ_c #models(F \ {c} ∧ ¬c) computed with the model counter alone.
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { clausesOf, cnfFromClauses, type Cnf } from "../harness/model/cnf.js";
import { parseDimacs } from "../harness/formats/dimacs.js";
import { ksatFamily } from "../harness/families/ksat.js";
import { countModels } from "../solvers/count-cnf.js";
import { maxsatExact } from "../solvers/maxsat-bound.js";
import { exhaustiveCnfSlice } from "../solvers/exhaustive-cnf.js";
import { HAVE_SATLIB, SATLIB_DIR } from "./helpers/paths.js";
import { HAVE_CLASP, claspMaxsat } from "./helpers/clasp.js";
import { pigeonholeCnf, queensCnf } from "./helpers/structured-cnf.js";

function ksat(n: number, density: number, seed: string): Cnf {
  const p = ksatFamily.generate(seed, { k: 3, density, planted: false, satisfiable: false, unique: false }, n, 0).problem;
  if (p.kind !== "cnf") throw new Error("expected CNF");
  return p.cnf;
}

/**
 * Σ over clauses c of the models of (F without c) with c forced false: every assignment violating exactly one
 * clause is counted once, under that clause.
 */
function oneViolationCount(cnf: Cnf): bigint {
  const clauses = clausesOf(cnf);
  let sum = 0n;
  clauses.forEach((c, i) => {
    const rest = clauses.filter((_, j) => j !== i);
    for (const l of c) rest.push([-l]);
    sum += countModels(cnfFromClauses(cnf.variables, rest), null).count;
  });
  return sum;
}

describe("MaxSAT optimum and degeneracy equal exhaustive enumeration (n ≤ 24)", () => {
  it("on random 3-SAT at densities 4.26–8 (optima 0 to about 5)", () => {
    let unsat = 0;
    for (let n = 6; n <= 24; n += 3) {
      for (const density of [4.26, 5.5, 8]) {
        for (let i = 0; i < 4; i++) {
          const cnf = ksat(n, density, `maxsat-eq-${i}`);
          const e = exhaustiveCnfSlice(cnf, 0, 0, null);
          const r = maxsatExact(cnf, null);
          expect(r.complete).toBe(true);
          if (r.optimum !== e.optimum || r.degeneracy !== BigInt(e.degeneracy)) {
            throw new Error(`n=${n} density=${density} #${i}: (${r.optimum}, ${r.degeneracy}) vs enumeration (${e.optimum}, ${e.degeneracy})`);
          }
          if (e.optimum > 0) unsat++;
        }
      }
    }
    expect(unsat).toBeGreaterThan(30);
  });

  it("on pigeonhole PHP(p+1, p), 2- and 3-queens and formulas with unit and empty clauses", () => {
    const cases: Cnf[] = [pigeonholeCnf(3, 2), pigeonholeCnf(4, 3), pigeonholeCnf(5, 4), queensCnf(2), queensCnf(3)];
    cases.push(cnfFromClauses(3, [[1], [-1], [2, 3], [-2], [-3], []]));
    cases.push(cnfFromClauses(4, [[1, 2], [-1, 2], [1, -2], [-1, -2], [3, -3], [4, 4]]));
    for (const cnf of cases) {
      const e = exhaustiveCnfSlice(cnf, 0, 0, null);
      const r = maxsatExact(cnf, null);
      expect([r.optimum, r.degeneracy]).toEqual([e.optimum, BigInt(e.degeneracy)]);
    }
  });

  it("a raised stop flag gives an incomplete result", () => {
    const stop = new Int32Array(new SharedArrayBuffer(8));
    Atomics.store(stop, 0, 1);
    expect(maxsatExact(ksat(60, 8, "maxsat-stop"), stop).complete).toBe(false);
  });
});

if (!HAVE_SATLIB) console.warn(`maxsat-bound: SATLIB checks skipped, data not found at ${SATLIB_DIR}`);
if (!HAVE_CLASP) console.warn("maxsat-bound: clasp checks skipped, `clasp` not installed (apt-get install -y clasp)");

/** Every 100th uuf50-218 file (sorted names): a deterministic sample of 10. */
function uufSample(): Array<{ file: string; cnf: Cnf }> {
  const folder = join(SATLIB_DIR, "uuf50-218");
  return readdirSync(folder)
    .filter((f) => f.endsWith(".cnf"))
    .sort()
    .filter((_, i) => i % 100 === 0)
    .map((file) => ({ file, cnf: parseDimacs(readFileSync(join(folder, file), "utf8"), file) }));
}

describe.skipIf(!HAVE_SATLIB)(`SATLIB uuf50-218 (${SATLIB_DIR})`, () => {
  it.skipIf(!HAVE_CLASP)("optimum and degeneracy equal clasp's optimal-model enumeration on a sample of 10 files", () => {
    for (const { file, cnf } of uufSample()) {
      const r = maxsatExact(cnf, null);
      const c = claspMaxsat(cnf);
      expect(r.optimum, file).toBeGreaterThanOrEqual(1); // SATLIB: unsatisfiable
      expect([r.optimum, r.degeneracy], file).toEqual([c.optimum, c.optimal]);
    }
  }, 60_000);

  it("for optimum 1, degeneracy = Σ_c #models(F \\ {c} ∧ ¬c) on the sample", () => {
    let checked = 0;
    for (const { file, cnf } of uufSample().slice(0, 5)) {
      const r = maxsatExact(cnf, null);
      if (r.optimum !== 1) continue;
      expect(r.degeneracy, file).toBe(oneViolationCount(cnf));
      checked++;
    }
    expect(checked).toBeGreaterThanOrEqual(3);
  }, 60_000);
});

describe.skipIf(!HAVE_CLASP)("MaxSAT equals clasp's optimal-model enumeration beyond enumeration", () => {
  it("on random 3-SAT n = 30–50 at densities 5.5 and 6 (optima 1–3)", () => {
    for (const [n, density] of [[30, 6], [35, 6], [40, 5.5], [50, 5.5]] as Array<[number, number]>) {
      const cnf = ksat(n, density, `maxsat-clasp-${n}`);
      const r = maxsatExact(cnf, null);
      const c = claspMaxsat(cnf);
      expect([r.optimum, r.degeneracy], `n=${n} density=${density}`).toEqual([c.optimum, c.optimal]);
    }
  }, 60_000);
});
