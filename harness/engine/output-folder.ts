/**
 * The output folder of a study, owned here for run, merge, compare and report: the names of its files, and
 * reading and writing its spec.json (the frozen study it holds, compared as text so that a rerun resumes
 * the same study and never mixes two). The build stamp it records and the stream-scheme check live in build-info.ts.
 */
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { InputError } from "../errors.js";
import { writeFileAtomic } from "./files.js";
import type { StudySpec } from "./study.js";
import { ensureWritableFolder } from "./fs-guard.js";
import { assertResumable, buildStamp, type BuildStamp } from "./build-info.js";

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
 * (compared on the resolved spec, not the command line), so that a rerun resumes instead of mixing studies,
 * and that this build draws the same random streams as the build that began it (spec.json's build stamp).
 */
export function prepareOutput(spec: StudySpec, out: string, shard: ShardRef): void {
  ensureWritableFolder(out, "--out"); // one level at a time: no recursive-mkdir spin (see fs-guard.ts)
  const specPath = join(out, OUT_FILES.spec);
  if (existsSync(specPath)) {
    let previous: { spec?: unknown; shard?: unknown; build?: Partial<BuildStamp> };
    try {
      previous = JSON.parse(readFileSync(specPath, "utf8")) as typeof previous;
    } catch {
      throw new InputError(`${specPath}:1: spec.json does not parse; choose another folder or remove it`);
    }
    if (JSON.stringify({ spec: previous.spec, shard: previous.shard }) !== JSON.stringify({ spec, shard })) {
      throw new InputError(`--out: '${out}' holds a different study (see its ${OUT_FILES.spec}); choose another folder or remove it`);
    }
    assertResumable(out, previous.build); // same study, but drawn from this build's streams?
    return;
  }
  writeFileAtomic(specPath, JSON.stringify({ spec, shard, build: buildStamp() }, null, 2) + "\n");
}

/** What a folder's spec.json holds: the study, its shard, and the build stamp (absent in folders of older builds). */
export interface StudyFolder {
  readonly spec: StudySpec;
  readonly shard: { k: number; count: number } | null;
  readonly build?: Partial<BuildStamp>;
}

/** Reads the study spec a folder holds (spec.json), for `report`, `compare` and `merge`. */
export function readStudyFolder(dir: string): StudyFolder {
  const path = join(dir, OUT_FILES.spec);
  if (!existsSync(dir)) throw new InputError(`${dir}: folder does not exist`);
  if (!existsSync(path)) throw new InputError(`${dir}: not a speedbound output folder (no spec.json)`);
  try {
    return JSON.parse(readFileSync(path, "utf8")) as StudyFolder;
  } catch {
    throw new InputError(`${path}:1: spec.json does not parse`);
  }
}
