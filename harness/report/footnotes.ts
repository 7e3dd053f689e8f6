/**
 * Footnote marks for the caveats of comparison rows (issue 13: caveats travel with the numbers). Every table
 * format (terminal, Markdown, LaTeX, the study page) prints the same marks, assigned a, b, c, … in order of first
 * appearance in the table, and the same footnote lines under it.
 */
import { FOOTNOTES, type ComparisonRow, type FlagCode } from "./comparison.js";

/** Marks of the codes that occur in `rows`, in order of first appearance. */
export function footnoteMarks(rows: ReadonlyArray<ComparisonRow>): Map<FlagCode, string> {
  const marks = new Map<FlagCode, string>();
  for (const r of rows) {
    for (const code of codesOf(r)) {
      if (!marks.has(code)) marks.set(code, String.fromCharCode(97 + marks.size));
    }
  }
  return marks;
}

/** The caveat codes of a row. */
export function codesOf(row: ComparisonRow): FlagCode[] {
  return row.flags === "" ? [] : (row.flags.split(";").filter((c) => c in FOOTNOTES) as FlagCode[]);
}

/** The marks of one row, e.g. "a,c" ("" when none). */
export function rowMarks(row: ComparisonRow, marks: ReadonlyMap<FlagCode, string>): string {
  return codesOf(row)
    .map((c) => marks.get(c))
    .filter((m): m is string => m !== undefined)
    .join(",");
}

/** One line per mark: "a: text". */
export function footnoteLines(marks: ReadonlyMap<FlagCode, string>): string[] {
  return [...marks].map(([code, mark]) => `${mark}: ${FOOTNOTES[code]}`);
}
