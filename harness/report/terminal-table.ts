/**
 * The comparison as an aligned plain-text table (printed at the end of `run`), and the number formats the
 * paper tables (latex.ts, markdown.ts) share with it.
 */
import type { ComparisonRow } from "./comparison.js";
import { footnoteLines, footnoteMarks, rowMarks } from "./footnotes.js";
import type { FlagCode } from "./comparison.js";

/** Horizontal alignment of a column. */
export type Align = "left" | "right";

/** One column of the comparison tables: plain-text header, alignment, and the cell text of a row. */
export interface ComparisonColumn {
  readonly header: string;
  readonly align: Align;
  readonly cell: (row: ComparisonRow, marks: ReadonlyMap<FlagCode, string>) => string;
}

/** Fixed-point number or "–" for missing. */
export function formatNumber(x: number | null | undefined, digits = 3): string {
  return x === null || x === undefined || !Number.isFinite(x) ? "–" : x.toFixed(digits);
}

/** "value [low, high]", with "–" for a missing end; "–" alone when the value is missing. */
export function formatInterval(
  value: number | null,
  low: number | null,
  high: number | null,
  digits = 3,
): string {
  if (value === null || !Number.isFinite(value)) return "–";
  if (low === null && high === null) return formatNumber(value, digits);
  return `${formatNumber(value, digits)} [${formatNumber(low, digits)}, ${high === null ? "∞" : formatNumber(high, digits)}]`;
}

const MINUTE = 60;
const HOUR = 3600;
const DAY = 86400;
/** Julian year in seconds. */
const YEAR = 365.25 * DAY;

/** Seconds in a readable unit: "12.3 s", "4.5 min", "7.1 h", "3.2 d", "41 yr", "2.1e+05 yr"; "–" when missing. */
export function formatSeconds(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds)) return "–";
  if (seconds < 1e-3) return `${seconds.toExponential(1)} s`;
  if (seconds < MINUTE) return `${seconds.toPrecision(3)} s`;
  if (seconds < HOUR) return `${(seconds / MINUTE).toPrecision(3)} min`;
  if (seconds < DAY) return `${(seconds / HOUR).toPrecision(3)} h`;
  if (seconds < YEAR) return `${(seconds / DAY).toPrecision(3)} d`;
  const years = seconds / YEAR;
  return years < 1e4 ? `${years.toPrecision(3)} yr` : `${years.toExponential(1)} yr`;
}

/** The crossover cell: n* to one decimal (labelled when extrapolated), or the status in words. */
export function formatCrossover(row: ComparisonRow): string {
  if (row.crossover_n !== null) return row.extrapolated ? `${row.crossover_n.toFixed(1)} (extrapolated)` : row.crossover_n.toFixed(1);
  if (row.crossover === "quantum faster throughout") return "below range";
  return row.crossover;
}

/** The verdict with its footnote marks: "quadratic [a,c]". */
export function verdictCell(row: ComparisonRow, marks: ReadonlyMap<FlagCode, string>): string {
  const m = rowMarks(row, marks);
  return m === "" ? row.speedup_label : `${row.speedup_label} [${m}]`;
}

/** Columns of the comparison in every table format (plain-text headers). */
export const COMPARISON_TABLE_COLUMNS: ReadonlyArray<ComparisonColumn> = [
  { header: "family", align: "left", cell: (r) => r.family },
  { header: "basis", align: "left", cell: (r) => r.basis },
  { header: "classical", align: "left", cell: (r) => `${r.solver}${r.strongest_classical ? "*" : ""} (${r.classical_measure || "–"})` },
  { header: "a_classical [95%]", align: "right", cell: (r) => formatInterval(r.exponent_classical, r.exponent_classical_low, r.exponent_classical_high) },
  { header: "quantum", align: "left", cell: (r) => `${r.predictor} (${r.quantum_measure})` },
  { header: "a_quantum [95%]", align: "right", cell: (r) => formatInterval(r.exponent_quantum, r.exponent_quantum_low, r.exponent_quantum_high) },
  { header: "ratio", align: "right", cell: (r) => formatInterval(r.exponent_ratio, r.exponent_ratio_low, r.exponent_ratio_high, 2) },
  { header: "verdict", align: "left", cell: verdictCell },
  { header: "n*", align: "right", cell: (r) => (r.basis === "time" ? formatCrossover(r) : "") },
  { header: "time at n*", align: "right", cell: (r) => (r.basis === "time" ? formatSeconds(r.crossover_seconds) : "") },
];

/**
 * Aligned plain-text table: columns separated by two spaces, a dashed rule under the header.
 * Widths count UTF-16 code units (the cells are ASCII apart from "–", "∞" and "≤", one unit each).
 */
export function alignedTable(
  headers: ReadonlyArray<string>,
  rows: ReadonlyArray<ReadonlyArray<string>>,
  align: ReadonlyArray<Align>,
): string {
  const widths = headers.map((h, c) => Math.max(h.length, ...rows.map((r) => (r[c] ?? "").length)));
  const line = (cells: ReadonlyArray<string>): string =>
    cells
      .map((cell, c) => (align[c] === "right" ? cell.padStart(widths[c]!) : cell.padEnd(widths[c]!)))
      .join("  ")
      .trimEnd();
  return [line(headers), widths.map((w) => "-".repeat(w)).join("  "), ...rows.map(line)].join("\n") + "\n";
}

/**
 * The comparison as an aligned plain-text table (no legend: print {@link comparisonLegend} under it).
 * @param rows - comparison.csv rows.
 * @returns the table, ending with a newline.
 */
export function comparisonTerminalTable(rows: ReadonlyArray<ComparisonRow>): string {
  const cols = COMPARISON_TABLE_COLUMNS;
  const marks = footnoteMarks(rows);
  const table = alignedTable(
    cols.map((c) => c.header),
    rows.map((r) => cols.map((c) => c.cell(r, marks))),
    cols.map((c) => c.align),
  );
  const notes = footnoteLines(marks);
  return notes.length === 0 ? table : `${table}${notes.join("\n")}\n`;
}

/** One-line legend under every comparison table (exponents, the star, the parallelism and quantile). */
export function comparisonLegend(rows: ReadonlyArray<ComparisonRow>, settings: string = ""): string {
  const parallelism = [...new Set(rows.map((r) => r.parallelism))].join(", ") || "1";
  const quantile = [...new Set(rows.map((r) => r.quantile))].join(", ") || "0.5";
  return (
    `a = fitted exponent of log2 cost per variable (quantile ${quantile} over instances), 95% bootstrap interval; ` +
    `ratio = a_classical/a_quantum (2 = quadratic), like measures only: work rows compare elementary operations with queries ` +
    `(amplified solvers: expected work with work), time rows classical seconds / S with predicted quantum seconds; ` +
    `* = lowest classical exponent on the row's basis; classical time divided by S = ${parallelism}.` +
    (settings === "" ? "" : ` Settings: ${settings}.`)
  );
}
