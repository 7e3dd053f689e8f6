/**
 * The comparison as a Markdown table (table.md): one header row, one alignment row, one row per comparison,
 * then the legend paragraph. Same columns as the terminal and LaTeX tables.
 */
import type { ComparisonRow } from "./comparison.js";
import { COMPARISON_TABLE_COLUMNS, comparisonLegend } from "./terminal-table.js";
import { footnoteLines, footnoteMarks } from "./footnotes.js";

/** Escapes a cell for a GitHub-flavoured Markdown table (pipes, backslashes, line breaks, emphasis stars). */
export function escapeMarkdownCell(text: string): string {
  return text.replace(/\\/g, "\\\\").replace(/\|/g, "\\|").replace(/\*/g, "\\*").replace(/\r?\n/g, " ");
}

/**
 * The comparison as a Markdown table.
 * @param rows - comparison.csv rows, in the order to print.
 * @returns the table, a blank line and the legend, ending with a newline.
 */
export function comparisonMarkdown(rows: ReadonlyArray<ComparisonRow>, settings: string = ""): string {
  const cols = COMPARISON_TABLE_COLUMNS;
  const marks = footnoteMarks(rows);
  const line = (cells: ReadonlyArray<string>): string => `| ${cells.join(" | ")} |`;
  const out = [
    line(cols.map((c) => escapeMarkdownCell(c.header))),
    line(cols.map((c) => (c.align === "right" ? "---:" : ":---"))),
    ...rows.map((r) => line(cols.map((c) => escapeMarkdownCell(c.cell(r, marks))))),
    "",
    ...footnoteLines(marks).map((l) => `${escapeMarkdownCell(l)}  `),
    ...(marks.size > 0 ? [""] : []),
    escapeMarkdownCell(comparisonLegend(rows, settings)),
  ];
  return out.join("\n") + "\n";
}
