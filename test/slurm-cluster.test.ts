/**
 * The job array on a real Slurm cluster (the one-node localhost cluster of .ci/slurm-setup.sh, or any cluster
 * whose `sinfo` answers): submits the generated scripts with submit.sh, waits for the array and the merge, and
 * checks the merged tables against a single-machine run of the same study. Skipped, with the reason, when no
 * cluster answers.
 */
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { slurmScripts } from "../harness/cluster/slurm.js";
import { CLI } from "./helpers/paths.js";
import { cli, isTimingColumn, readCsv } from "./helpers/cli.js";
import { diagnostics, jobStates, showJob, slurmCluster, submit, waitForJobs, writeScripts } from "./helpers/slurm.js";

const cluster = slurmCluster();
/** Set by .ci/run after .ci/slurm-setup.sh succeeded: then a silent cluster is a failure, not a skip. */
const required = process.env.SB_REQUIRE_SLURM === "1";
if (!cluster.up && !required) {
  console.warn(`slurm-cluster.test.ts skipped: no Slurm cluster answers here (${cluster.why}); start one with 'bash .ci/slurm-setup.sh'`);
}

/** Time allowed for the jobs of one submission to finish (the study itself takes seconds). */
const WAIT_MS = 180_000;

/** Columns filled from the clock, left out of the comparison. Anything else must match exactly. */
const TIMING = new Set(["wall_ns", "cpu_ns", "wall_ns_per_trial", "tts_ns", "tts_ns_low", "tts_ns_high", "floor_ns"]);

/** A table with the named columns dropped. */
function tableWithout(dir: string, file: string, drop: ReadonlySet<string>): string[][] {
  const { header, rows } = readCsv(join(dir, file));
  const keep = header.map((h, i) => (drop.has(h) ? -1 : i)).filter((i) => i >= 0);
  return [keep.map((i) => header[i]), ...rows.map((r) => keep.map((i) => r[i]))];
}

