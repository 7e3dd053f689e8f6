/**
 * The Slurm scripts as text and as bash runs them: directives, the exact argv each job hands to the CLI
 * (through a stub CLI that records it), the merge dependency in submit.sh (through a stub sbatch), quoting
 * of awkward values, and a syntax check of all three scripts. No Slurm needed.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync, chmodSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { SLURM_FILES, shellQuote, slurmScripts, type SlurmOptions } from "../harness/cluster/slurm.js";
import { InputError } from "../harness/errors.js";
import { writeScripts } from "./helpers/slurm.js";

const tmp = mkdtempSync(join(tmpdir(), "sb-slurm-script-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

/** A CLI stand-in: writes its argv and working folder as JSON into $ARGV_LOG (one line per call). */
const stubCli = join(tmp, "stub-cli.mjs");
writeFileSync(
  stubCli,
  `import { appendFileSync } from "node:fs";\nappendFileSync(process.env.ARGV_LOG, JSON.stringify({ args: process.argv.slice(2), cwd: process.cwd() }) + "\\n");\n`,
);

/** Words that bash would otherwise split, expand, glob or treat as syntax (POSIX shell grammar, XCU §2.2–2.6). */
const AWKWARD = [
  "",
  "two words",
  "tab\there",
  "line\nbreak",
  "it's",
  `say "hi"`,
  "$HOME",
  "${PATH}",
  "$(echo no)",
  "`echo no`",
  "a\\b",
  "*.cnf",
  "~",
  "!x",
  "#hash",
  "semi;colon|pipe&amp",
  "<in>out",
  "--looks-like-an-option",
  "x=y",
  "ünïcode ✓",
  "'",
  "''",
];

function bash(args: ReadonlyArray<string>, env: Record<string, string> = {}, input?: string) {
  return spawnSync("bash", args, { encoding: "utf8", env: { ...process.env, ...env }, input, timeout: 20_000 });
}

function readArgvLog(path: string): Array<{ args: string[]; cwd: string }> {
  return readFileSync(path, "utf8")
    .trimEnd()
    .split("\n")
    .map((l) => JSON.parse(l) as { args: string[]; cwd: string });
}

const base: SlurmOptions = {
  studyArgs: ["--family", "ksat", "--n", "8:12:2", "--instances", "3", "--seed", "5"],
  out: "/data/study-1",
  shards: 3,
  cpusPerTask: 4,
  node: process.execPath,
  cli: stubCli,
  jobName: "sb-study",
};

describe("shellQuote", () => {
  it("leaves plain words alone", () => {
    // Letters, digits and _@%+=:,./- carry no meaning for bash in argument position (POSIX XCU §2.2).
    for (const w of ["ksat", "8:12:2", "--n", "exhaustive,walk", "/a/b-c.d", "x=y", "1%"]) expect(shellQuote(w)).toBe(w);
  });

  it("brings every awkward word through bash unchanged", () => {
    // Reference: bash itself (printf '%s\0' prints each argument as the shell received it).
    const r = bash(["-c", `printf '%s\\0' ${AWKWARD.map(shellQuote).join(" ")}`]);
    expect(r.status).toBe(0);
    expect(r.stdout.split("\0").slice(0, -1)).toEqual(AWKWARD);
  });

  it("refuses a NUL, which no shell word can hold", () => {
    // C strings end at NUL, so no argv entry can contain one (POSIX exec).
    expect(() => shellQuote("a\0b")).toThrow(RangeError);
  });
});

