/**
 * Writes every table of an output folder from its journal: instances.csv, runs.csv, predictions.csv, and the
 * paper outputs (sizes.csv, fits.csv, comparison.csv, table.tex, table.md, scaling-FAMILY.svg).
 */
import { join } from "node:path";
import { readJournal, type JournalRecord } from "../engine/journal.js";
import { OUT_FILES } from "../engine/output-folder.js";
import type { StudySpec } from "../engine/study.js";
import { buildTables, type Tables } from "./tables.js";
import { writeCsv } from "./csv.js";
import { writePaperOutputs, type PaperOutputs } from "./paper.js";

/** Leading columns of each table (DESIGN.md §5: family, n, instance first). */
export const LEADING = {
  instances: ["family", "n", "instance", "seed"],
  runs: ["family", "n", "instance", "solver", "run_length", "status", "wall_ns", "cpu_ns", "work", "trials", "successes", "trial_success_p", "trial_success_p_low", "trial_success_p_high"],
  predictions: ["family", "n", "instance", "predictor", "status", "queries", "queries_log2", "queries_low", "queries_high"],
} as const;

/** Rebuilds all tables of a folder from the given journal records (or the folder's own journal). */
export async function writeOutputs(
  spec: StudySpec,
  out: string,
  records: ReadonlyArray<JournalRecord> = readJournal(join(out, OUT_FILES.journal)).records,
): Promise<{ tables: Tables; paper: PaperOutputs }> {
  const tables = buildTables(spec, records);
  writeCsv(join(out, OUT_FILES.instances), tables.instances, LEADING.instances);
  writeCsv(join(out, OUT_FILES.runs), tables.runs, LEADING.runs);
  writeCsv(join(out, OUT_FILES.predictions), tables.predictions, LEADING.predictions);
  const paper = await writePaperOutputs(spec, out, tables);
  return { tables, paper };
}
