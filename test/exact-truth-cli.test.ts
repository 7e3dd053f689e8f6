/**
 * Ground truth beyond enumeration through the CLI (issue 16): `solve FILE --json` counts at n = 50 and beyond,
 * studies above the switch size (n > 30) record `truth_method`, `--satisfiable`/`--unique` are decided by the
 * counter, `--cell-limit` censors a count that cannot finish, and a folder study of SATLIB uf50-218/uuf50-218
 * files runs. Reference values: Debian's clasp (model enumeration and optimal-model enumeration).
 */
import { copyFileSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { ksatFamily } from "../harness/families/ksat.js";
import { parseDimacs, writeDimacs } from "../harness/formats/dimacs.js";
import { cnfFromClauses, type Cnf } from "../harness/model/cnf.js";
import { readFileSync } from "node:fs";
import { cli, readCsv } from "./helpers/cli.js";
import { HAVE_CLASP, claspMaxsat, claspModelCount } from "./helpers/clasp.js";
import { HAVE_SATLIB, SATLIB_DIR } from "./helpers/paths.js";

const root = mkdtempSync(join(tmpdir(), "sb-exact-truth-"));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function column(csv: { header: string[]; rows: string[][] }, name: string): string[] {
  const i = csv.header.indexOf(name);
  if (i < 0) throw new Error(`no column ${name}`);
  return csv.rows.map((r) => r[i]);
}

function planted(n: number, seed: string): Cnf {
  const p = ksatFamily.generate(seed, { k: 3, density: 4.2, planted: true, satisfiable: false, unique: false }, n, 0).problem;
  if (p.kind !== "cnf") throw new Error("expected CNF");
  return p.cnf;
}

describe("solve FILE --json beyond enumeration", () => {
  it.skipIf(!HAVE_CLASP)("counts a planted 3-SAT formula with n = 60 exactly as clasp enumerates it", () => {
    const cnf = planted(60, "exact-cli-60");
    const file = join(root, "p60.cnf");
    writeFileSync(file, writeDimacs(cnf));
    const r = cli(["solve", file, "--json"]);
    expect(r.code, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout) as { optimum: number; degeneracy: number | string; method: string; satisfiable: boolean };
    expect(out.method).toBe("count");
    expect(out.optimum).toBe(0);
    expect(BigInt(out.degeneracy)).toBe(claspModelCount(cnf));
  });

  it("prints counts beyond 2^53 exactly (2^120 for a formula without clauses on 120 variables)", () => {
    const file = join(root, "free120.cnf");
    writeFileSync(file, writeDimacs(cnfFromClauses(120, [[1, -1]])));
    const r = cli(["solve", file, "--json"]);
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).degeneracy).toBe((2n ** 120n).toString()); // every assignment satisfies a tautology
  });

  it("refuses a formula beyond the limit in one line, exit 2", () => {
    const file = join(root, "big.cnf");
    writeFileSync(file, writeDimacs(cnfFromClauses(201, [[1, 2, 3]])));
    const r = cli(["solve", file, "--json"]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/n = 201 is beyond the exact ground-truth limit of 200 \(the largest n an exact solver accepts: count\)/);
  });
});

describe("studies above the switch size", () => {
  it.skipIf(!HAVE_CLASP)("--satisfiable at n = 36 and --unique at n = 32: counted truth, recorded as such, equal to clasp", () => {
    for (const [flag, n] of [["--satisfiable", 36], ["--unique", 32]] as Array<[string, number]>) {
      const out = join(root, `study${flag}`);
      const r = cli(["run", "--family", "ksat", "--n", String(n), "--instances", "2", flag, "--seed", "exact-cli", "--solvers", "exhaustive", "--predict", "grover", "--out", out]);
      expect(r.code, r.stderr).toBe(0);
      const inst = readCsv(join(out, "instances.csv"));
      expect(column(inst, "truth_method")).toEqual(["count", "count"]);
      expect(column(inst, "satisfiable")).toEqual(["true", "true"]);
      const degeneracies = column(inst, "degeneracy");
      const params = { k: 3, density: 4.267, planted: false, satisfiable: true, unique: flag === "--unique" };
      for (let i = 0; i < 2; i++) {
        const p = ksatFamily.generate("exact-cli", params, n, i).problem;
        if (p.kind !== "cnf") throw new Error("expected CNF");
        expect(BigInt(degeneracies[i])).toBe(claspModelCount(p.cnf));
        if (flag === "--unique") expect(degeneracies[i]).toBe("1");
      }
      const runs = readCsv(join(out, "runs.csv"));
      expect(column(runs, "solver")).toEqual(["count", "count"]);
      expect(column(readCsv(join(out, "predictions.csv")), "optima")).toEqual(degeneracies);
    }
  }, 120_000);

  it("--cell-limit censors a count that cannot finish (n = 200 at α = 4.26)", () => {
    const out = join(root, "censored");
    const r = cli(["run", "--family", "ksat", "--n", "200", "--instances", "1", "--seed", "exact-cli", "--solvers", "exhaustive", "--predict", "grover", "--cell-limit", "300ms", "--out", out]);
    expect(r.code, r.stderr).toBe(0);
    const inst = readCsv(join(out, "instances.csv"));
    expect(column(inst, "status")).toEqual(["censored"]);
    expect(column(inst, "optimum")).toEqual([""]);
  }, 60_000);
});

describe.skipIf(!HAVE_SATLIB || !HAVE_CLASP)("folder study of SATLIB n = 50 files", () => {
  it("uf50-218 and uuf50-218 files: counts and MaxSAT optima equal clasp's", () => {
    const dir = join(root, "satlib50");
    mkdirSync(dir);
    const pick = (folder: string, count: number): string[] => readdirSync(join(SATLIB_DIR, folder)).filter((f) => f.endsWith(".cnf")).sort().slice(0, count);
    const names: string[] = [];
    for (const f of pick("uf50-218", 3)) copyFileSync(join(SATLIB_DIR, "uf50-218", f), join(dir, f)), names.push(join("uf50-218", f));
    for (const f of pick("uuf50-218", 2)) copyFileSync(join(SATLIB_DIR, "uuf50-218", f), join(dir, f)), names.push(join("uuf50-218", f));
    const out = join(root, "satlib50-out");
    const r = cli(["run", "--family", "cnf", "--from", dir, "--solvers", "exhaustive", "--predict", "grover,min-finding", "--out", out]);
    expect(r.code, r.stderr).toBe(0);
    const inst = readCsv(join(out, "instances.csv"));
    const files = column(inst, "file");
    const methods = column(inst, "truth_method");
    const optima = column(inst, "optimum");
    const degeneracies = column(inst, "degeneracy");
    files.forEach((file, i) => {
      const source = names.find((nm) => nm.endsWith(file)) as string;
      const cnf = parseDimacs(readFileSync(join(SATLIB_DIR, source), "utf8"), file);
      if (file.startsWith("uuf")) {
        const c = claspMaxsat(cnf);
        expect(methods[i]).toBe("maxsat");
        expect(Number(optima[i])).toBe(c.optimum);
        if (c.optimal !== null) expect(BigInt(degeneracies[i])).toBe(c.optimal);
      } else {
        expect(methods[i]).toBe("count");
        expect(optima[i]).toBe("0");
        expect(BigInt(degeneracies[i])).toBe(claspModelCount(cnf));
      }
    });
  }, 120_000);
});
