/**
 * The output folder of a study, owned here for run, merge, compare and report: the names of its files, and
 * reading and writing its spec.json (the frozen study it holds, compared as text so that a rerun resumes
 * the same study and never mixes two).
 */
import { existsSync, mkdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "./files.js";
import type { StudySpec } from "./study.js";

/** Which shard of a study a folder holds (null = all of it). */
export type ShardRef = { readonly k: number; readonly count: number } | null;

/** File names inside an output folder. */
export const OUT_FILES = {
  spec: "spec.json",
  journal: "journal.jsonl",
  manifest: "manifest.json",
  instances: "instances.csv",
  runs: "runs.csv",
  predictions: "predictions.csv",
  sizes: "sizes.csv",
  fits: "fits.csv",
  comparison: "comparison.csv",
  latex: "table.tex",
  markdown: "table.md",
  studyPage: "report.html",
} as const;

/** The figures of a study (issue 13): work, time and per-instance comparison. */
export type FigureKind = "work" | "time" | "instances";

/** File name of one figure of a family. */
export function figureFile(kind: FigureKind, family: string): string {
  return `${kind}-${family}.svg`;
}

/**
 * Checks the output folder: creates it, or, when it already holds a study, insists it is the same study
 * (compared on the resolved spec, not the command line), so that a rerun resumes instead of mixing studies.
 */
export function prepareOutput(spec: StudySpec, out: string, shard: ShardRef): void {
  try {
    mkdirSync(out, { recursive: true });
  } catch (e) {
    throw new InputError(`--out: cannot create '${out}' (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
  }
  const specPath = join(out, OUT_FILES.spec);
  const identity = JSON.stringify({ spec, shard }, null, 2) + "\n";
  if (existsSync(specPath)) {
    const previous = readFileSync(specPath, "utf8");
    if (previous !== identity) {
      throw new InputError(`--out: '${out}' holds a different study (see its ${OUT_FILES.spec}); choose another folder or remove it`);
    }
    return;
  }
  try {
    writeFileAtomic(specPath, identity);
  } catch (e) {
    throw new InputError(`--out: cannot write in '${out}' (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
  }
}

/** Reads the study spec a folder holds (spec.json), for `report`, `compare` and `merge`. */
export function readStudyFolder(dir: string): { spec: StudySpec; shard: { k: number; count: number } | null } {
  const path = join(dir, OUT_FILES.spec);
  if (!existsSync(dir)) throw new InputError(`${dir}: folder does not exist`);
  if (!existsSync(path)) throw new InputError(`${dir}: not a speedbound output folder (no spec.json)`);
  try {
    return JSON.parse(readFileSync(path, "utf8")) as { spec: StudySpec; shard: { k: number; count: number } | null };
  } catch {
    throw new InputError(`${path}:1: spec.json does not parse`);
  }
}
