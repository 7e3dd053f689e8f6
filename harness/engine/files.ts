/** File helpers: every table is written to a temporary name and renamed, so readers never see half a file. */
import { renameSync, unlinkSync, writeFileSync } from "node:fs";
import { writeFailure } from "./fs-guard.js";

/** Writes `data` to `path` atomically (temporary file in the same folder, then rename). */
export function writeFileAtomic(path: string, data: string): void {
  const tmp = `${path}.tmp-${process.pid}`;
  try {
    writeFileSync(tmp, data);
    renameSync(tmp, path);
  } catch (e) {
    // A full disk or a read-only folder: leave no temporary file behind, and say so in one line.
    try {
      unlinkSync(tmp);
    } catch {
      // never created
    }
    throw writeFailure(e, path) ?? e;
  }
}
