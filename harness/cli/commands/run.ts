/** `speedbound run`: resolve the study, run (or resume) it, write tables and manifest, print the comparison. */
import { readFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { EXIT } from "../../errors.js";
import { runStudy } from "../../engine/run.js";
import type { RunSummary } from "../../engine/run-summary.js";
import { OUT_FILES } from "../../engine/output-folder.js";
import { memoryNotes, parseDuration, parseShard, resolveStudy } from "../resolve.js";
import { sizeRangeNote } from "../argv-guard.js";
import { STREAM_SCHEME } from "../../engine/build-info.js";
import { consoleProgress } from "../progress.js";
import { writeOutputs } from "../../report/outputs.js";
import { buildManifest } from "../../engine/manifest.js";
import { writeFileAtomic } from "../../engine/files.js";
import { resolvedOptions } from "../options.js";
import { defaultSolvers } from "../../../solvers/registry.js";
import { familyNamed } from "../../families/registry.js";
import { formatComparison } from "../../report/paper.js";
import { type Args } from "./shared.js";
import { workersOf } from "./shared.js";

/** `speedbound run`: resolve the study, run (or resume) it, write tables and manifest, print the comparison. */
export async function run(argv: Args, rawArgs: ReadonlyArray<string>): Promise<number> {
  const spec = resolveStudy(argv);
  const note = sizeRangeNote(argv.n, spec.sizes);
  if (note) process.stderr.write(`speedbound: note: ${note}\n`);
  const out = resolve(String(argv.out ?? "results/latest"));
  const workers = workersOf(argv);
  const shard = argv.shard === undefined ? null : parseShard(String(argv.shard));
  const budgetMs = argv.budget === undefined ? null : parseDuration(String(argv.budget), "--budget");
  const cellLimitMs = argv["cell-limit"] === undefined ? null : parseDuration(String(argv["cell-limit"]), "--cell-limit");
  const started = new Date();
  for (const line of memoryNotes(spec)) process.stderr.write(`speedbound: ${line}\n`);
  const summary = await runStudy(spec, { out, workers, budgetMs, cellLimitMs, shard, progress: consoleProgress(), graceMs: 10_000 });
  if (summary.tornJournalLine) process.stderr.write(`speedbound: warning: the journal's last line was torn (a killed run) and was dropped\n`);
  const { paper } = await writeOutputs(spec, out);
  // A resume keeps the first start time and adds its own to `resumed_at`.
  const previous = readPreviousManifest(join(out, OUT_FILES.manifest));
  const firstStart = summary.cellsResumed > 0 && typeof previous?.started_at === "string" ? new Date(previous.started_at) : started;
  const resumedAt = summary.cellsResumed > 0
    ? [...(Array.isArray(previous?.resumed_at) ? (previous!.resumed_at as string[]) : []), started.toISOString()]
    : [];
  const extra = {
    options: manifestOptions(argv, spec.family), budget_ms: budgetMs, cell_limit_ms: cellLimitMs,
    resumed_at: resumedAt, report_settings: { settings: paper.settings ?? "" }, stream_scheme: STREAM_SCHEME,
  };
  writeFileAtomic(join(out, OUT_FILES.manifest), JSON.stringify(buildManifest({ argv: rawArgs, spec, workers, shard, started: firstStart, ended: new Date(), summary, extra }), null, 2) + "\n");
  process.stdout.write(formatComparison(paper) + "\n");
  process.stdout.write(summaryLine(summary, out) + "\n");
  if (summary.interrupted === "SIGINT") return EXIT.interrupted;
  if (summary.interrupted === "SIGTERM") return EXIT.terminated;
  return summary.errors > 0 ? EXIT.failures : EXIT.ok;
}

/** The resolved options for the manifest; --solvers has no single default (it depends on the family's kind). */
function manifestOptions(argv: Args, family: string): Record<string, unknown> {
  return { ...resolvedOptions(argv, "run"), solvers: argv.solvers ?? defaultSolvers(familyNamed(family).kind).join(",") };
}

function summaryLine(s: RunSummary, out: string): string {
  const parts = [
    `${s.cellsDone} cells run`,
    s.cellsResumed ? `${s.cellsResumed} resumed from the journal` : "",
    s.censored ? `${s.censored} censored by limits` : "",
    s.errors ? `${s.errors} ERRORS (see runs.csv 'message')` : "",
    s.skipped ? `${s.skipped} skipped (budget or signal)` : "",
    `complete sizes: ${s.completeSizes.join(",") || "none"}`,
    s.incompleteSizes.length ? `incomplete: ${s.incompleteSizes.join(",")}` : "",
  ].filter((x) => x !== "");
  return `speedbound: ${parts.join("; ")}\nspeedbound: tables in ${out}`;
}

/** The manifest of an earlier run in the same folder, or null. */
function readPreviousManifest(path: string): Record<string, unknown> | null {
  try {
    return JSON.parse(readFileSync(path, "utf8")) as Record<string, unknown>;
  } catch {
    return null;
  }
}