describe("array script", () => {
  const s = slurmScripts({ ...base, time: "2:00:00", partition: "short", account: "proj1", memPerCpu: "2G" });
  const lines = s.array.split("\n");

  it("asks Slurm for one task per shard with the requested CPUs and limits", () => {
    // Expected lines: the sbatch options named in the issue, spelled as sbatch(1) documents them.
    for (const line of [
      "#SBATCH --array=1-3",
      "#SBATCH --cpus-per-task=4",
      "#SBATCH --job-name=sb-study",
      "#SBATCH --time=2:00:00",
      "#SBATCH --partition=short",
      "#SBATCH --account=proj1",
      "#SBATCH --mem-per-cpu=2G",
      "#SBATCH --output=/data/study-1/logs/%A_%a.out",
      "#SBATCH --requeue",
    ]) {
      expect(lines).toContain(line);
    }
  });

  it("puts every directive before the first command (sbatch stops reading them there)", () => {
    // sbatch(1): directives after the first non-comment, non-blank line are ignored.
    const firstCommand = lines.findIndex((l, i) => i > 0 && l.trim() !== "" && !l.startsWith("#"));
    const lastDirective = lines.map((l) => l.startsWith("#SBATCH")).lastIndexOf(true);
    expect(firstCommand).toBeGreaterThan(lastDirective);
  });

  it("leaves optional directives out when they are not given", () => {
    // Expected: absent options fall back to the site's defaults, so no line is written for them.
    const plain = slurmScripts(base).array;
    for (const opt of ["--time", "--partition", "--account", "--mem-per-cpu"]) expect(plain).not.toContain(`#SBATCH ${opt}`);
  });

  it("hands task K exactly: the study options, --shard K/N, its own folder, workers = CPUs per task", () => {
    const studyArgs = ["--family", "ksat", "--seed", ...AWKWARD.slice(1), "--from", "rel dir"];
    const o = { ...base, studyArgs, out: join(tmp, "out 'q' \"d\" $HOME %A"), workDir: join(tmp, "work dir $x") };
    mkdirSync(o.workDir, { recursive: true });
    const dir = join(tmp, "scripts-a");
    mkdirSync(dir);
    writeScripts(dir, slurmScripts(o));
    const log = join(tmp, "argv-a.jsonl");
    const r = bash([join(dir, SLURM_FILES.array)], { ARGV_LOG: log, SLURM_ARRAY_TASK_ID: "2", SLURM_CPUS_PER_TASK: "4" });
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    // Expected argv: the interface contract of slurmScripts (brief of issue 7), element for element.
    expect(readArgvLog(log)).toEqual([{ args: ["run", ...studyArgs, "--shard", "2/3", "--out", `${o.out}/shards/2`, "--workers", "4"], cwd: o.workDir }]);
  });

  it("falls back to --cpus-per-task for the workers when Slurm does not export it", () => {
    const dir = join(tmp, "scripts-b");
    mkdirSync(dir);
    writeScripts(dir, slurmScripts({ ...base, cpusPerTask: 3 }));
    const log = join(tmp, "argv-b.jsonl");
    const env: NodeJS.ProcessEnv = { ...process.env, ARGV_LOG: log, SLURM_ARRAY_TASK_ID: "1" };
    delete env.SLURM_CPUS_PER_TASK;
    const r = spawnSync("bash", [join(dir, SLURM_FILES.array)], { encoding: "utf8", env, timeout: 20_000 });
    expect(r.status).toBe(0);
    // Expected: the value given as cpusPerTask (3).
    expect(readArgvLog(log)[0].args.slice(-6)).toEqual(["--shard", "1/3", "--out", "/data/study-1/shards/1", "--workers", "3"]);
  });

  it("refuses to run outside a job array, naming the reason", () => {
    const dir = join(tmp, "scripts-c");
    mkdirSync(dir);
    writeScripts(dir, slurmScripts(base));
    const env: NodeJS.ProcessEnv = { ...process.env, ARGV_LOG: join(tmp, "argv-c.jsonl") };
    delete env.SLURM_ARRAY_TASK_ID;
    const r = spawnSync("bash", [join(dir, SLURM_FILES.array)], { encoding: "utf8", env, timeout: 20_000 });
    expect(r.status).not.toBe(0);
    expect(r.stderr).toContain("job array");
    expect(existsSync(join(tmp, "argv-c.jsonl"))).toBe(false);
  });
});

describe("directive quoting", () => {
  it("double-quotes awkward job names and log folders, with % doubled in the log pattern", () => {
    // Expected spelling: sbatch (slurm-wlm 22.05.8, checked on a local cluster) reads #SBATCH values with
    // double quotes and backslash escapes and no shell expansion; '%%' in an output pattern is a literal '%'
    // (sbatch(1), filename pattern). test/slurm-cluster.test.ts submits such values to a real cluster.
    const s = slurmScripts({ ...base, jobName: `my "job" $x`, out: "/data/a b%c" });
    expect(s.array.split("\n")).toContain(`#SBATCH --job-name="my \\"job\\" $x"`);
    expect(s.array.split("\n")).toContain(`#SBATCH --output="/data/a b%%c/logs/%A_%a.out"`);
    expect(s.merge.split("\n")).toContain(`#SBATCH --job-name="my \\"job\\" $x-merge"`);
    expect(s.merge.split("\n")).toContain(`#SBATCH --output="/data/a b%%c/logs/merge_%j.out"`);
  });
});

