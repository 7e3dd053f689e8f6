/**
 * `speedbound report DIR`: rebuild every table of an output folder from its journal, optionally with other report
 * settings (fit range, resamples, floor factor) and cost-model options; only options given on the command line
 * override the study's. The settings used are recorded in manifest.json (`report_settings`, and a `reports` history).
 */
import { readFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { EXIT } from "../../errors.js";
import { OUT_FILES, readStudyFolder } from "../../engine/output-folder.js";
import type { StudySpec } from "../../engine/study.js";
import { writeFileAtomic } from "../../engine/files.js";
import { numberOption, resolveCostModel } from "../resolve.js";
import { optionsOf } from "../options.js";
import { DEFAULT_FLOOR_FACTOR } from "../../stats/floor.js";
import { assertWritableFolder } from "../../engine/fs-guard.js";
import { lockFolder } from "../../engine/folder-lock.js";
import { writeOutputs } from "../../report/outputs.js";
import { formatComparison } from "../../report/paper.js";
import { type Args } from "./shared.js";

/** Cost-model option → the field of the frozen spec it sets. */
const COST_FIELDS: Readonly<Record<string, keyof StudySpec["costModel"]>> = {
  "toffoli-us": "toffoliSeconds",
  factories: "factories",
  "classical-parallelism": "classicalParallelism",
  "oracle-toffolis": "oracleToffolis",
  "walk-step-toffolis": "walkStepToffolis",
  "anneal-step-toffolis": "annealStepToffolis",
};

/** `speedbound report DIR`: rebuild every table of an output folder from its journal. */
export async function report(argv: Args, rawArgs: ReadonlyArray<string> = []): Promise<number> {
  const dir = resolve(String(argv.dir));
  const { spec } = readStudyFolder(dir);
  assertWritableFolder(dir, "report");
  const lock = lockFolder(dir, "report", "report"); // not while a run writes the same folder
  try {
    return await rebuild(dir, argv, rawArgs, spec);
  } finally {
    lock.release();
  }
}

/** Rebuilds the tables with the given report settings and records them in the manifest (under the folder lock). */
async function rebuild(dir: string, argv: Args, rawArgs: ReadonlyArray<string>, spec: StudySpec): Promise<number> {
  // Defaults are not applied by the parser, so `undefined` means "not given": the study's own value stays.
  const given = (name: string): boolean => argv[name] !== undefined;
  const fitFrom = given("fit-from") ? numberOption(argv, "fit-from") : spec.report.fitFrom;
  const resamples = given("resamples") ? (numberOption(argv, "resamples") as number) : spec.report.resamples;
  const floorFactor = given("floor-factor") ? (numberOption(argv, "floor-factor") as number) : (spec.report.floorFactor ?? DEFAULT_FLOOR_FACTOR);
  const fromArgs = resolveCostModel(argv);
  const costModel: Record<string, unknown> = { ...spec.costModel };
  for (const o of optionsOf("report")) {
    const field = COST_FIELDS[o.name];
    if (o.group === "cost model" && field !== undefined && given(o.name)) costModel[field] = fromArgs[field];
  }
  const reportSpec: StudySpec = { ...spec, costModel: costModel as unknown as StudySpec["costModel"], report: { fitFrom, resamples, floorFactor } };
  const { paper } = await writeOutputs(reportSpec, dir);
  recordReportSettings(dir, rawArgs, reportSpec, paper.settings ?? "");
  process.stdout.write(formatComparison(paper) + "\n");
  process.stdout.write(`speedbound: tables rebuilt in ${dir}\n`);
  return EXIT.ok;
}

/** Adds the settings of a `report` rebuild to manifest.json (latest in `report_settings`, all in `reports`). */
function recordReportSettings(dir: string, rawArgs: ReadonlyArray<string>, spec: StudySpec, line: string): void {
  const path = join(dir, OUT_FILES.manifest);
  let manifest: Record<string, unknown> = {};
  try {
    manifest = JSON.parse(readFileSync(path, "utf8")) as Record<string, unknown>;
  } catch {
    manifest = {};
  }
  const entry = {
    at: new Date().toISOString(),
    command_line: ["speedbound", ...rawArgs].join(" "),
    fit_from: spec.report.fitFrom,
    resamples: spec.report.resamples,
    floor_factor: spec.report.floorFactor,
    cost_model: spec.costModel,
    settings: line,
  };
  manifest.report_settings = entry;
  manifest.reports = [...(Array.isArray(manifest.reports) ? manifest.reports : []), entry];
  writeFileAtomic(path, JSON.stringify(manifest, null, 2) + "\n");
}
