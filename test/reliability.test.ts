// Issue 14 "never abort, never hang, never mix": folders that cannot be made or written, bad input found as a new user
// would, versioned study folders, one writer per folder. Each failure is one line on stderr and exit code 2.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { execFileSync, spawnSync } from "node:child_process";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { cli, cliAsync } from "./helpers/cli.js";
import { STREAM_SCHEME } from "../harness/engine/build-info.js";

const TINY = ["--n", "6", "--instances", "2", "--trials", "5", "--sweeps", "10", "--predict", "grover", "--workers", "2", "--seed", "rel-1"];
let root = "";
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "speedbound-reliab-"));
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

/** One line on stderr, exit 2, matching `pattern`. */
function expectOneLine(r: ReturnType<typeof cli>, pattern: RegExp, code = 2): void {
  expect(r.code, r.stderr).toBe(code);
  const lines = r.stderr.trim().split("\n").filter((l) => !l.startsWith("speedbound: note:"));
  expect(lines, r.stderr).toHaveLength(1);
  expect(lines[0]).toMatch(pattern);
  expect(r.stderr).not.toMatch(/\n\s+at /); // never a stack trace
}

describe("folders that cannot be created or written", () => {
  // /proc answers ENOENT to mkdir although /proc exists; Node's recursive mkdir retried that forever.
  const places: Array<[string, string[], RegExp]> = [
    ["run --out", ["run", ...TINY, "--out", "/proc/speedbound-x/y"], /^speedbound: --out: '\/proc\/speedbound-x\/y': cannot create/],
    ["slurm --out", ["slurm", ...TINY.filter((a, i, all) => a !== "--workers" && all[i - 1] !== "--workers"), "--shards", "2", "--out", "/proc/speedbound-x"], /^speedbound: --out: '\/proc\/speedbound-x\/slurm': cannot create/],
  ];
  for (const [name, args, pattern] of places) {
    it(`${name} under /proc: one line, exit 2, within seconds (no spinning mkdir)`, () => {
      const started = Date.now();
      const r = cli(args);
      expectOneLine(r, pattern);
      expect(Date.now() - started).toBeLessThan(10_000); // a process start plus the check; it used to spin forever
    });
  }

  it("merge into /proc: one line, exit 2", () => {
    const shard = join(root, "merge-src");
    expect(cli(["run", ...TINY, "--out", shard]).code).toBe(0);
    expectOneLine(cli(["merge", "/proc/speedbound-m", shard]), /^speedbound: merge: '\/proc\/speedbound-m': cannot create/);
  });

  it("report on a read-only folder: one line, exit 2, no stack (read-only tmpfs as root, chmod otherwise)", (ctx) => {
    const dir = join(root, "ro");
    mkdirSync(dir);
    const asRoot = process.getuid?.() === 0;
    if (asRoot) {
      const m = spawnSync("mount", ["-t", "tmpfs", "-o", "size=4m", "tmpfs", dir]);
      if (m.status !== 0) return ctx.skip("mount not permitted here: read-only report case not checked");
    }
    try {
      const study = join(dir, "s");
      expect(cli(["run", ...TINY, "--out", study]).code).toBe(0);
      if (asRoot) execFileSync("mount", ["-o", "remount,ro", dir]);
      else execFileSync("chmod", ["-R", "a-w", study]);
      expectOneLine(cli(["report", study]), /^speedbound: report: '.*\/s': cannot write \((read-only file system, EROFS|permission denied, EACCES)\)/);
    } finally {
      if (asRoot) spawnSync("umount", [dir]);
      else spawnSync("chmod", ["-R", "u+w", dir]);
    }
  });
});

