// Issue 14: fuzzed input. Property-based tests (fast-check) over the DIMACS and coupling-list readers and over the
// command line. Mutations of valid files: truncation, bit flips, huge numbers, NaN, Unicode, CRLF, missing final
// newline, and one file of 10^6 clauses. Invariant: a correct result, or one line `FILE:LINE: what` (or `--option:
// what`) with exit code 2 — never another exception, a stack trace, a hang (each CLI case under a time limit), or an
// output folder left with a half-written file. Run counts are bounded (seeded) to keep this to about 30 s of CPU.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parseDimacs, writeDimacs } from "../harness/formats/dimacs.js";
import { parseCouplingList, writeCouplingList } from "../harness/formats/coupling-list.js";
import { InputError } from "../harness/errors.js";
import { CLI, REPO_ROOT } from "./helpers/paths.js";

const VALID_CNF = "c a small formula\np cnf 5 4\n1 -2 3 0\n-1 4 0\n2 -3 -5 0\n5 0\n";
const VALID_ISING = "# couplings\n4\n0 1 -1.5\n1 2 0.25\n2 3 1\n0 0.5\n";

/** Mutations of a valid text, as a corrupted or hand-edited file would show them. */
function mutated(valid: string): fc.Arbitrary<string> {
  const huge = fc.constantFrom("99999999999999999999", "1e308", "NaN", "-0", "Infinity", "4294967297", "0x1F", "1_000");
  const unicode = fc.constantFrom("é", "\u00a0", "\u2212", "１", "\ufeff", "\u0000", "🙂");
  return fc.oneof(
    fc.nat(valid.length).map((k) => valid.slice(0, k)), // truncation (also drops the final newline)
    fc.tuple(fc.nat(valid.length - 1), fc.integer({ min: 0, max: 7 })).map(([i, bit]) => valid.slice(0, i) + String.fromCharCode(valid.charCodeAt(i) ^ (1 << bit)) + valid.slice(i + 1)), // bit flip
    fc.tuple(fc.nat(valid.length), huge).map(([i, s]) => `${valid.slice(0, i)} ${s} ${valid.slice(i)}`),
    fc.tuple(fc.nat(valid.length), unicode).map(([i, s]) => valid.slice(0, i) + s + valid.slice(i)),
    fc.constant(valid.replace(/\n/g, "\r\n")), // CRLF
    fc.constant(valid.trimEnd()), // no final newline
    fc.string({ maxLength: 60 }), // anything at all
  );
}

/** Parses, returning the result or the one-line InputError; any other exception fails the property. */
function parseOrMessage<T>(parse: () => T): T | string {
  try {
    return parse();
  } catch (e) {
    expect(e, String(e)).toBeInstanceOf(InputError);
    return (e as Error).message;
  }
}

describe("fuzzed DIMACS files", () => {
  it("parse to a well-formed formula that round-trips, or give one line FILE:LINE: what (400 seeded cases)", () => {
    fc.assert(
      fc.property(mutated(VALID_CNF), (text) => {
        const r = parseOrMessage(() => parseDimacs(text, "f.cnf"));
        if (typeof r === "string") {
          expect(r).toMatch(/^f\.cnf:\d+: \S/);
          expect(r).not.toContain("\n");
          return;
        }
        for (const lit of r.literals) expect(lit !== 0 && Math.abs(lit) <= r.variables).toBe(true);
        const again = parseDimacs(writeDimacs(r), "again.cnf");
        expect(Array.from(again.literals)).toEqual(Array.from(r.literals));
        expect(Array.from(again.offsets)).toEqual(Array.from(r.offsets));
      }),
      { seed: 14, numRuns: 400 },
    );
  });

  it("reads a file of 10^6 clauses within seconds", () => {
    const m = 1_000_000;
    const parts = [`p cnf 20 ${m}`];
    for (let c = 0; c < m; c++) parts.push(`${(c % 20) + 1} -${((c + 7) % 20) + 1} ${((c + 13) % 20) + 1} 0`);
    const started = Date.now();
    const cnf = parseDimacs(parts.join("\n") + "\n", "big.cnf");
    expect(cnf.offsets.length - 1).toBe(m);
    expect(Date.now() - started).toBeLessThan(30_000); // generous: a shared CI machine; the point is no blow-up
  });
});

describe("fuzzed coupling lists", () => {
  it("parse to a model that round-trips, or give one line FILE:LINE: what (400 seeded cases)", () => {
    fc.assert(
      fc.property(mutated(VALID_ISING), (text) => {
        const r = parseOrMessage(() => parseCouplingList(text, "m.txt"));
        if (typeof r === "string") {
          expect(r).toMatch(/^m\.txt:\d+: \S/);
          expect(r).not.toContain("\n");
          return;
        }
        for (const c of r.coefficients) expect(Number.isFinite(c)).toBe(true);
        const again = parseCouplingList(writeCouplingList(r), "again.txt");
        expect(again.spins).toBe(r.spins);
        expect(Array.from(again.coefficients)).toEqual(Array.from(r.coefficients));
      }),
      { seed: 14, numRuns: 400 },
    );
  });
});