describe.skipIf(!cluster.up && !required)("Slurm job array on a live cluster", () => {
  const tmp = mkdtempSync(join(tmpdir(), "sb-slurm-cluster-"));
  let passed = 0;
  afterAll(() => {
    // Keep the folders of a failed run for a look; the failure message names them.
    if (passed === 3) rmSync(tmp, { recursive: true, force: true });
  });

  it.runIf(required)("finds the cluster that .ci/slurm-setup.sh started (SB_REQUIRE_SLURM=1)", () => {
    // Expected: an idle or mixed node, since the setup script waited for one before the tests began.
    expect(cluster.up, cluster.why).toBe(true);
  });

  it("carries awkward job names, folders and study options through sbatch unchanged", async () => {
    // A CLI stand-in records what each job hands it; the real CLI is exercised by the next test.
    const stub = join(tmp, "stub-cli.mjs");
    writeFileSync(
      stub,
      [
        'import { mkdirSync, writeFileSync } from "node:fs";',
        "const args = process.argv.slice(2);",
        'const out = args[0] === "merge" ? args[1] : args[args.indexOf("--out") + 1];',
        "mkdirSync(out, { recursive: true });",
        'writeFileSync(out + "/" + args[0] + "-argv.json", JSON.stringify({ args, cwd: process.cwd() }));',
        "",
      ].join("\n"),
    );
    const out = join(tmp, `odd out 'q' "d" $HOME %A`);
    const workDir = join(tmp, "work dir $x");
    mkdirSync(workDir);
    const studyArgs = ["--seed", `it's "quoted" $HOME \`x\` ; | & * ~ #`, "--from", "rel dir"];
    const jobName = `sb "q" $x 'y' #z`;
    const scripts = join(tmp, "scripts-stub");
    mkdirSync(scripts);
    writeScripts(scripts, slurmScripts({ studyArgs, out, shards: 3, cpusPerTask: 1, node: process.execPath, cli: stub, jobName, workDir }));
    const { arrayId, mergeId } = submit(scripts);
    console.log(`slurm stub run: array job ${arrayId}, merge job ${mergeId}`);
    await waitForJobs([arrayId, mergeId], WAIT_MS, join(out, "logs"));
    const why = (): string => `\n${diagnostics([arrayId, mergeId], join(out, "logs"))}`;

    // Expected: every task and the merge completed (scontrol keeps finished jobs for MinJobAge = 300 s).
    expect(jobStates(arrayId), why()).toEqual(["COMPLETED", "COMPLETED", "COMPLETED"]);
    expect(jobStates(mergeId), why()).toEqual(["COMPLETED"]);
    // Expected: the name as given (sbatch read the quoted directive back to the original text).
    expect(/JobName=(.*)$/m.exec(showJob(arrayId))?.[1]).toBe(jobName);
    expect(/JobName=(.*)$/m.exec(showJob(mergeId))?.[1]).toBe(`${jobName}-merge`);
    // Expected: one log per task under the literal folder name ('%A' in it was not expanded by Slurm).
    expect(readdirSync(join(out, "logs")).sort()).toEqual([`${arrayId}_1.out`, `${arrayId}_2.out`, `${arrayId}_3.out`, `merge_${mergeId}.out`]);
    for (let k = 1; k <= 3; k++) {
      const seen = JSON.parse(readFileSync(join(out, "shards", String(k), "run-argv.json"), "utf8")) as { args: string[]; cwd: string };
      // Expected argv: the interface contract of slurmScripts (issue 7); workers = --cpus-per-task = 1.
      expect(seen).toEqual({ args: ["run", ...studyArgs, "--shard", `${k}/3`, "--out", join(out, "shards", String(k)), "--workers", "1"], cwd: workDir });
    }
    const merged = JSON.parse(readFileSync(join(out, "merge-argv.json"), "utf8")) as { args: string[] };
    expect(merged.args).toEqual(["merge", out, ...[1, 2, 3].map((k) => join(out, "shards", String(k)))]);
    passed++;
  }, WAIT_MS + 30_000);

  it("cancels the merge instead of leaving it pending when an array task fails", async () => {
    // A CLI stand-in that fails shard 2 on purpose (exit 3) and succeeds elsewhere.
    const failing = join(tmp, "fail-cli.mjs");
    writeFileSync(failing, 'if (process.argv.includes("2/3")) { console.error("shard 2 fails on purpose"); process.exit(3); }\n');
    const out = join(tmp, "failing");
    const scripts = join(tmp, "scripts-fail");
    mkdirSync(scripts);
    writeScripts(scripts, slurmScripts({ studyArgs: [], out, shards: 3, cpusPerTask: 1, node: process.execPath, cli: failing, jobName: "sb-fail-test" }));
    const { arrayId, mergeId } = submit(scripts);
    await waitForJobs([arrayId, mergeId], WAIT_MS, join(out, "logs"));
    const why = (): string => `\n${diagnostics([arrayId, mergeId], join(out, "logs"))}`;
    // Expected: one FAILED task (exit 3), two COMPLETED; the merge CANCELLED by --kill-on-invalid-dep
    // (sbatch(1): a dependency that can never be satisfied cancels the job when that option is set).
    expect(jobStates(arrayId).sort(), why()).toEqual(["COMPLETED", "COMPLETED", "FAILED"]);
    expect(jobStates(mergeId), why()).toEqual(["CANCELLED"]);
    expect(readFileSync(join(out, "logs", `${arrayId}_2.out`), "utf8")).toContain("shard 2 fails on purpose");
    passed++;
  }, WAIT_MS + 30_000);

  it("merges three shards into the same tables as a single-machine run (timing columns aside)", async () => {
    const study = ["--family", "ksat", "--n", "8:12:2", "--instances", "3", "--seed", "5", "--solvers", "exhaustive,walk", "--trials", "50", "--predict", "grover,amplified-walk"];
    const out = join(tmp, "array");
    const scripts = join(tmp, "scripts-study");
    mkdirSync(scripts);
    writeScripts(scripts, slurmScripts({ studyArgs: study, out, shards: 3, cpusPerTask: 1, node: process.execPath, cli: CLI, jobName: "sb-cluster-test" }));
    const started = Date.now();
    const { arrayId, mergeId } = submit(scripts);
    await waitForJobs([arrayId, mergeId], WAIT_MS, join(out, "logs"));
    console.log(`slurm study: array job ${arrayId} (3 shards) and merge job ${mergeId} finished in ${((Date.now() - started) / 1000).toFixed(1)} s`);
    const why = (): string => `\n${diagnostics([arrayId, mergeId], join(out, "logs"))}`;
    expect(jobStates(arrayId), why()).toEqual(["COMPLETED", "COMPLETED", "COMPLETED"]);
    expect(jobStates(mergeId), why()).toEqual(["COMPLETED"]);

    const single = join(tmp, "single");
    const r = cli(["run", ...study, "--out", single, "--workers", "2"]);
    expect(r.code, r.stderr).toBe(0);

    // Reference for every comparison below: the same study run on one machine (`speedbound run`).
    expect(readFileSync(join(out, "spec.json"), "utf8")).toBe(readFileSync(join(single, "spec.json"), "utf8"));
    expect(readFileSync(join(out, "instances.csv"), "utf8")).toBe(readFileSync(join(single, "instances.csv"), "utf8"));
    for (const file of ["runs.csv", "predictions.csv"]) {
      const header = readCsv(join(single, file)).header;
      // Guard on the choice of timing columns: any column the shared rule calls timing must be one we know
      // comes from the clock, so that no deterministic column escapes the comparison unnoticed.
      expect(header.filter(isTimingColumn).filter((h) => !TIMING.has(h)), `${file}: timing-like columns not in the known list`).toEqual([]);
      const a = tableWithout(out, file, TIMING);
      const b = tableWithout(single, file, TIMING);
      expect(a.length, `${file}: row count`).toBe(b.length);
      expect(a, file).toEqual(b);
    }
    // Expected: 3 sizes × 3 instances = 9 instances (the study's --n 8:12:2 and --instances 3).
    expect(readCsv(join(out, "instances.csv")).rows).toHaveLength(9);
    passed++;
  }, WAIT_MS + 120_000);
});
