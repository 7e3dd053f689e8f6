/**
 * The paper outputs of a study, rebuilt from its tables: sizes.csv (quantiles over instances with bootstrap
 * intervals), fits.csv (scaling exponents), comparison.csv (each classical solver against each predictor, with
 * crossover estimates under the cost model), table.tex, table.md and scaling-FAMILY.svg.
 */
import { join } from "node:path";
import type { StudySpec } from "../engine/study.js";
import type { Tables } from "./tables.js";
import { writeCsv } from "./csv.js";
import { writeFileAtomic } from "../engine/files.js";
import {
  COMPARISON_COLUMNS,
  FIT_COLUMNS,
  SIZE_COLUMNS,
  compareMethods,
  fitScaling,
  summariseSizes,
  type ComparisonRow,
  type FitRow,
  type SizeRow,
} from "./summarise.js";
import { comparisonLatex } from "./latex.js";
import { comparisonMarkdown } from "./markdown.js";
import { comparisonLegend, comparisonTerminalTable } from "./terminal-table.js";
import { scalingPlotSvg } from "./plot.js";
import { secondsPerQuery, type FamilyShape } from "../predict/cost-table.js";
import { familyNamed } from "../families/registry.js";
import { OUT_FILES, scalingPlotFile } from "../engine/output-folder.js";

/** The paper outputs, also returned for printing. */
export interface PaperOutputs {
  readonly sizes: SizeRow[];
  readonly fits: FitRow[];
  readonly comparison: ComparisonRow[];
}

/** Bootstrap seed of the report (fixed, so tables rebuild identically; stated in results/README.md). */
export const REPORT_BOOTSTRAP_SEED = "speedbound-report";

/** Builds and writes the paper outputs of a study folder. */
export async function writePaperOutputs(spec: StudySpec, out: string, tables: Tables): Promise<PaperOutputs> {
  const options = { resamples: spec.report.resamples, seed: REPORT_BOOTSTRAP_SEED };
  const sizes = summariseSizes(tables.runs, tables.predictions, options);
  const fits = fitScaling(tables.runs, tables.predictions, { ...options, fitFrom: spec.report.fitFrom });
  const perQuery = secondsPerQuery(spec, familyShape(spec, tables), (predictor, n) => stepsPerTrial(spec, sizes, predictor, n));
  const comparison = compareMethods(fits, perQuery, { parallelism: spec.costModel.classicalParallelism });
  writeCsv(join(out, OUT_FILES.sizes), sizes, SIZE_COLUMNS as string[]);
  writeCsv(join(out, OUT_FILES.fits), fits, FIT_COLUMNS as string[]);
  writeCsv(join(out, OUT_FILES.comparison), comparison, COMPARISON_COLUMNS as string[]);
  writeFileAtomic(join(out, OUT_FILES.latex), comparisonLatex(comparison));
  writeFileAtomic(join(out, OUT_FILES.markdown), comparisonMarkdown(comparison));
  if (sizes.length > 0) writeFileAtomic(join(out, scalingPlotFile(spec.family)), await scalingPlotSvg(sizes, fits, spec.family));
  return { sizes, fits, comparison };
}

/** The comparison as an aligned terminal table with its legend (printed at the end of `run`). */
export function formatComparison(paper: PaperOutputs): string {
  if (paper.comparison.length === 0) return "speedbound: no solver/predictor pair could be compared (too few sizes for fits?)";
  return `${comparisonTerminalTable(paper.comparison)}\n${comparisonLegend(paper.comparison)}`;
}

/** Size facts for the Toffoli counts, as the family declares them (families/*.ts `costShape`). */
function familyShape(spec: StudySpec, tables: Tables): FamilyShape {
  return familyNamed(spec.family).costShape(spec.familyParams, tables.instances);
}

/**
 * Elementary steps of one classical trial, which one amplified "query" (a reversible trial run) must execute in
 * full: walk, flips per trial; anneal, sweeps × n at the optimal run length of the largest measured size.
 */
function stepsPerTrial(spec: StudySpec, sizes: ReadonlyArray<SizeRow>, predictor: string, n: number): number {
  if (predictor === "amplified-walk") return spec.walkFlipsPerVariable * n;
  const chosen = sizes.filter((r) => r.method === predictor && r.optimal_run_length && r.run_length !== null);
  const largest = chosen.reduce<SizeRow | null>((best, r) => (best === null || r.n > best.n ? r : best), null);
  const sweeps = largest?.run_length ?? Math.max(...spec.sweeps);
  return sweeps * n;
}
