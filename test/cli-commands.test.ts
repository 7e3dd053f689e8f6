// The commands a new user types first: solve, instance, cost, spectral, report and compare, through the
// compiled CLI.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, readFileSync, rmSync, writeFileSync, mkdirSync, cpSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { cli, readCsv } from "./helpers/cli.js";
import { HAVE_SATLIB, SATLIB_DIR } from "./helpers/paths.js";

let root = "";
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "speedbound-cli-"));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("instance and solve", () => {
  it("instance prints the same DIMACS bytes on every call, and solve reads them back", () => {
    const args = ["instance", "--family", "ksat", "--k", "3", "--n", "20", "--seed", "7", "--index", "3"];
    const a = cli(args);
    expect(a.code, a.stderr).toBe(0);
    expect(cli(args).stdout).toBe(a.stdout);
    expect(a.stdout).toMatch(/^p cnf 20 85$/m); // m = round(4.267·20) = 85 at the default density
    const file = join(root, "x.cnf");
    writeFileSync(file, a.stdout);
    const one = cli(["solve", file, "--json", "--workers", "1"]);
    const two = cli(["solve", file, "--json", "--workers", "2"]);
    expect(one.code, one.stderr).toBe(0);
    const r1 = JSON.parse(one.stdout);
    const r2 = JSON.parse(two.stdout);
    for (const key of ["variables", "clauses", "optimum", "degeneracy", "satisfiable", "wall_ns"]) expect(r1).toHaveProperty(key);
    expect(r1.variables).toBe(20);
    expect(r1.clauses).toBe(85);
    expect(r1.assignments).toBe(2 ** 20);
    // One part (2^20 < 2^22 configurations: planSlices keeps it whole), so solve computes it in its own thread
    // whatever --workers says, and reports the one thread it used (issue 16: no pool start-up for one part).
    expect(r2.workers).toBe(1);
    expect({ ...r2, wall_ns: 0, workers: 0 }).toEqual({ ...r1, wall_ns: 0, workers: 0 });
  });

  it("solve answers the pigeonhole formula PHP(3 pigeons, 2 holes) as unsatisfiable with optimum 1", () => {
    // PHP(3,2): 3 "pigeon p sits in some hole" clauses and 2·C(3,2) = 6 "no two pigeons share hole h" clauses.
    // Unsatisfiable by the pigeonhole principle; dropping one pigeon's clause leaves two pigeons in two holes,
    // which is satisfiable, so the minimum number of violated clauses is exactly 1.
    const v = (p: number, h: number) => p * 2 + h + 1;
    const clauses: number[][] = [];
    for (let p = 0; p < 3; p++) clauses.push([v(p, 0), v(p, 1)]);
    for (let h = 0; h < 2; h++) for (let p = 0; p < 3; p++) for (let q = p + 1; q < 3; q++) clauses.push([-v(p, h), -v(q, h)]);
    const file = join(root, "php.cnf");
    writeFileSync(file, `p cnf 6 ${clauses.length}\n${clauses.map((c) => `${c.join(" ")} 0`).join("\n")}\n`);
    const r = JSON.parse(cli(["solve", file, "--json"]).stdout);
    expect(r.satisfiable).toBe(false);
    expect(r.optimum).toBe(1);
  });

  it("instance writes coupling lists for spin families that solve reads", () => {
    const a = cli(["instance", "--family", "sk", "--n", "12", "--seed", "7"]);
    expect(a.code, a.stderr).toBe(0);
    const file = join(root, "sk.txt");
    writeFileSync(file, a.stdout);
    const r = JSON.parse(cli(["solve", file, "--json"]).stdout);
    expect(r.spins).toBe(12);
    expect(r.terms).toBe(66); // all pairs of 12 spins
    expect(r.degeneracy % 2).toBe(0); // mirror pairs: E(s) = E(−s) for pair couplings
    expect(r.optimum).toBeLessThan(0);
  });
});