describe("merge script", () => {
  it("joins every shard folder by number into OUT, and is cancelled if a task fails", () => {
    const o = { ...base, out: join(tmp, "merged 'x' $y") };
    const s = slurmScripts(o);
    expect(s.merge).not.toContain("--array");
    // Expected: without it an afterok dependency that can never be met leaves the job pending (sbatch(1)).
    expect(s.merge.split("\n")).toContain("#SBATCH --kill-on-invalid-dep=yes");
    const dir = join(tmp, "scripts-m");
    mkdirSync(dir);
    writeScripts(dir, s);
    const log = join(tmp, "argv-m.jsonl");
    const r = bash([join(dir, SLURM_FILES.merge)], { ARGV_LOG: log });
    expect(r.status).toBe(0);
    // Expected argv: `merge OUT OUT/shards/1 … OUT/shards/N` (interface contract of issue 7).
    expect(readArgvLog(log)[0].args).toEqual(["merge", o.out, `${o.out}/shards/1`, `${o.out}/shards/2`, `${o.out}/shards/3`]);
  });
});

describe("submit script", () => {
  it("submits the array, then the merge with afterok on the array's id, and prints both ids", () => {
    const o = { ...base, out: join(tmp, "submitted $z 'q'") };
    const dir = join(tmp, "scripts s");
    mkdirSync(dir);
    writeScripts(dir, slurmScripts(o));
    // A stand-in sbatch: records its arguments and answers as `sbatch --parsable` does ('id' or 'id;cluster').
    const bin = join(tmp, "bin");
    mkdirSync(bin);
    const calls = join(tmp, "sbatch-calls.jsonl");
    writeFileSync(
      join(bin, "sbatch"),
      `#!/usr/bin/env bash\nn=$(( $(cat "${calls}.count" 2>/dev/null || echo 0) + 1 )); echo $n > "${calls}.count"\n` +
        `ARGV_LOG="${calls}" "${process.execPath}" "${stubCli}" "$@"\nif [ $n -eq 1 ]; then echo '4101;ci'; else echo 4102; fi\n`,
    );
    chmodSync(join(bin, "sbatch"), 0o755);
    const r = bash([join(dir, SLURM_FILES.submit)], { PATH: `${bin}:${process.env.PATH ?? ""}` });
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    // Expected calls: the array first; then the merge depending on the array's id with the cluster suffix
    // stripped (sbatch(1): --parsable prints "jobid[;cluster_name]"; --dependency=afterok:job_id).
    expect(readArgvLog(calls).map((c) => c.args)).toEqual([
      ["--parsable", join(dir, SLURM_FILES.array)],
      ["--parsable", "--dependency=afterok:4101", join(dir, SLURM_FILES.merge)],
    ]);
    expect(r.stdout).toMatch(/^array job: 4101 /m);
    expect(r.stdout).toMatch(/^merge job: 4102 /m);
    expect(r.stdout).toContain(`tables: ${o.out}`);
    // Slurm opens log files before a job starts, so their folder must exist when sbatch is called.
    expect(existsSync(join(o.out, "logs"))).toBe(true);
  });
});

describe("all three scripts", () => {
  it("pass bash's syntax check", () => {
    const s = slurmScripts({ ...base, studyArgs: ["--seed", ...AWKWARD], jobName: `odd 'name' "x"`, out: "/d/a b%c", workDir: "/w d" });
    for (const key of ["array", "merge", "submit"] as const) {
      const r = bash(["-n"], {}, s[key]);
      // Reference: bash -n (parse without running) exits 0 only for a syntactically complete script.
      expect({ key, status: r.status, stderr: r.stderr }).toEqual({ key, status: 0, stderr: "" });
    }
  });
});

describe("bad values", () => {
  it.each<[string, Partial<SlurmOptions>, string]>([
    // Expected messages: each names the option at fault (DESIGN.md §6, one clear line per bad input).
    ["--out in the study options", { studyArgs: ["--out", "x"] }, "--out"],
    ["--shard=K/N in the study options", { studyArgs: ["--shard=1/2"] }, "--shard"],
    ["--workers in the study options", { studyArgs: ["--workers", "2"] }, "--workers"],
    ["a relative output folder", { out: "results/x" }, "--out"],
    ["a backslash in the output folder", { out: "/a\\b" }, "--out"],
    ["zero shards", { shards: 0 }, "--shards"],
    ["fractional CPUs", { cpusPerTask: 1.5 }, "--cpus-per-task"],
    ["a time Slurm cannot read", { time: "2 hours" }, "--time"],
    ["a memory size Slurm cannot read", { memPerCpu: "lots" }, "--mem-per-cpu"],
    ["a partition with a space", { partition: "a b" }, "--partition"],
    ["a job name with a line break", { jobName: "a\nb" }, "--job-name"],
    ["a relative node path", { node: "node" }, "node path"],
  ])("refuses %s", (_what, change, option) => {
    expect(() => slurmScripts({ ...base, ...change })).toThrow(InputError);
    expect(() => slurmScripts({ ...base, ...change })).toThrow(option);
  });
});
