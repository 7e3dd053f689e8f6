/** File helpers: every table is written to a temporary name and renamed, so readers never see half a file. */
import { renameSync, writeFileSync } from "node:fs";

/** Writes `data` to `path` atomically (temporary file in the same folder, then rename). */
export function writeFileAtomic(path: string, data: string): void {
  const tmp = `${path}.tmp-${process.pid}`;
  writeFileSync(tmp, data);
  renameSync(tmp, path);
}
