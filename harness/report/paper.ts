/**
 * The paper outputs of a study, rebuilt from its tables: sizes.csv (quantiles over instances with bootstrap
 * intervals), fits.csv (scaling exponents with the verdict checks), comparison.csv (each classical solver against
 * each predictor on the work and the time basis, with crossover estimates under the cost model), table.tex,
 * table.md, the figures work-FAMILY.svg, time-FAMILY.svg, instances-FAMILY.svg, and the study page report.html.
 */
import { join } from "node:path";
import type { StudySpec } from "../engine/study.js";
import type { Tables } from "./tables.js";
import { writeCsv } from "./csv.js";
import { writeFileAtomic } from "../engine/files.js";
import { SIZE_COLUMNS, summariseSizes, type SizeRow } from "./sizes.js";
import { DEFAULT_FIT_FROM_RULE, FIT_COLUMNS, fitStudy, type FitRow } from "./fits.js";
import { COMPARISON_COLUMNS, compareMethods, type ComparisonRow } from "./comparison.js";
import { DEFAULT_FLOOR_FACTOR } from "../stats/floor.js";
import { instancesFigureSvg, timeFigureSvg, workFigureSvg, type FigureContext } from "./plots/figures.js";
import { studyPage } from "./html.js";
import { comparisonLatex } from "./latex.js";
import { comparisonMarkdown } from "./markdown.js";
import { comparisonLegend, comparisonTerminalTable } from "./terminal-table.js";
import { secondsPerQuery, type FamilyShape } from "../predict/cost-table.js";
import { familyNamed } from "../families/registry.js";
import { OUT_FILES, figureFile, type FigureKind } from "../engine/output-folder.js";

/** The paper outputs, also returned for printing. */
export interface PaperOutputs {
  readonly sizes: SizeRow[];
  readonly fits: FitRow[];
  readonly comparison: ComparisonRow[];
  /** The settings line (fit range, resamples, floor factor, cost model). */
  readonly settings?: string;
}

/** Bootstrap seed of the report (fixed, so tables rebuild identically; stated in results/README.md). */
export const REPORT_BOOTSTRAP_SEED = "speedbound-report";

/** The report settings of a spec (older spec.json files have no floor factor: the default). */
export function reportSettings(spec: StudySpec): {
  fitFrom: number | null;
  resamples: number;
  floorFactor: number;
} {
  return { fitFrom: spec.report.fitFrom, resamples: spec.report.resamples, floorFactor: spec.report.floorFactor ?? DEFAULT_FLOOR_FACTOR };
}

/** One line stating every setting a table depends on (captions, legends, the study page). */
export function settingsLine(spec: StudySpec): string {
  const r = reportSettings(spec);
  const c = spec.costModel;
  const overrides = [
    c.oracleToffolis === null ? "" : `${c.oracleToffolis} Toffolis per oracle query`,
    c.walkStepToffolis === null ? "" : `${c.walkStepToffolis} Toffolis per walk step`,
    c.annealStepToffolis === null ? "" : `${c.annealStepToffolis} Toffolis per anneal step`,
  ].filter((s) => s !== "");
  return [
    `fit ${r.fitFrom === null ? DEFAULT_FIT_FROM_RULE : `sizes n >= ${r.fitFrom}`}`,
    `${r.resamples} bootstrap resamples`,
    `fixed-cost floor factor ${r.floorFactor}`,
    `cost model: Toffoli time ${+(c.toffoliSeconds * 1e6).toPrecision(6)} us, ${c.factories} factor${c.factories === 1 ? "y" : "ies"}, classical parallelism S = ${c.classicalParallelism}` +
      (overrides.length > 0 ? `, ${overrides.join(", ")}` : ""),
  ].join("; ");
}

/** Builds and writes the paper outputs of a study folder. */
export async function writePaperOutputs(spec: StudySpec, out: string, tables: Tables): Promise<PaperOutputs> {
  const settings = reportSettings(spec);
  const options = { resamples: settings.resamples, seed: REPORT_BOOTSTRAP_SEED };
  const sizes = summariseSizes(tables.runs, tables.predictions, options);
  const fits = fitStudy(tables.runs, tables.predictions, { ...options, fitFrom: settings.fitFrom, floorFactor: settings.floorFactor });
  const perQuery = secondsPerQuery(spec, familyShape(spec, tables), (predictor, n) => stepsPerTrial(spec, sizes, predictor, n));
  const comparison = compareMethods(fits, perQuery, { parallelism: spec.costModel.classicalParallelism });
  const line = settingsLine(spec);
  writeCsv(join(out, OUT_FILES.sizes), sizes, SIZE_COLUMNS as string[]);
  writeCsv(join(out, OUT_FILES.fits), fits, FIT_COLUMNS as string[]);
  writeCsv(join(out, OUT_FILES.comparison), comparison, COMPARISON_COLUMNS as string[]);
  writeFileAtomic(join(out, OUT_FILES.latex), comparisonLatex(comparison, line));
  writeFileAtomic(join(out, OUT_FILES.markdown), comparisonMarkdown(comparison, line));
  const figures: Partial<Record<FigureKind, string>> = {};
  if (sizes.length > 0) {
    const ctx: FigureContext = {
      family: spec.family,
      nCounts: familyNamed(spec.family).kind === "cnf" ? "variables" : "spins",
      parallelism: spec.costModel.classicalParallelism,
      secondsPerQuery: perQuery,
      settings: line,
    };
    figures.work = await workFigureSvg(sizes, fits, ctx);
    figures.time = await timeFigureSvg(sizes, fits, comparison, ctx);
    figures.instances = await instancesFigureSvg(tables, sizes, ctx);
    for (const [kind, svg] of Object.entries(figures)) writeFileAtomic(join(out, figureFile(kind as FigureKind, spec.family)), svg);
  }
  writeFileAtomic(join(out, OUT_FILES.studyPage), studyPage({ spec, sizes, fits, comparison, figures, settings: line }));
  return { sizes, fits, comparison, settings: line };
}

/** The comparison as an aligned terminal table with its legend (printed at the end of `run`). */
export function formatComparison(paper: PaperOutputs): string {
  if (paper.comparison.length === 0) return "speedbound: no solver/predictor pair could be compared (too few sizes for fits?)";
  return `${comparisonTerminalTable(paper.comparison)}\n${comparisonLegend(paper.comparison, paper.settings ?? "")}`;
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
