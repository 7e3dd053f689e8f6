/** Helpers for the Slurm tests: is a cluster there, write the scripts, submit them, wait for the jobs. */
import { spawnSync } from "node:child_process";
import { chmodSync, existsSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { SLURM_FILES, type SlurmScripts } from "../../harness/cluster/slurm.js";

/** Folder where .ci/slurm-setup.sh keeps its daemons' logs (same variable and default as the script). */
const SETUP_STATE = process.env.SB_SLURM_STATE ?? "/var/spool/speedbound-slurm";

function run(cmd: string, args: ReadonlyArray<string>, timeoutMs = 10_000): { code: number | null; out: string; err: string } {
  const r = spawnSync(cmd, args, { encoding: "utf8", timeout: timeoutMs });
  return { code: r.status, out: r.stdout ?? "", err: r.error ? String(r.error) : (r.stderr ?? "") };
}

/**
 * Whether a Slurm cluster takes jobs here: `sinfo` answers within 5 s and some node is idle or mixed.
 * `why` says what was seen, for the skip message.
 */
export function slurmCluster(): { readonly up: boolean; readonly why: string } {
  const r = run("sinfo", ["-h", "-o", "%T"], 5_000);
  if (r.code !== 0) return { up: false, why: /ETIMEDOUT/.test(r.err) ? "sinfo gave no answer within 5 s" : `sinfo failed (${(r.err || `exit ${r.code}`).trim().split("\n")[0]})` };
  const states = r.out.split(/\s+/).filter((s) => s !== "");
  if (!states.some((s) => s === "idle" || s === "mixed")) return { up: false, why: `no idle or mixed node (sinfo: ${states.join(", ") || "nothing"})` };
  return { up: true, why: `node states: ${states.join(", ")}` };
}

/** Writes the three scripts into `dir` under their expected names, executable. */
export function writeScripts(dir: string, scripts: SlurmScripts): void {
  for (const key of ["array", "merge", "submit"] as const) {
    const file = join(dir, SLURM_FILES[key]);
    writeFileSync(file, scripts[key]);
    chmodSync(file, 0o755);
  }
}

/** Runs the submit script; returns the two job ids it printed. Throws with its output when it fails. */
export function submit(dir: string): { readonly arrayId: string; readonly mergeId: string; readonly stdout: string } {
  const r = run("bash", [join(dir, SLURM_FILES.submit)], 30_000);
  const arrayId = /^array job: (\d+)/m.exec(r.out)?.[1];
  const mergeId = /^merge job: (\d+)/m.exec(r.out)?.[1];
  if (r.code !== 0 || arrayId === undefined || mergeId === undefined) {
    throw new Error(`submit.sh failed (exit ${r.code})\nstdout:\n${r.out}\nstderr:\n${r.err}`);
  }
  return { arrayId, mergeId, stdout: r.out };
}

/** `scontrol show job ID` (every array task of it); empty when the controller has forgotten the job. */
export function showJob(id: string): string {
  return run("scontrol", ["show", "job", id]).out;
}

/** Each job state in `scontrol show job ID` (one per array task). */
export function jobStates(id: string): string[] {
  return [...showJob(id).matchAll(/JobState=(\S+)/g)].map((m) => m[1]);
}

/** Everything useful when jobs did not end as expected: queue, job records, job logs, daemon log tails. */
export function diagnostics(ids: ReadonlyArray<string>, logsDir: string): string {
  const parts = [`squeue:\n${run("squeue", []).out}`];
  for (const id of ids) parts.push(`scontrol show job ${id}:\n${showJob(id)}`);
  if (existsSync(logsDir)) {
    for (const f of readdirSync(logsDir).sort()) parts.push(`log ${f}:\n${readFileSync(join(logsDir, f), "utf8").slice(-4000)}`);
  } else parts.push(`(no logs folder ${logsDir})`);
  for (const f of ["slurmctld.log", "slurmd.log"]) {
    const path = join(SETUP_STATE, "log", f);
    if (existsSync(path) && statSync(path).isFile()) parts.push(`${path} (last lines):\n${readFileSync(path, "utf8").split("\n").slice(-30).join("\n")}`);
  }
  return parts.join("\n\n");
}

/**
 * Polls squeue until none of the jobs (array tasks included) is pending or running, at most `timeoutMs`.
 * Throws with the diagnostics when time runs out.
 */
export async function waitForJobs(ids: ReadonlyArray<string>, timeoutMs: number, logsDir: string): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    // squeue lists only jobs that are not finished; an id it no longer knows at all is finished too.
    const pending = ids.filter((id) => {
      const r = run("squeue", ["-h", "-j", id, "-o", "%i %T"]);
      if (/Invalid job id/i.test(r.err)) return false;
      return r.code !== 0 || r.out.trim() !== "";
    });
    if (pending.length === 0) return;
    if (Date.now() > deadline) {
      throw new Error(`Slurm jobs ${ids.join(", ")} not finished after ${timeoutMs / 1000} s\n\n${diagnostics(ids, logsDir)}`);
    }
    await new Promise((done) => setTimeout(done, 1000));
  }
}
