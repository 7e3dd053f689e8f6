/** `speedbound compare OLD NEW`: night-to-night check of two runs of one study. */
import { resolve } from "node:path";
import { EXIT, InputError } from "../../errors.js";
import { DEFAULT_SPEED_TOLERANCE, compareFolders } from "../../report/compare.js";
import { readStudyFolder } from "../../engine/output-folder.js";
import { streamsNote } from "../../engine/build-info.js";
import { type Args } from "./shared.js";

/** `speedbound compare OLD NEW`: night-to-night check of two runs of one study. */
export async function compare(argv: Args): Promise<number> {
  const tolerance = argv.tolerance === undefined ? DEFAULT_SPEED_TOLERANCE : Number(argv.tolerance);
  if (!(tolerance > 0) || !Number.isFinite(tolerance)) throw new InputError(`--tolerance: '${String(argv.tolerance)}' is not a positive number`);
  const findings = compareFolders(resolve(String(argv.old)), resolve(String(argv.new)), tolerance);
  const streams = streamsNote(readStudyFolder(resolve(String(argv.old))).build, readStudyFolder(resolve(String(argv.new))).build);
  if (streams) process.stdout.write(`note        streams       ${streams}\n`);
  if (findings.some((f) => f.kind === "seed-to-seed")) {
    process.stdout.write("speedbound compare: the folders differ only in the master seed: seed-to-seed comparison of median exponents\n");
  } else if (findings.length === 0) process.stdout.write("speedbound compare: no change beyond intervals and tolerance\n");
  for (const f of findings) process.stdout.write(`${f.regression ? "REGRESSION" : "change    "}  ${f.kind.padEnd(12)}  ${f.what}: ${f.detail}\n`);
  return findings.some((f) => f.regression) ? EXIT.failures : EXIT.ok;
}
