/**
 * report.html: the study page (issue 13). One self-contained file: the figures inline (SVG), the comparison table
 * with its footnote marks, the caveats, every rule that excluded a size or withheld a verdict, the settings, and
 * relative links to the CSV files beside it. No script, no style sheet or font from the network.
 */
import type { StudySpec } from "../engine/study.js";
import type { SizeRow } from "./sizes.js";
import type { FitRow } from "./fits.js";
import { SPEEDUP_RULE, type ComparisonRow } from "./comparison.js";
import { COMPARISON_TABLE_COLUMNS } from "./terminal-table.js";
import { footnoteLines, footnoteMarks } from "./footnotes.js";
import { floorRule, DEFAULT_FLOOR_FACTOR } from "../stats/floor.js";
import { GROWTH_MODEL_RULE } from "../stats/growth-model.js";
import { FIT_FROM_RULE } from "../stats/fit.js";

/** Everything the page shows. */
export interface StudyPageInput {
  readonly spec: StudySpec;
  readonly sizes: ReadonlyArray<SizeRow>;
  readonly fits: ReadonlyArray<FitRow>;
  readonly comparison: ReadonlyArray<ComparisonRow>;
  /** Figure name ("work", "time", "instances") → SVG document. */
  readonly figures: Readonly<Record<string, string>>;
  readonly settings: string;
}

/** The files the page links to (all beside it in the output folder). */
export const LINKED_FILES = ["comparison.csv", "fits.csv", "sizes.csv", "runs.csv", "predictions.csv", "instances.csv", "table.md", "table.tex", "manifest.json"];

/** Escapes text for HTML element content and attribute values. */
export function escapeHtml(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/** Strips the XML prolog of an SVG document so it can sit inline in HTML. */
function inlineSvg(svg: string): string {
  return svg.replace(/^<\?xml[^>]*>\s*/, "");
}

const RUN_LENGTH_RULE =
  "randomised solvers: per size the run length with the smallest median work to solution is used (Rønnow et al., Science 345, 420 (2014)); " +
  "when it lies at the edge of the scanned grid, the true optimum may lie beyond it and that size's cost is an upper bound, so the exponent " +
  "is labelled an upper bound (edges at the largest sizes), a lower bound (edges at the smallest sizes) or a bound of unknown direction";

/** Builds the page. */
export function studyPage(input: StudyPageInput): string {
  const { spec, fits, comparison, figures } = input;
  const marks = footnoteMarks(comparison);
  const cols = COMPARISON_TABLE_COLUMNS;
  const table = [
    "<table>",
    `<thead><tr>${cols.map((c) => `<th>${escapeHtml(c.header)}</th>`).join("")}</tr></thead>`,
    "<tbody>",
    ...comparison.map(
      (r) => `<tr class="${r.rated ? "rated" : "unrated"}">${cols.map((c) => `<td class="${c.align}">${escapeHtml(c.cell(r, marks))}</td>`).join("")}</tr>`,
    ),
    "</tbody></table>",
  ].join("\n");
  const notes = footnoteLines(marks);
  const exclusions = fits
    .filter((f) => f.quantile === 0.5 && f.flag !== "")
    .map((f) => `<li><b>${escapeHtml(`${f.method} (${f.measure})`)}</b>: ${escapeHtml(f.flag)}</li>`);
  const figureBlock = (name: string, caption: string): string =>
    figures[name] === undefined
      ? ""
      : `<figure id="figure-${name}" data-figure="${name}">${inlineSvg(figures[name]!)}<figcaption>${escapeHtml(caption)}</figcaption></figure>`;
  const floorFactor = spec.report.floorFactor ?? DEFAULT_FLOOR_FACTOR;
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<title>speedbound study: ${escapeHtml(spec.family)}</title>
<style>
body { font-family: Helvetica, Arial, sans-serif; margin: 2em auto; max-width: 1200px; color: #111; line-height: 1.4; }
table { border-collapse: collapse; font-size: 13px; margin: 1em 0; }
th, td { border-bottom: 1px solid #ccc; padding: 3px 6px; vertical-align: top; }
th { border-bottom: 2px solid #333; text-align: left; }
td.right { text-align: right; white-space: nowrap; }
tr.unrated { color: #666; }
figure { margin: 1.5em 0; }
figcaption { font-size: 13px; color: #333; max-width: 900px; }
code { font-size: 12px; }
</style>
</head>
<body>
<h1>speedbound study: ${escapeHtml(spec.family)}, n = ${escapeHtml(String(spec.sizes[0]))}…${escapeHtml(String(spec.sizes[spec.sizes.length - 1]))}</h1>
<p>Master seed <code>${escapeHtml(spec.seed)}</code>, ${spec.instances} instances per size. Settings: ${escapeHtml(input.settings)}.</p>
<h2>Comparison</h2>
${table}
${notes.length === 0 ? "" : `<p class="footnotes">${notes.map(escapeHtml).join("<br>")}</p>`}
<h2>Figures</h2>
${figureBlock("work", "Work: classical elementary operations to solution against quantum oracle queries (amplified solvers: expected work), log2 scale, fitted lines over the sizes each fit used; open markers are censored medians at their lower bound.")}
${figureBlock("time", `Time: measured classical seconds divided by S = ${spec.costModel.classicalParallelism} against predicted quantum seconds; faint lines are extrapolations; n* marks a crossover. Assumptions: ${input.settings}.`)}
${figureBlock("instances", "Instances: per-instance classical time to solution against the per-instance quantum prediction at the largest size with both; Spearman's rank correlation in the legend.")}
<h2>Rules that excluded sizes or withheld verdicts</h2>
<ul>
<li>Fixed-cost floor: ${escapeHtml(floorRule(floorFactor))}.</li>
<li>Fit range: ${escapeHtml(spec.report.fitFrom === null ? FIT_FROM_RULE : `n >= ${spec.report.fitFrom}`)}; sizes whose quantile is censored are left out and named.</li>
<li>Exponential or polynomial: ${escapeHtml(GROWTH_MODEL_RULE)}.</li>
<li>Run lengths: ${escapeHtml(RUN_LENGTH_RULE)}.</li>
<li>Verdicts: ${escapeHtml(SPEEDUP_RULE)}</li>
</ul>
<h2>Caveats by fit (median)</h2>
${exclusions.length === 0 ? "<p>None.</p>" : `<ul>\n${exclusions.join("\n")}\n</ul>`}
<h2>Files</h2>
<ul>
${LINKED_FILES.map((f) => `<li><a href="${escapeHtml(f)}">${escapeHtml(f)}</a></li>`).join("\n")}
</ul>
</body>
</html>
`;
}