/** The part of logic-solver's API used here (the package ships no type declarations). */
interface LogicSolverApi {
  Solver: new () => { require(formula: unknown): void; solve(): unknown };
  or(...operands: unknown[]): unknown;
  not(operand: unknown): unknown;
}

describe("fuzzed command lines (compiled CLI, each case under a 60 s limit)", () => {
  let root = "";
  beforeAll(() => {
    root = mkdtempSync(join(tmpdir(), "speedbound-fuzz-"));
  });
  afterAll(() => rmSync(root, { recursive: true, force: true }));

  const run = (args: string[]) => spawnSync(process.execPath, [CLI, ...args], { cwd: REPO_ROOT, encoding: "utf8", timeout: 60_000 });

  it("solve on mutated files: exit 0 with the satisfiability MiniSat finds, or one line naming the file and line", () => {
    const Logic = createRequire(import.meta.url)("logic-solver") as LogicSolverApi;
    let i = 0;
    fc.assert(
      fc.property(mutated(VALID_CNF), (text) => {
        const file = join(root, `case-${i++}.cnf`);
        writeFileSync(file, text);
        const r = run(["solve", file, "--json", "--workers", "1"]);
        expect(r.signal, r.stderr).toBeNull();
        if (r.status === 0) {
          const got = JSON.parse(r.stdout) as { satisfiable: boolean };
          const cnf = parseDimacs(text, file);
          const solver = new Logic.Solver(); // reference: MiniSat (logic-solver 2.0.1)
          for (let c = 0; c + 1 < cnf.offsets.length; c++) {
            const terms: unknown[] = [];
            for (let j = cnf.offsets[c]; j < cnf.offsets[c + 1]; j++) terms.push(cnf.literals[j] > 0 ? `v${cnf.literals[j]}` : Logic.not(`v${-cnf.literals[j]}`));
            solver.require(Logic.or(...terms));
          }
          expect(got.satisfiable).toBe(solver.solve() !== null);
          return;
        }
        expect(r.status, r.stderr).toBe(2);
        expect(r.stderr.trim().split("\n"), r.stderr).toHaveLength(1);
        expect(r.stderr).toMatch(new RegExp(`^speedbound: ${file.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}(:\\d+)?: \\S`));
      }),
      { seed: 14, numRuns: 10 },
    );
  });

  it("random option strings: exit 0, or one line naming the option with exit 2; no stack, no half-written folder", () => {
    const value = fc.constantFrom("", "0", "-1", "2.5", "ten", "NaN", "1e9", "6", "6:7", "7:6", "5:9:0", "a,b", "é", "--x", "1/0", "3n", "10ms", "gauss", "walk");
    const option = fc.constantFrom("n", "instances", "trials", "sweeps", "seed", "k", "density", "budget", "cell-limit", "shard", "solvers", "predict", "walk-flips", "beta", "b", "eta", "workers", "family", "bogus");
    let i = 0;
    fc.assert(
      fc.property(fc.uniqueArray(fc.tuple(option, value), { maxLength: 4, selector: ([o]) => o }), (pairs) => {
        const out = join(root, `out-${i++}`);
        // A small study by default, so that an accepted command line ends quickly.
        const base: Record<string, string> = { n: "6", instances: "1", trials: "4", sweeps: "10", predict: "grover", workers: "1" };
        for (const [o, v] of pairs) base[o] = v;
        const args = ["run", "--out", out, ...Object.entries(base).flatMap(([o, v]) => [`--${o}`, v])];
        const r = run(args);
        expect(r.signal, `${args.join(" ")}\n${r.stderr}`).toBeNull();
        expect(r.stderr, args.join(" ")).not.toMatch(/\n\s+at |internal error/);
        if (r.status !== 0) {
          expect(r.status, `${args.join(" ")}\n${r.stderr}`).toBe(2);
          const lines = r.stderr.trim().split("\n").filter((l) => !/^speedbound: (note|\d+ cells|n=)/.test(l));
          expect(lines, r.stderr).toHaveLength(1);
          expect(lines[0]).toMatch(/^speedbound: (--[a-z-]+|unknown option)/);
        }
        if (existsSync(out)) expect(readdirSync(out).filter((f) => f.includes(".tmp-"))).toEqual([]);
      }),
      { seed: 14, numRuns: 24 },
    );
  });
});
