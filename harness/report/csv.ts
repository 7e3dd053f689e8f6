/**
 * Tidy CSV output (csv-stringify): fixed column order (the given leading columns, then the others in order of
 * first appearance), empty cells for missing values, full double precision.
 */
import { stringify } from "csv-stringify/sync";
import { writeFileAtomic } from "../engine/files.js";

type Row = object;

/** Column order: `leading` first, then every other key in the order rows first show it. */
export function columnsOf(rows: ReadonlyArray<Row>, leading: ReadonlyArray<string>): string[] {
  const cols = [...leading];
  const seen = new Set(cols);
  for (const r of rows) for (const k of Object.keys(r)) if (!seen.has(k)) {
    seen.add(k);
    cols.push(k);
  }
  return cols;
}

/** Renders rows as CSV text with a header line. */
export function toCsv(rows: ReadonlyArray<Row>, leading: ReadonlyArray<string>): string {
  const columns = columnsOf(rows, leading);
  return stringify(
    rows.map((r) => columns.map((c) => cellText((r as Record<string, unknown>)[c]))),
    { header: true, columns },
  );
}

/** Writes rows to a CSV file atomically. */
export function writeCsv(path: string, rows: ReadonlyArray<Row>, leading: ReadonlyArray<string>): void {
  writeFileAtomic(path, toCsv(rows, leading));
}

function cellText(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return Number.isFinite(v) ? String(v) : "";
  if (typeof v === "boolean") return v ? "true" : "false";
  return String(v);
}
