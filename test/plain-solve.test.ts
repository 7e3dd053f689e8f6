/**
 * The light `solve` path (harness/cli/plain-solve.ts) reads only command lines whose meaning is plain, and reads
 * them as yargs does. Outside reference: yargs-parser, the parser inside yargs (exported by yargs as `Parser`),
 * configured as the command tree declares solve's options (booleans as booleans, every other option as a string).
 * Everything doubtful must be left to the yargs tree (null), which answers it as before (help, version, errors).
 */
import { describe, expect, it } from "vitest";
import { Parser } from "yargs/helpers";
import { plainSolveArgs } from "../harness/cli/plain-solve.js";
import { declaredOptionsOf } from "../harness/cli/option-table.js";

const SOLVE_OPTIONS = declaredOptionsOf("solve");
const BOOLEANS = SOLVE_OPTIONS.filter((o) => o.type === "boolean").map((o) => o.name);
const STRINGS = SOLVE_OPTIONS.filter((o) => o.type !== "boolean").map((o) => o.name);

/** What yargs-parser makes of the words after `solve`: the positional file and each of solve's options. */
function yargsReading(args: ReadonlyArray<string>): Record<string, unknown> {
  const parsed = Parser(args.slice(1), { boolean: BOOLEANS, string: STRINGS, configuration: { "camel-case-expansion": false } });
  const out: Record<string, unknown> = { file: String(parsed._[0]) };
  for (const o of SOLVE_OPTIONS) {
    // yargs-parser sets declared booleans to false when absent; the command tree reads absent and false alike.
    if (parsed[o.name] !== undefined && parsed[o.name] !== false) out[o.name] = parsed[o.name];
  }
  return out;
}

describe("plain solve command lines", () => {
  const plain: string[][] = [
    ["solve", "a.cnf"],
    ["solve", "a.cnf", "--json"],
    ["solve", "--json", "a.cnf"],
    ["solve", "a.cnf", "--workers", "2"],
    ["solve", "a.cnf", "--workers=3", "--json"],
    ["solve", "--workers", "1", "dir/with space.cnf", "--json"],
    ["solve", "100.cnf", "--json"],
    ["solve", "a.cnf", "--workers", "abc"], // read as given; the command refuses it with its own one line
  ];
  for (const args of plain) {
    it(`reads ${JSON.stringify(args)} as yargs does`, () => {
      expect(plainSolveArgs(args)).toEqual(yargsReading(args));
    });
  }

  it("takes every option the table declares for solve", () => {
    for (const o of SOLVE_OPTIONS) {
      const args = o.type === "boolean" ? ["solve", "f.cnf", `--${o.name}`] : ["solve", "f.cnf", `--${o.name}`, "7"];
      expect(plainSolveArgs(args), o.name).toEqual(yargsReading(args));
    }
  });

  const doubtful: Array<[string, string[]]> = [
    ["another command", ["run", "--json"]],
    ["no file", ["solve", "--json"]],
    ["two files", ["solve", "a.cnf", "b.cnf"]],
    ["help", ["solve", "a.cnf", "--help"]],
    ["version", ["solve", "a.cnf", "--version"]],
    ["negated flag", ["solve", "a.cnf", "--no-json"]],
    ["flag with a value", ["solve", "a.cnf", "--json=false"]],
    ["flag followed by false", ["solve", "a.cnf", "--json", "false"]],
    ["flag followed by true", ["solve", "a.cnf", "--json", "true"]],
    ["missing value", ["solve", "a.cnf", "--workers"]],
    ["value that begins with '-'", ["solve", "a.cnf", "--workers", "-1"]],
    ["empty value", ["solve", "a.cnf", "--workers="]],
    ["repeated option", ["solve", "a.cnf", "--json", "--json"]],
    ["unknown option", ["solve", "a.cnf", "--out", "x"]],
    ["option of another command", ["solve", "a.cnf", "--cell-limit", "1s"]],
    ["short option", ["solve", "a.cnf", "-j"]],
    ["camel-case spelling", ["solve", "a.cnf", "--Json"]],
    ["end of options", ["solve", "--", "a.cnf"]],
    ["numeric-looking file name", ["solve", "1e3"]],
    ["empty file name", ["solve", ""]],
  ];
  for (const [what, args] of doubtful) {
    it(`leaves a ${what} to the yargs tree`, () => {
      expect(plainSolveArgs(args)).toBeNull();
    });
  }
});