describe("cost, spectral", () => {
  it("cost prints the model's assumptions with sources and the worked example", () => {
    const r = cli(["cost"]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/Toffoli time/);
    expect(r.stdout).toMatch(/arXiv:2011\.04149/);
    const changed = cli(["cost", "--toffoli-us", "10"]);
    expect(changed.stdout).toMatch(/10 us/);
  });

  it("spectral prints one JSON object with the ground-state numerics", () => {
    const inst = cli(["instance", "--family", "ksat", "--n", "10", "--seed", "7", "--planted"]);
    const file = join(root, "s.cnf");
    writeFileSync(file, inst.stdout);
    const r = cli(["spectral", file, "--b", "0.7", "--eta", "0.5", "--json"]);
    expect(r.code, r.stderr).toBe(0);
    const o = JSON.parse(r.stdout);
    for (const key of ["e0", "e1", "gap", "overlap_start", "overlap_opt", "rounds", "iterations", "residual", "wall_ns"]) expect(o).toHaveProperty(key);
    expect(o.e0).toBeLessThan(o.e1);
    expect(o.overlap_start).toBeGreaterThan(0);
    expect(o.overlap_start).toBeLessThanOrEqual(1);
  });

  it("adiabatic prints one JSON object with the minimum gap (unique 3-SAT instance)", () => {
    const inst = cli(["instance", "--family", "ksat", "--n", "9", "--seed", "7", "--unique"]);
    const file = join(root, "u.cnf");
    writeFileSync(file, inst.stdout);
    const r = cli(["adiabatic", file, "--adiabatic-grid", "11", "--json"]);
    expect(r.code, r.stderr).toBe(0);
    const o = JSON.parse(r.stdout);
    expect(o.n).toBe(9);
    expect(o.status).toBe("ok");
    expect(o.s_star).toBeGreaterThan(0);
    expect(o.s_star).toBeLessThan(1);
    expect(o.gap_min).toBeGreaterThan(0);
    expect(o.gap_min).toBeLessThan(1); // gap(0) = 1 on this path
    expect(o.solves).toBeGreaterThan(9); // the 9 interior grid points, then Brent
    expect(o.runtime_scale).toBeCloseTo(1 / o.gap_min ** 2, 9);
    expect(o).toHaveProperty("e0");
  });

  it("spectral with two threads sharing each product agrees with one thread (SK n = 17: 2^16 amplitudes, the team's threshold)", () => {
    const inst = cli(["instance", "--family", "sk", "--n", "17", "--seed", "7"]);
    const file = join(root, "t.txt");
    writeFileSync(file, inst.stdout);
    const [one, two] = ["1", "2"].map((t) => cli(["spectral", file, "--threads", t, "--json"]));
    expect(one.code, one.stderr).toBe(0);
    expect(two.code, two.stderr).toBe(0);
    const a = JSON.parse(one.stdout);
    const b = JSON.parse(two.stdout);
    expect(a.sector).toBe("symmetric");
    // Same products amplitude by amplitude; only the order of the wᵀv partial sums differs.
    for (const key of ["e0", "e1", "overlap_start", "overlap_opt"]) expect(Math.abs(a[key] - b[key])).toBeLessThan(1e-11);
  });

  it("spectral refuses an instance beyond --spectral-memory, naming both sizes", () => {
    const inst = cli(["instance", "--family", "ksat", "--n", "16", "--seed", "7"]);
    const file = join(root, "m.cnf");
    writeFileSync(file, inst.stdout);
    const r = cli(["spectral", file, "--spectral-memory", "2MiB"]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/spectral: n = 16 needs 19\.1 MiB \(49 bytes per amplitude × 2\^16\), but --spectral-memory allows 2\.0 MiB/);
  });
});

describe.skipIf(!HAVE_SATLIB)("a study over a folder of DIMACS files", () => {
  it("runs --family cnf --from DIR over SATLIB files and finds every uf20 file satisfiable", () => {
    const dir = join(root, "uf20");
    mkdirSync(dir);
    for (const f of ["uf20-01.cnf", "uf20-02.cnf", "uf20-03.cnf", "uf20-04.cnf"]) cpSync(join(SATLIB_DIR, "uf20-91", f), join(dir, f));
    cpSync(join(SATLIB_DIR, "original-format", "uf20-01.cnf"), join(dir, "uf20-01-original.cnf"));
    const out = join(root, "uf20-out");
    const r = cli(["run", "--family", "cnf", "--from", dir, "--solvers", "exhaustive,walk", "--trials", "50", "--predict", "grover", "--out", out]);
    expect(r.code, r.stderr).toBe(0);
    const { header, rows } = readCsv(join(out, "instances.csv"));
    expect(rows).toHaveLength(5);
    const sat = header.indexOf("satisfiable");
    for (const row of rows) expect(row[sat]).toBe("true"); // SATLIB: every uf20-91 formula is satisfiable
  });
});

