/**
 * Scale-out on a Slurm cluster: the text of three scripts that run a study as a job array (array task K runs
 * shard K of N), then merge the shard folders in a job that waits for every task to succeed.
 * Pure: builds strings and checks values; the `speedbound slurm` command writes the files.
 */
import { InputError } from "../errors.js";

/** What `speedbound slurm` knows when it writes the scripts. */
export interface SlurmOptions {
  /** The study options exactly as the user gave them (without --out, --shard or --workers, which the scripts set). */
  readonly studyArgs: ReadonlyArray<string>;
  /** Absolute output folder: shard K goes to `${out}/shards/K`, the merged tables to `${out}`, job logs to `${out}/logs`. */
  readonly out: string;
  /** Number of shards = array tasks (1 ≤ N; Slurm's MaxArraySize, 1001 by default, allows up to N = 1000). */
  readonly shards: number;
  /** CPUs per array task (`--cpus-per-task`); each task runs with `--workers $SLURM_CPUS_PER_TASK`. */
  readonly cpusPerTask: number;
  /** Memory per CPU as Slurm writes it (e.g. `2G`, `500M`); omitted: the site's default. */
  readonly memPerCpu?: string;
  /** Wall-clock limit per array task as Slurm writes it (`MM`, `HH:MM:SS`, `D-HH:MM`, …); omitted: the partition's. */
  readonly time?: string;
  /** Partition (comma list allowed); omitted: the cluster's default. */
  readonly partition?: string;
  /** Account to charge; omitted: the user's default. */
  readonly account?: string;
  /** Absolute path of the node binary (process.execPath); must exist at the same path on the compute nodes. */
  readonly node: string;
  /** Absolute path of the compiled CLI (dist/harness/cli.js); must exist at the same path on the compute nodes. */
  readonly cli: string;
  /** Job name shown by squeue; the merge job gets `-merge` appended. */
  readonly jobName: string;
  /**
   * Absolute folder the tasks start in, so that relative paths among studyArgs (e.g. `--from data`) mean what
   * they meant where the user typed the command. Pass process.cwd(). Omitted: Slurm's default (the folder
   * sbatch was called from).
   */
  readonly workDir?: string;
}

/** The three scripts. All three are meant to sit in one folder (file names in {@link SLURM_FILES}). */
export interface SlurmScripts {
  /** sbatch script of the job array. */
  readonly array: string;
  /** sbatch script of the merge job. */
  readonly merge: string;
  /** bash script that submits the array, then the merge depending on it, and prints both job ids. */
  readonly submit: string;
}

/** File names the submit script expects for its two neighbours (same folder as itself). */
export const SLURM_FILES = { array: "array.sbatch", merge: "merge.sbatch", submit: "submit.sh" } as const;

/** Study options that the scripts set themselves; the user must not give them. */
const RESERVED = ["--out", "--shard", "--workers"] as const;

/** Characters that mean the same to bash with or without quotes (in argument position). */
const PLAIN_WORD = /^[A-Za-z0-9_@%+=:,./-]+$/;

/**
 * Quotes one word for bash so that it reaches the command unchanged: plain words stay as they are, anything
 * else goes in single quotes, with each `'` written as `'\''`. Newlines survive inside the quotes.
 * @throws RangeError for a NUL character, which no shell word can carry.
 */
