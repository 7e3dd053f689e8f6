/** `speedbound report DIR`: rebuild every table of an output folder from its journal. */
import { resolve } from "node:path";
import { EXIT } from "../../errors.js";
import { readStudyFolder } from "../../engine/output-folder.js";
import { numberOption } from "../resolve.js";
import { writeOutputs } from "../../report/outputs.js";
import { formatComparison } from "../../report/paper.js";
import { type Args } from "./shared.js";

/** `speedbound report DIR`: rebuild every table of an output folder from its journal. */
export async function report(argv: Args): Promise<number> {
  const dir = resolve(String(argv.dir));
  const { spec } = readStudyFolder(dir);
  const fitFrom = argv["fit-from"] === undefined ? spec.report.fitFrom : numberOption(argv, "fit-from");
  const resamples = argv.resamples === undefined ? spec.report.resamples : (numberOption(argv, "resamples") as number);
  const { paper } = await writeOutputs({ ...spec, report: { fitFrom, resamples } }, dir);
  process.stdout.write(formatComparison(paper) + "\n");
  process.stdout.write(`speedbound: tables rebuilt in ${dir}\n`);
  return EXIT.ok;
}
