// The coupling-list format: round trips, comments and line endings, and one exact one-line message per defect.
import { describe, expect, it } from "vitest";
import { InputError } from "../harness/errors.js";
import { pspinFamily } from "../harness/families/pspin.js";
import { skFamily } from "../harness/families/sk.js";
import { parseCouplingList, writeCouplingList } from "../harness/formats/coupling-list.js";
import { type Ising, isingEnergyOf, isingFromTerms } from "../harness/model/ising.js";

function isingOf(p: ReturnType<typeof skFamily.generate>): Ising {
  if (p.problem.kind !== "ising") throw new Error("ising expected");
  return p.problem.ising;
}

/** The message an input must raise; fails the test when it parses or raises something else. */
function messageOf(text: string, file = "bad.txt"): string {
  try {
    parseCouplingList(text, file);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    const m = (e as Error).message;
    expect(m).not.toContain("\n");
    return m;
  }
  throw new Error(`no error for ${JSON.stringify(text)}`);
}

describe("coupling list round trip", () => {
  it("write → parse gives back the same model, bit for bit (SK, 3-spin, fields and mixed orders)", () => {
    const models: Ising[] = [
      isingOf(skFamily.generate("rt", {}, 17, 0)),
      isingOf(pspinFamily.generate("rt", { p: 3 }, 9, 0)),
      isingFromTerms(5, [
        { spins: [3], J: -0.1 },
        { spins: [0, 4], J: 1e-300 },
        { spins: [1, 2, 3, 4], J: 12345.678 },
        { spins: [2], J: 5e-324 },
        { spins: [0, 1], J: -2 },
      ]),
    ];
    for (const m of models) {
      const text = writeCouplingList(m, ["generated for a test", "two lines\nand a third"]);
      const back = parseCouplingList(text, "rt.txt");
      expect(back.spins).toBe(m.spins);
      expect(back.termOffsets).toEqual(m.termOffsets);
      expect(back.termSpins).toEqual(m.termSpins);
      expect(back.coefficients).toEqual(m.coefficients);
      expect(back.constant).toBe(0);
      expect(writeCouplingList(back, ["generated for a test", "two lines\nand a third"])).toBe(text);
    }
  });

  it("reads comments and blank lines anywhere, tabs, CRLF, and a missing final newline; energies follow −J·Π s", () => {
    const text = "# a model\r\n\r\n  # indented comment\r\n3\r\n0\t1  2.5\r\n\r\n# field\r\n2 -1\r\n0 1 2 0.5";
    const m = parseCouplingList(text, "ok.txt");
    expect(m.spins).toBe(3);
    expect(Array.from(m.coefficients)).toEqual([2.5, -1, 0.5]);
    // z = 0 (all up): E = −2.5 + 1 − 0.5 = −2 (hand-computed from the format's definition).
    expect(isingEnergyOf(m, 0)).toBe(-2);
    // z = 0b101 (s0 = −1, s1 = +1, s2 = −1): E = −2.5·(−1) − (−1)(−1) − 0.5·(+1) = 1 (hand-computed).
    expect(isingEnergyOf(m, 5)).toBe(1);
  });

  it("accepts a model with spins but no terms", () => {
    const m = parseCouplingList("# nothing\n4\n", "empty-terms.txt");
    expect(m.spins).toBe(4);
    expect(m.coefficients.length).toBe(0);
  });

  it("refuses to write a constant offset (the format has none)", () => {
    expect(() => writeCouplingList(isingFromTerms(2, [{ spins: [0, 1], J: 1 }], 3))).toThrow(RangeError);
  });
});

describe("coupling list errors: one line, FILE:LINE: what is wrong", () => {
  // Each expected message is this reader's own wording (source: the format's definition in coupling-list.ts).
  const cases: ReadonlyArray<[string, string, string]> = [
    ["empty file", "", "bad.txt:1: empty file: no number of spins"],
    ["blank lines only", "\n\n  \n", "bad.txt:3: empty file: no number of spins"],
    ["comments only", "# one\n# two\n", "bad.txt:2: no number of spins (only comments)"],
    ["non-integer n", "# c\n2.5\n0 1 1\n", "bad.txt:2: the number of spins must be a positive integer, found '2.5'"],
    ["zero n", "0\n", "bad.txt:1: the number of spins must be a positive integer, found '0'"],
    ["negative n", "\n-4\n", "bad.txt:2: the number of spins must be a positive integer, found '-4'"],
    ["non-numeric n", "four\n", "bad.txt:1: non-numeric token 'four' where the number of spins was expected"],
    ["extra token on the n line", "4 1\n", "bad.txt:1: expected the number of spins alone on the line, found 2 tokens"],
    ["index out of range", "3\n0 1 1\n1 3 0.5\n", "bad.txt:3: spin index '3' out of range 0..2"],
    ["negative index", "3\n-1 2 0.5\n", "bad.txt:2: spin index '-1' out of range 0..2"],
    ["repeated index", "4\n# c\n2 1 2 0.5\n", "bad.txt:3: spin index 2 repeated in one term"],
    ["non-numeric token", "3\n0 x 1\n", "bad.txt:2: non-numeric token 'x'"],
    ["non-numeric coefficient", "3\n0 1 1.5.2\n", "bad.txt:2: non-numeric token '1.5.2'"],
    ["fractional index", "3\n0.5 1 1\n", "bad.txt:2: spin index '0.5' is not an integer (token 1; the coefficient comes last)"],
    ["missing coefficient", "3\n0 1 1\n2\n", "bad.txt:3: missing coefficient after the spin index '2'"],
    ["non-finite coefficient (inf)", "3\n0 1 inf\n", "bad.txt:2: coefficient 'inf' is not finite"],
    ["non-finite coefficient (NaN)", "3\n0 1 NaN\n", "bad.txt:2: coefficient 'NaN' is not finite"],
    ["non-finite coefficient (overflow)", "3\n0 1 1e999\n", "bad.txt:2: coefficient '1e999' is not finite"],
    ["term line with no index", "3\n0 1 1\n-0.25\n", "bad.txt:3: term has no spin index before the coefficient '-0.25'"],
  ];
  for (const [what, text, message] of cases) {
    it(what, () => {
      expect(messageOf(text)).toBe(message);
    });
  }

  it("uses the file name it is given and the line counted with CRLF endings", () => {
    expect(messageOf("# x\r\n2\r\n0 5 1\r\n", "dir/model.cpl")).toBe("dir/model.cpl:3: spin index '5' out of range 0..1");
  });
});