describe("bad input: one line, exit 2", () => {
  const cases: Array<[string, string[], RegExp]> = [
    ["missing value of --seed", ["run", "--seed"], /^speedbound: --seed: needs a value$/],
    ["missing value of --out", ["run", "--n", "6", "--out"], /^speedbound: --out: needs a value$/],
    ["missing value of --n", ["run", "--n"], /^speedbound: --n: needs a value$/],
    ["missing value of --family", ["run", "--family"], /^speedbound: --family: needs a value$/],
    ["repeated --out", ["run", "--out", "A", "--out", "B"], /^speedbound: --out: given more than once/],
    ["repeated --seed (also as --seed=)", ["run", "--seed", "1", "--seed=2"], /^speedbound: --seed: given more than once/],
    ["repeated -n as --n", ["run", "-n", "10", "--n", "12"], /^speedbound: --n: given more than once/],
    ["an older spelling repeats its new name", ["run", "--b-scan", "0:1:0.5", "--spectral-b-scan", "0:1:0.5"], /^speedbound: --spectral-b-scan: given more than once/],
    ["repeated --cell-limit as --cellLimit", ["run", "--cell-limit", "1s", "--cellLimit", "2s"], /^speedbound: --cell-limit: given more than once/],
    ["unknown command", ["rn"], /^speedbound: unknown command 'rn' \(did you mean run\?\); commands: run, demo, solve, instance, report, spectral, adiabatic, merge, compare, slurm, cost$/],
  ];
  for (const [name, args, pattern] of cases) {
    it(name, () => {
      const r = cli(args);
      expectOneLine(r, pattern);
      expect(existsSync(join(process.cwd(), "A,B"))).toBe(false);
    });
  }

  it("instance without --n uses the default shown by --help (20)", () => {
    // The option table gives `instance` its own default (harness/cli/options.ts, commandDefaults); --help shows it.
    const help = cli(["instance", "--help"]);
    expect(help.code).toBe(0);
    expect(help.stdout).toMatch(/-n\b[^\n]*\[default: 20\]/);
    const r = cli(["instance"]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/^p cnf 20 /m);
  });

  it("spectral refuses a malformed --b-scan", () => {
    const file = join(root, "g.cnf");
    writeFileSync(file, "p cnf 2 1\n1 2 0\n");
    expectOneLine(cli(["spectral", file, "--b-scan", "garbage"]), /^speedbound: --spectral-b-scan: 'garbage' is not FROM:TO:STEP/);
  });

  it("spectral honours --b-scan: one result per b", () => {
    const file = join(root, "s.cnf");
    writeFileSync(file, "p cnf 4 3\n1 2 0\n-1 3 0\n-3 -4 0\n");
    const r = cli(["spectral", file, "--b-scan", "0.5:1.5:0.5", "--json"]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout.trim().split("\n").map((l) => (JSON.parse(l) as { b: number }).b)).toEqual([0.5, 1, 1.5]);
  });

  it("--n 10:11:3 says that it runs one size", () => {
    const r = cli(["run", "--n", "6:7:3", "--instances", "1", "--trials", "4", "--sweeps", "10", "--predict", "grover", "--workers", "2", "--out", join(root, "onesize")]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/note: --n 6:7:3 runs one size \(6\): the step does not reach 7/);
  });

  it("a folder study beyond the exact limit names the file", () => {
    const dir = join(root, "big");
    mkdirSync(dir);
    writeFileSync(join(dir, "a.cnf"), "p cnf 3 1\n1 2 3 0\n");
    // CNF ground truth is counted up to n = 200 (issue 16), so the too-large file has 250 variables.
    writeFileSync(join(dir, "b.cnf"), "p cnf 250 1\n1 2 250 0\n");
    expectOneLine(cli(["run", "--family", "cnf", "--from", dir, "--out", join(root, "bigout")]), /^speedbound: --from: .*b\.cnf: n = 250 is beyond the exact ground-truth limit of 200/);
  });

  it("an unmeetable --satisfiable filter: one line naming the density (2000 draws)", () => {
    const r = cli(["run", "--n", "5", "--density", "30", "--satisfiable", "--instances", "1", "--workers", "2", "--out", join(root, "unsat")]);
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/--satisfiable: no satisfiable formula in 2000 draws at n = 5, --density 30 \(k = 3\); lower --density/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it("--budget holds while formulas are redrawn (censored, not a long spin)", () => {
    const started = Date.now();
    const r = cli(["run", "--n", "5", "--density", "30", "--satisfiable", "--instances", "1", "--workers", "2", "--budget", "1ms", "--out", join(root, "budgeted")]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/censored by limits|skipped/);
    expect(Date.now() - started).toBeLessThan(30_000);
  });
});

describe("versioned study folders and manifest", () => {
  it("spec.json records tool version and stream scheme; manifest records every resolved option, version and commit", () => {
    const dir = join(root, "stamped");
    expect(cli(["run", ...TINY, "--budget", "10m", "--cell-limit", "1m", "--out", dir]).code).toBe(0);
    const spec = JSON.parse(readFileSync(join(dir, "spec.json"), "utf8")) as { build: { version: string; stream_scheme: number } };
    const pkg = JSON.parse(readFileSync(join(process.cwd(), "package.json"), "utf8")) as { version: string };
    expect(spec.build.version).toBe(pkg.version);
    expect(spec.build.stream_scheme).toBe(STREAM_SCHEME);
    const manifest = JSON.parse(readFileSync(join(dir, "manifest.json"), "utf8")) as Record<string, unknown> & { options: Record<string, unknown> };
    expect(manifest.version).toBe(pkg.version);
    expect(manifest).toHaveProperty("git_commit");
    expect(manifest.budget_ms).toBe(600_000);
    expect(manifest.cell_limit_ms).toBe(60_000);
    expect(manifest.options.budget).toBe("10m");
    expect(manifest.options.seed).toBe("rel-1");
    expect(manifest.options.k).toBe(3); // a default, recorded as it took effect
    expect(manifest.stream_scheme).toBe(STREAM_SCHEME);
  });

  it("resuming a folder of another stream scheme is refused naming both; compare notes different streams", () => {
    const dir = join(root, "old-scheme");
    expect(cli(["run", ...TINY, "--out", dir]).code).toBe(0);
    const copy = join(root, "new-scheme");
    expect(cli(["run", ...TINY, "--out", copy]).code).toBe(0);
    const path = join(dir, "spec.json");
    const spec = JSON.parse(readFileSync(path, "utf8")) as { build: { stream_scheme: number } };
    spec.build.stream_scheme = STREAM_SCHEME - 1;
    writeFileSync(path, JSON.stringify(spec, null, 2) + "\n");
    expectOneLine(cli(["run", ...TINY, "--out", dir]), new RegExp(`stream scheme ${STREAM_SCHEME - 1}\\).*stream scheme ${STREAM_SCHEME}\\), whose random streams differ`));
    const c = cli(["compare", dir, copy]);
    expect(c.stdout).toMatch(/different random streams \(old: speedbound .* \(stream scheme 1\); new: speedbound .* \(stream scheme 2\)\)/);
  });
});

describe("one writer per folder", () => {
  it("a second run into a busy folder is refused; a killed run's lock does not stick; the journal is not interleaved", async () => {
    const dir = join(root, "locked");
    const study = ["--n", "12:16:2", "--instances", "6", "--trials", "400", "--sweeps", "30,100", "--workers", "1", "--seed", "lock-1"];
    const first = cliAsync(["run", ...study, "--out", dir]);
    const exited = new Promise<void>((resolve) => first.on("exit", () => resolve()));
    const deadline = Date.now() + 60_000;
    while (!existsSync(join(dir, ".lock")) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 10));
    const second = cli(["run", ...study, "--out", dir]);
    expectOneLine(second, new RegExp(`--out: '.*locked' is in use by another speedbound run \\(pid ${first.pid} `));
    first.kill("SIGKILL"); // dies holding the lock
    await exited;
    expect(existsSync(join(dir, ".lock"))).toBe(true);
    const third = cli(["run", ...study, "--out", dir]);
    expect(third.code, third.stderr).toBe(0);
    expect(readdirSync(dir).filter((f) => f.startsWith(".lock"))).toEqual([]);
    const keys = readFileSync(join(dir, "journal.jsonl"), "utf8").trim().split("\n").map((l) => (JSON.parse(l) as { key: string }).key);
    expect(new Set(keys).size).toBe(keys.length); // every line whole and no cell twice
  });
});
