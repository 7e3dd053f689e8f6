/** `speedbound report DIR`: rebuild every table of an output folder from its journal. */
import { resolve } from "node:path";
import { EXIT } from "../../errors.js";
import { readStudyFolder } from "../../engine/output-folder.js";
import { assertWritableFolder } from "../../engine/fs-guard.js";
import { lockFolder } from "../../engine/folder-lock.js";
import { numberOption } from "../resolve.js";
import { writeOutputs } from "../../report/outputs.js";
import { formatComparison } from "../../report/paper.js";
import { type Args } from "./shared.js";

/** `speedbound report DIR`: rebuild every table of an output folder from its journal. */
export async function report(argv: Args): Promise<number> {
  const dir = resolve(String(argv.dir));
  const { spec } = readStudyFolder(dir);
  assertWritableFolder(dir, "report");
  const lock = lockFolder(dir, "report", "report"); // not while a run writes the same folder
  const fitFrom = argv["fit-from"] === undefined ? spec.report.fitFrom : numberOption(argv, "fit-from");
  const resamples = argv.resamples === undefined ? spec.report.resamples : (numberOption(argv, "resamples") as number);
  const { paper } = await writeOutputs({ ...spec, report: { fitFrom, resamples } }, dir).finally(() => lock.release());
  process.stdout.write(formatComparison(paper) + "\n");
  process.stdout.write(`speedbound: tables rebuilt in ${dir}\n`);
  return EXIT.ok;
}
