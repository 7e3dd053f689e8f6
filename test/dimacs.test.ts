// DIMACS CNF reading and writing: the open standard format ("satisfiability suggested format", DIMACS
// Challenge 1993), including the layout SATLIB files really have, and one-line errors for every malformed case.
import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { parseDimacs, writeDimacs } from "../harness/formats/dimacs.js";
import { InputError } from "../harness/errors.js";
import { clausesOf, cnfFromClauses } from "../harness/model/cnf.js";
import { HAVE_SATLIB, SATLIB_DIR } from "./helpers/paths.js";

function errorOf(text: string): string {
  try {
    parseDimacs(text, "bad.cnf");
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as Error).message;
  }
  throw new Error("expected a parse error");
}

describe("DIMACS CNF", () => {
  it("round-trips clauses of mixed length", () => {
    const cnf = cnfFromClauses(5, [[1, -2, 3], [-5], [2, 4, -1, 5], []]);
    const back = parseDimacs(writeDimacs(cnf, ["a comment"]), "x.cnf");
    expect(back.variables).toBe(5);
    expect(clausesOf(back)).toEqual([[1, -2, 3], [-5], [2, 4, -1, 5], []]);
  });

  it("accepts clauses spread over lines, comments anywhere and extra spaces", () => {
    const cnf = parseDimacs("c hi\np  cnf  3   2 \n1 -2\n 3 0\n-1 0\n", "x.cnf");
    expect(clausesOf(cnf)).toEqual([[1, -2, 3], [-1]]);
  });

  // Each malformed case: exactly one line, FILE:LINE: what is wrong.
  const cases: Array<[string, string, RegExp]> = [
    ["empty file", "", /^bad\.cnf:1: empty file/],
    ["bad header", "p cnf x 2\n1 0\n", /^bad\.cnf:1: bad variable count 'x'/],
    ["wrong format word", "p sat 3 1\n1 0\n", /^bad\.cnf:1: bad header/],
    ["literal out of range", "p cnf 3 1\n1 -4 0\n", /^bad\.cnf:2: literal -4 out of range/],
    ["missing terminating 0", "p cnf 3 2\n1 2 0\n-3 1\n", /^bad\.cnf:3: clause not terminated by 0/],
    ["clause count mismatch (fewer)", "p cnf 3 3\n1 2 0\n-3 0\n", /^bad\.cnf:1: clause count mismatch: header declares 3, file has 2/],
    ["clause count mismatch (more)", "p cnf 3 1\n1 2 0\n-3 0\n", /^bad\.cnf:3: clause count mismatch: header declares 1, file has 2/],
    ["non-numeric token", "p cnf 3 1\n1 two 0\n", /^bad\.cnf:2: non-numeric token 'two'/],
    ["clauses before the header", "1 2 0\np cnf 2 1\n", /^bad\.cnf:1: clause data before the 'p cnf' header/],
    ["two headers", "p cnf 2 1\np cnf 2 1\n1 0\n", /^bad\.cnf:2: second 'p' header/],
  ];
  for (const [name, text, pattern] of cases) {
    it(`rejects: ${name}`, () => {
      const msg = errorOf(text);
      expect(msg).toMatch(pattern);
      expect(msg).not.toContain("\n");
    });
  }

  describe.skipIf(!HAVE_SATLIB)("SATLIB layouts (shared/datasets/satlib, README there)", () => {
    it("parses the original layout: comment header, 'p cnf 20  91 ', then '%' and '0' after the last clause", () => {
      const cnf = parseDimacs(readFileSync(join(SATLIB_DIR, "original-format/uf20-01.cnf"), "utf8"), "uf20-01.cnf");
      expect(cnf.variables).toBe(20); // SATLIB uf20-91: 20 variables, 91 clauses
      expect(cnf.offsets.length - 1).toBe(91);
      const stripped = parseDimacs(readFileSync(join(SATLIB_DIR, "uf20-91/uf20-01.cnf"), "utf8"), "uf20-01.cnf");
      expect(clausesOf(cnf)).toEqual(clausesOf(stripped));
    });
  });
});
