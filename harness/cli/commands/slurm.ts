/** `speedbound slurm`: sbatch scripts for a study as a Slurm job array plus a merge job. */
import { chmodSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { join, resolve } from "node:path";
import { EXIT, InputError } from "../../errors.js";
import { resolveStudy } from "../resolve.js";
import { writeFileAtomic } from "../../engine/files.js";
import { guardWrite } from "../../engine/fs-guard.js";
import { SLURM_FILES, slurmScripts } from "../../cluster/slurm.js";
import { type Args } from "./shared.js";
import { mkdirOrFail } from "./shared.js";

const SLURM_ONLY = ["shards", "cpus-per-task", "time", "partition", "account", "mem-per-cpu", "job-name", "out", "workers", "shard"];

/** `speedbound slurm …study options… --shards N`: writes the sbatch scripts of a job array and its merge. */
export async function slurm(argv: Args, rawArgs: ReadonlyArray<string>): Promise<number> {
  resolveStudy(argv); // refuse a bad study now, not on the cluster
  const shards = Number(argv.shards);
  if (!Number.isInteger(shards) || shards < 1) throw new InputError(`--shards: '${String(argv.shards)}' is not a whole number ≥ 1`);
  const cpus = Number(argv["cpus-per-task"] ?? 2);
  if (!Number.isInteger(cpus) || cpus < 1) throw new InputError(`--cpus-per-task: '${String(argv["cpus-per-task"])}' is not a whole number ≥ 1`);
  const out = resolve(String(argv.out ?? "results/latest"));
  const studyArgs = stripOptions(rawArgs.slice(1), SLURM_ONLY);
  const scripts = slurmScripts({
    studyArgs, out, shards, cpusPerTask: cpus,
    ...(argv["mem-per-cpu"] === undefined ? {} : { memPerCpu: String(argv["mem-per-cpu"]) }),
    ...(argv.time === undefined ? {} : { time: String(argv.time) }),
    ...(argv.partition === undefined ? {} : { partition: String(argv.partition) }),
    ...(argv.account === undefined ? {} : { account: String(argv.account) }),
    node: process.execPath,
    cli: fileURLToPath(new URL("./cli.js", import.meta.url)),
    jobName: String(argv["job-name"] ?? "speedbound"),
    workDir: process.cwd(),
  });
  const dir = join(out, "slurm");
  mkdirOrFail(dir, "--out");
  for (const [name, file] of Object.entries(SLURM_FILES) as Array<[keyof typeof SLURM_FILES, string]>) {
    writeFileAtomic(join(dir, file), scripts[name]);
    guardWrite("slurm", join(dir, file), () => chmodSync(join(dir, file), 0o755));
  }
  process.stdout.write(`speedbound: wrote ${Object.values(SLURM_FILES).map((f) => join(dir, f)).join(", ")}\n`);
  process.stdout.write(`speedbound: submit with: bash ${join(dir, SLURM_FILES.submit)}\n`);
  return EXIT.ok;
}

/** Removes `--name value` / `--name=value` pairs (and bare boolean flags of those names) from an argument list. */
function stripOptions(args: ReadonlyArray<string>, names: ReadonlyArray<string>): string[] {
  const out: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const m = /^--?([^=]+)(=.*)?$/.exec(args[i]);
    if (m && names.includes(m[1])) {
      if (m[2] === undefined && i + 1 < args.length && !args[i + 1].startsWith("--")) i++;
      continue;
    }
    out.push(args[i]);
  }
  return out;
}
