/**
 * Open benchmark data: SATLIB's uniform random 3-SAT set uf20-91 (Hoos & Stützle, "SATLIB: An Online Resource
 * for Research on SAT", SAT 2000), 1000 formulas with 20 variables and 91 clauses, all satisfiable by SATLIB's
 * statement. Exact search must find every one satisfiable.
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseDimacs } from "../harness/formats/dimacs.js";
import { exhaustiveCnfSlice } from "../solvers/exhaustive-cnf.js";
import { HAVE_SATLIB, SATLIB_DIR } from "./helpers/paths.js";

if (!HAVE_SATLIB) console.warn(`satlib-exact: skipped, SATLIB data not found at ${SATLIB_DIR}`);

describe.skipIf(!HAVE_SATLIB)(`SATLIB uf20-91 (${SATLIB_DIR})`, () => {
  it("all 1000 files are satisfiable by exact search", () => {
    const folder = join(SATLIB_DIR, "uf20-91");
    const files = readdirSync(folder).filter((f) => f.endsWith(".cnf"));
    expect(files.length).toBe(1000); // SATLIB: 1000 instances in uf20-91
    let minModels = Infinity;
    for (const file of files) {
      const cnf = parseDimacs(readFileSync(join(folder, file), "utf8"), file);
      expect(cnf.variables).toBe(20);
      expect(cnf.offsets.length - 1).toBe(91);
      const r = exhaustiveCnfSlice(cnf, 0, 0, null);
      expect(r.complete).toBe(true);
      expect(r.assignments).toBe(2 ** 20);
      if (r.optimum !== 0) throw new Error(`${file}: exact search found no model (optimum ${r.optimum})`);
      minModels = Math.min(minModels, r.degeneracy);
    }
    expect(minModels).toBeGreaterThanOrEqual(1);
  });

  it("the original-layout copy of uf20-01 gives the same optimum and model count as the stripped copy", () => {
    const original = readFileSync(join(SATLIB_DIR, "original-format", "uf20-01.cnf"), "utf8");
    const stripped = readFileSync(join(SATLIB_DIR, "uf20-91", "uf20-01.cnf"), "utf8");
    const a = exhaustiveCnfSlice(parseDimacs(original, "uf20-01.cnf"), 0, 0, null);
    const b = exhaustiveCnfSlice(parseDimacs(stripped, "uf20-01.cnf"), 0, 0, null);
    expect(a.optimum).toBe(0);
    expect(a).toEqual(b);
  });
});