describe("slurm", () => {
  it("writes the array, merge and submit scripts for a valid study, and refuses a bad one", () => {
    const out = join(root, "cluster");
    const r = cli(["slurm", "--family", "ksat", "--n", "8:12:2", "--instances", "2", "--shards", "3", "--cpus-per-task", "2", "--out", out]);
    expect(r.code, r.stderr).toBe(0);
    const array = readFileSync(join(out, "slurm", "array.sbatch"), "utf8");
    expect(array).toMatch(/#SBATCH --array=1-3/);
    expect(array).toMatch(/--shard "\$SLURM_ARRAY_TASK_ID\/3"/);
    expect(readFileSync(join(out, "slurm", "submit.sh"), "utf8")).toMatch(/afterok/);
    const bad = cli(["slurm", "--family", "ksat", "--n", "20:10", "--shards", "3", "--out", join(root, "cluster2")]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--n: range 20:10 runs backwards/);
  });
});

describe("report and compare", () => {
  it("report rebuilds the tables; compare finds no regression between a run and its copy, and flags changed ground truth", () => {
    const a = join(root, "night1");
    const study = ["run", "--family", "ksat", "--n", "8:14:2", "--instances", "4", "--seed", "nightly", "--solvers", "exhaustive,walk", "--trials", "40", "--predict", "grover"];
    expect(cli([...study, "--out", a]).code).toBe(0);
    const before = readFileSync(join(a, "instances.csv"), "utf8");
    rmSync(join(a, "instances.csv"));
    const rep = cli(["report", a, "--fit-from", "10"]);
    expect(rep.code, rep.stderr).toBe(0);
    expect(readFileSync(join(a, "instances.csv"), "utf8")).toBe(before);
    const b = join(root, "night2");
    cpSync(a, b, { recursive: true });
    const same = cli(["compare", a, b]);
    expect(same.code, same.stdout).toBe(0);
    // Corrupt one optimum in the copy's journal: the same seed can never give different ground truth.
    const journal = readFileSync(join(b, "journal.jsonl"), "utf8").split("\n");
    const i = journal.findIndex((l) => l.includes('"kind":"truth"'));
    const rec = JSON.parse(journal[i]);
    rec.optimum += 1;
    journal[i] = JSON.stringify(rec);
    writeFileSync(join(b, "journal.jsonl"), journal.join("\n"));
    const bad = cli(["compare", a, b]);
    expect(bad.code).toBe(1);
    expect(bad.stdout).toMatch(/REGRESSION\s+ground-truth/);
  });

  it("report records other settings (floor factor, cost model) in the manifest and captions; resume keeps the first start; seed-to-seed compare", () => {
    // Issue 13, items 9 and 10.
    const a = join(root, "settings");
    const study = ["run", "--family", "ksat", "--n", "8:12:2", "--instances", "3", "--seed", "s1", "--solvers", "exhaustive,walk", "--trials", "30", "--predict", "grover", "--resamples", "200"];
    expect(cli([...study, "--out", a]).code).toBe(0);
    const first = JSON.parse(readFileSync(join(a, "manifest.json"), "utf8"));
    const again = cli([...study, "--out", a]);
    expect(again.code, again.stderr).toBe(0);
    const second = JSON.parse(readFileSync(join(a, "manifest.json"), "utf8"));
    expect(second.started_at).toBe(first.started_at);
    expect(second.resumed_at).toHaveLength(1);
    const rep = cli(["report", a, "--floor-factor", "3", "--toffoli-us", "100"]);
    expect(rep.code, rep.stderr).toBe(0);
    const manifest = JSON.parse(readFileSync(join(a, "manifest.json"), "utf8"));
    expect(manifest.report_settings.floor_factor).toBe(3);
    expect(manifest.report_settings.cost_model.toffoliSeconds).toBeCloseTo(100e-6, 15);
    expect(manifest.report_settings.resamples).toBe(200); // not given: the study's own value stays
    for (const table of ["table.md", "table.tex"]) {
      const text = readFileSync(join(a, table), "utf8");
      expect(text).toContain("fixed-cost floor factor 3");
      expect(text).toContain("Toffoli time 100 us");
    }
    // Same study, another master seed: compared seed to seed, never a regression.
    const b = join(root, "settings-seed2");
    expect(cli([...study.map((x) => (x === "s1" ? "s2" : x)), "--out", b]).code).toBe(0);
    const cmp = cli(["compare", a, b]);
    expect(cmp.code, cmp.stdout + cmp.stderr).toBe(0);
    expect(cmp.stdout).toContain("seed-to-seed comparison");
    expect(cmp.stdout).toMatch(/seed s1: .*; seed s2: .*; (intervals overlap|intervals do not overlap|no intervals)/);
  });
});