export function shellQuote(word: string): string {
  if (word.includes("\0")) throw new RangeError("a shell word cannot contain a NUL character");
  if (PLAIN_WORD.test(word)) return word;
  return `'${word.replace(/'/g, `'\\''`)}'`;
}

/**
 * Quotes a value on an `#SBATCH` line. sbatch reads these lines itself (no shell): whitespace ends a value
 * unless inside double quotes, and a backslash makes the next character literal.
 */
function directiveQuote(value: string): string {
  if (/^[A-Za-z0-9_@%+=:,./-]+$/.test(value)) return value;
  return `"${value.replace(/[\\"]/g, (c) => `\\${c}`)}"`;
}

/** An output-file pattern for Slurm: a literal `%` in the folder is written `%%` so it is not a placeholder. */
function logPattern(out: string, file: string): string {
  return directiveQuote(`${out.replace(/%/g, "%%")}/logs/${file}`);
}

function checkAbsolute(name: string, path: string): void {
  if (!path.startsWith("/")) throw new InputError(`${name}: '${path}' must be an absolute path`);
  if (/[\n\r\0]/.test(path)) throw new InputError(`${name}: the path contains a line break or NUL`);
}

function checkDirectiveText(name: string, value: string): void {
  if (value === "") throw new InputError(`${name}: must not be empty`);
  if (/[\n\r\0]/.test(value)) throw new InputError(`${name}: must not contain a line break or NUL`);
}

function checkOptions(o: SlurmOptions): void {
  if (!Number.isInteger(o.shards) || o.shards < 1) throw new InputError(`--shards: need a whole number ≥ 1, got ${o.shards}`);
  if (!Number.isInteger(o.cpusPerTask) || o.cpusPerTask < 1) throw new InputError(`--cpus-per-task: need a whole number ≥ 1, got ${o.cpusPerTask}`);
  checkAbsolute("--out", o.out);
  // A backslash in an output pattern tells Slurm to stop expanding %A and %a; no real folder needs one.
  if (o.out.includes("\\")) throw new InputError(`--out: '${o.out}' contains a backslash, which Slurm's log-file patterns cannot carry`);
  checkAbsolute("node path", o.node);
  checkAbsolute("CLI path", o.cli);
  if (o.workDir !== undefined) checkAbsolute("working folder", o.workDir);
  checkDirectiveText("--job-name", o.jobName);
  if (o.time !== undefined && !/^(\d+-)?\d+(:\d+){0,2}$|^(UNLIMITED|INFINITE)$/i.test(o.time)) {
    throw new InputError(`--time: '${o.time}' is not a Slurm time (MM, MM:SS, HH:MM:SS, D-HH, D-HH:MM or D-HH:MM:SS)`);
  }
  if (o.memPerCpu !== undefined && !/^\d+[KMGT]?$/i.test(o.memPerCpu)) {
    throw new InputError(`--mem-per-cpu: '${o.memPerCpu}' is not a Slurm memory size (a whole number with K, M, G or T)`);
  }
  for (const [name, value] of [["--partition", o.partition], ["--account", o.account]] as const) {
    if (value !== undefined && !/^[A-Za-z0-9_.,+-]+$/.test(value)) throw new InputError(`${name}: '${value}' is not a Slurm ${name.slice(2)} name`);
  }
  for (const arg of o.studyArgs) {
    if (arg.includes("\0")) throw new InputError("study options: an argument contains a NUL character");
    const flag = arg.split("=")[0];
    if ((RESERVED as ReadonlyArray<string>).includes(flag)) {
      throw new InputError(`${flag}: the Slurm scripts set it themselves (shard K of N into ${o.out}/shards/K, workers = --cpus-per-task); leave it out`);
    }
  }
}

/** The `#SBATCH` lines both jobs share: where and how long they may run. */
function placementLines(o: SlurmOptions): string[] {
  const lines: string[] = [];
  if (o.partition !== undefined) lines.push(`#SBATCH --partition=${o.partition}`);
  if (o.account !== undefined) lines.push(`#SBATCH --account=${o.account}`);
  if (o.time !== undefined) lines.push(`#SBATCH --time=${o.time}`);
  if (o.memPerCpu !== undefined) lines.push(`#SBATCH --mem-per-cpu=${o.memPerCpu}`);
  return lines;
}

/** Shell assignments of the absolute paths the bodies use. */
function pathLines(o: SlurmOptions): string[] {
  return [`NODE=${shellQuote(o.node)}`, `CLI=${shellQuote(o.cli)}`, `OUT=${shellQuote(o.out)}`];
}

/** Joins a command's words, one continuation line per option so a long study stays readable. */
function commandLines(words: ReadonlyArray<string>): string {
  const parts: string[] = [];
  let line = "";
  for (const w of words) {
    if (w.startsWith("--") && line !== "") {
      parts.push(line);
      line = w;
    } else line = line === "" ? w : `${line} ${w}`;
  }
  if (line !== "") parts.push(line);
  return parts.join(" \\\n  ");
}

/**
 * The three scripts of a study on Slurm: the job array (task K runs `speedbound run … --shard K/N`), the
 * merge job, and the submit script that queues both (the merge with `afterok` on the whole array).
 * @throws InputError naming the option when a value cannot be used (relative path, bad time, reserved option, …).
 */
export function slurmScripts(o: SlurmOptions): SlurmScripts {
  checkOptions(o);
  const n = o.shards;
  const head = (what: string): string[] => [
    "#!/usr/bin/env bash",
    `# ${what}`,
    "# Written by `speedbound slurm`. The paths below must be the same on every compute node (a shared",
    "# filesystem): the jobs read the program there and write the study's folders there.",
  ];
  const workDir = o.workDir === undefined ? [] : [`cd ${shellQuote(o.workDir)}`];

  const runWords = [
    '"$NODE"',
    '"$CLI"',
    "run",
    ...o.studyArgs.map(shellQuote),
    "--shard",
    `"$SLURM_ARRAY_TASK_ID/${n}"`,
    "--out",
    '"$OUT/shards/$SLURM_ARRAY_TASK_ID"',
    "--workers",
    `"\${SLURM_CPUS_PER_TASK:-${o.cpusPerTask}}"`,
  ];
  const array = [
    ...head(`Job array of a speedbound study: array task K runs shard K of ${n} into OUT/shards/K.`),
    `#SBATCH --job-name=${directiveQuote(o.jobName)}`,
    `#SBATCH --array=1-${n}`,
    "#SBATCH --ntasks=1",
    `#SBATCH --cpus-per-task=${o.cpusPerTask}`,
    ...placementLines(o),
    `#SBATCH --output=${logPattern(o.out, "%A_%a.out")}`,
    "#SBATCH --open-mode=append",
    "# Requeueing is safe: a task that starts again (after a node failure, a preemption, or `scontrol requeue`)",
    "# finds its shard's journal, skips the cells already finished, and ends with the same tables.",
    "#SBATCH --requeue",
    "set -euo pipefail",
    ...pathLines(o),
    ': "${SLURM_ARRAY_TASK_ID:?this script is one task of a job array: submit it with sbatch (see submit.sh)}"',
    ...workDir,
    "# exec: the time limit's SIGTERM reaches the study itself, which then writes its tables and stops cleanly.",
    `exec ${commandLines(runWords)}`,
    "",
  ].join("\n");

  const merge = [
    ...head(`Merge job of a speedbound study: joins the ${n} shard folders into OUT and writes its tables.`),
    `#SBATCH --job-name=${directiveQuote(`${o.jobName}-merge`)}`,
    "#SBATCH --ntasks=1",
    "#SBATCH --cpus-per-task=1",
    ...placementLines(o),
    `#SBATCH --output=${logPattern(o.out, "merge_%j.out")}`,
    "#SBATCH --open-mode=append",
    "# When an array task fails, the afterok dependency can never be met: cancel this job rather than leave",
    "# it pending for ever. Fix the failed task, rerun it (it resumes), then submit this script again.",
    "#SBATCH --kill-on-invalid-dep=yes",
    "set -euo pipefail",
    ...pathLines(o),
    ...workDir,
    "# Each shard by number, so that a missing folder is named by merge instead of silently left out.",
    "shards=()",
    `for ((k = 1; k <= ${n}; k++)); do shards+=("$OUT/shards/$k"); done`,
    'exec "$NODE" "$CLI" merge "$OUT" "${shards[@]}"',
    "",
  ].join("\n");

  const submit = [
    "#!/usr/bin/env bash",
    `# Submits a speedbound study to Slurm: the job array (${n} shards), then the merge, which starts only`,
    "# after every array task has succeeded. Written by `speedbound slurm`; run it on a login node.",
    "set -euo pipefail",
    'here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"',
    `OUT=${shellQuote(o.out)}`,
    '# Slurm opens the log files before a job starts: their folder must exist already.',
    'mkdir -p "$OUT/logs" "$OUT/shards"',
    `array_id="$(sbatch --parsable "$here/${SLURM_FILES.array}")"`,
    "array_id=\"${array_id%%;*}\" # --parsable prints 'id' or 'id;cluster'",
    `if ! merge_id="$(sbatch --parsable --dependency="afterok:$array_id" "$here/${SLURM_FILES.merge}")"; then`,
    "  echo \"speedbound: the array job $array_id is queued but the merge job could not be submitted;\" >&2",
    `  echo "speedbound: submit it later with: sbatch --dependency=afterok:$array_id $here/${SLURM_FILES.merge}" >&2`,
    "  exit 1",
    "fi",
    'merge_id="${merge_id%%;*}"',
    `echo "array job: $array_id (${n} tasks; logs in $OUT/logs)"`,
    'echo "merge job: $merge_id (starts when every array task has succeeded)"',
    'echo "tables: $OUT (once the merge job has finished; follow with: squeue -j $array_id,$merge_id)"',
    "",
  ].join("\n");

  return { array, merge, submit };
}
