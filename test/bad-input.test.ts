// Bad input, tried as a new user would: each mistake gives one line naming the option or file, exit code 2,
// and leaves no output folder behind.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { chmodSync, existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { cli } from "./helpers/cli.js";

let root = "";
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "speedbound-bad-"));
  mkdirSync(join(root, "empty"));
  mkdirSync(join(root, "wrongkind"));
  writeFileSync(join(root, "wrongkind", "a.cnf"), "this is not a formula\n");
  mkdirSync(join(root, "readonly"));
  chmodSync(join(root, "readonly"), 0o500);
  writeFileSync(join(root, "broken.cnf"), "p cnf 3 2\n1 -2 0\n3 x 0\n");
  writeFileSync(join(root, "notafolder"), "x");
});
afterAll(() => {
  chmodSync(join(root, "readonly"), 0o700);
  rmSync(root, { recursive: true, force: true });
});

const asRoot = process.getuid?.() === 0;

const cases: Array<{ name: string; args: (out: string) => string[]; pattern: RegExp; skip?: boolean }> = [
  { name: "non-numeric option", args: (o) => ["run", "--instances", "ten", "--out", o], pattern: /--instances: 'ten' is not a number/ },
  { name: "negative count", args: (o) => ["run", "--instances", "-3", "--out", o], pattern: /--instances: -3 is below the minimum 1/ },
  { name: "fractional count", args: (o) => ["run", "--trials", "2.5", "--out", o], pattern: /--trials: '2.5' is not a whole number/ },
  { name: "reversed range", args: (o) => ["run", "--n", "20:10", "--out", o], pattern: /--n: range 20:10 runs backwards/ },
  { name: "malformed range", args: (o) => ["run", "--n", "10-20", "--out", o], pattern: /--n: '10-20' is not FROM:TO\[:STEP\]/ },
  { name: "unknown family", args: (o) => ["run", "--family", "tsp", "--out", o], pattern: /--family: unknown family 'tsp'/ },
  { name: "unknown solver", args: (o) => ["run", "--solvers", "exhaustive,tabu", "--out", o], pattern: /--solvers: unknown value 'tabu'/ },
  { name: "unknown predictor", args: (o) => ["run", "--predict", "qaoa", "--out", o], pattern: /--predict: unknown value 'qaoa'/ },
  { name: "unknown option", args: (o) => ["run", "--sizes", "10", "--out", o], pattern: /unknown option --sizes/ },
  // issue 16: CNF ground truth is counted beyond enumeration, up to n = 200; spin families keep the enumeration limit.
  { name: "size beyond the exact limit", args: (o) => ["run", "--n", "190:210:10", "--out", o], pattern: /--n: size 210 is beyond the exact ground-truth limit of 200 for this family \(the largest n an exact solver accepts: count\)/ },
  { name: "spin size beyond the enumeration limit", args: (o) => ["run", "--family", "sk", "--n", "30:70:10", "--out", o], pattern: /--n: size 70 is beyond the exact ground-truth limit of 40 for this family \(the largest n an exact solver accepts: exhaustive\)/ },
  // 49 bytes per amplitude for 3-SAT (README, "Memory of the state-vector numerics"): 49·2^26 B + 16 MiB = 3.08 GiB.
  { name: "spectral beyond its memory allowance", args: (o) => ["run", "--family", "ksat", "--n", "20:26:2", "--predict", "spectral", "--spectral-memory", "1", "--out", o], pattern: /--predict: spectral at n = 26 needs 3\.08 GiB \(49 bytes per amplitude × 2\^26\), but --spectral-memory allows 1\.00 GiB/ },
  { name: "adiabatic beyond its memory allowance", args: (o) => ["run", "--family", "sk", "--n", "20:24:2", "--predict", "adiabatic", "--spectral-memory", "256MiB", "--out", o], pattern: /--predict: adiabatic at n = 24 needs 464\.0 MiB \(28 bytes per amplitude × 2\^24\), but --spectral-memory allows 256\.0 MiB/ },
  { name: "bad memory size", args: (o) => ["run", "--predict", "spectral", "--spectral-memory", "lots", "--out", o], pattern: /--spectral-memory: 'lots' is not a positive size/ },
  { name: "walk on a spin family", args: (o) => ["run", "--family", "sk", "--solvers", "walk", "--out", o], pattern: /--solvers: walk .* applies to k-SAT\/CNF families only/ },
  { name: "impossible regular graph", args: (o) => ["run", "--family", "maxcut", "--n", "7", "--degree", "3", "--out", o], pattern: /--n: no simple 3-regular graph on 7 vertices/ },
  // p-spin at p = 8, n = 40 has C(40, 8) ≈ 7.7·10^7 terms: refused at the edge (it used to pass and fail every cell).
  { name: "p-spin beyond its term limit", args: (o) => ["run", "--family", "pspin", "-p", "8", "--n", "40", "--out", o], pattern: /--n: size 40 with p = 8 has C\(40, 8\) = 76904685 terms/ },
  { name: "missing input folder", args: (o) => ["run", "--family", "cnf", "--from", join(root, "nope"), "--out", o], pattern: /--from: folder '.*nope' does not exist/ },
  { name: "input path is a file", args: (o) => ["run", "--family", "cnf", "--from", join(root, "notafolder"), "--out", o], pattern: /--from: '.*notafolder' is not a folder/ },
  { name: "empty input folder", args: (o) => ["run", "--family", "cnf", "--from", join(root, "empty"), "--out", o], pattern: /--from: folder '.*empty' has no \.cnf files/ },
  { name: "file of the wrong kind", args: (o) => ["run", "--family", "cnf", "--from", join(root, "wrongkind"), "--out", o], pattern: /a\.cnf:1: clause data before the 'p cnf' header/ },
  { name: "bad duration", args: (o) => ["run", "--budget", "soon", "--out", o], pattern: /--budget: 'soon' is not a duration/ },
  { name: "bad shard", args: (o) => ["run", "--shard", "4/3", "--out", o], pattern: /--shard: need 1 ≤ K ≤ N/ },
  { name: "broken file to solve", args: () => ["solve", join(root, "broken.cnf")], pattern: /broken\.cnf:3: non-numeric token 'x'/ },
  { name: "missing file to solve", args: () => ["solve", join(root, "absent.cnf")], pattern: /absent\.cnf: cannot read \(ENOENT\)/ },
  { name: "output folder under a file", args: () => ["run", "--n", "8", "--out", join(root, "notafolder", "sub")], pattern: /--out: '.*notafolder\/sub': cannot create \('.*notafolder' is a file, not a folder\)/ },
  // Root may write anywhere, so an unwritable folder cannot be made for root (the CI user).
  { name: "unwritable output folder", args: () => ["run", "--n", "8", "--out", join(root, "readonly", "sub")], pattern: /--out: '.*readonly\/sub': cannot create \(permission denied, EACCES\)/, skip: asRoot },
];

describe("bad input", () => {
  for (const c of cases) {
    it.skipIf(c.skip === true)(`${c.name}: one line, exit code 2, no output folder`, () => {
      const out = join(root, `out-${c.name.replace(/\W+/g, "-")}`);
      const r = cli(c.args(out));
      expect(r.code, r.stderr).toBe(2);
      const lines = r.stderr.trim().split("\n");
      expect(lines, r.stderr).toHaveLength(1);
      expect(lines[0]).toMatch(c.pattern);
      expect(existsSync(out)).toBe(false);
    });
  }
});
