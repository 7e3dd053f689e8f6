/**
 * Which build made an output folder, and whether this build may add to it. spec.json records the tool version and
 * the version of the seed/stream scheme; a folder is resumed (or merged, or compared as one study) only by a build
 * with the same stream scheme, since cells drawn from other streams would mix two different random experiments.
 */
import { InputError } from "../errors.js";
import { gitCommit, packageVersion } from "./manifest.js";

/**
 * Version of the seed and random-stream scheme: instance seeds (harness/random.ts deriveSeed), trial streams
 * (solvers/walk.ts trialKey/trialRng), generator draws. Raise it with every change that makes the same
 * (spec, cell) draw different numbers. History: 1 = per-trial SHA-256 seeds (before commit 44b8b8a);
 * 2 = one SHA-256 key per cell, then a SplitMix-style mix of the trial index (44b8b8a, the current scheme).
 */
export const STREAM_SCHEME = 2;

/** The build block written into spec.json. */
export interface BuildStamp {
  readonly tool: "speedbound";
  readonly version: string;
  readonly stream_scheme: number;
  readonly git_commit: string | null;
}

/** This build's stamp. */
export function buildStamp(): BuildStamp {
  return { tool: "speedbound", version: packageVersion(), stream_scheme: STREAM_SCHEME, git_commit: gitCommit() };
}

/** "speedbound 0.1.0 (stream scheme 2)", or a note that an older build recorded nothing. */
export function describeBuild(stamp: Partial<BuildStamp> | null | undefined): string {
  if (!stamp || stamp.stream_scheme === undefined) return "a build that recorded no stream scheme (before speedbound 0.1.0 stream scheme 2)";
  return `speedbound ${stamp.version ?? "?"} (stream scheme ${stamp.stream_scheme})`;
}

/** True when cells of the two builds come from the same random streams. */
export function sameStreams(a: Partial<BuildStamp> | null | undefined, b: Partial<BuildStamp> | null | undefined): boolean {
  return a?.stream_scheme !== undefined && a.stream_scheme === b?.stream_scheme;
}

/** Refuses to resume `folder` (made by `recorded`) with this build when their streams differ: one line naming both. */
export function assertResumable(folder: string, recorded: Partial<BuildStamp> | null | undefined): void {
  const current = buildStamp();
  if (sameStreams(recorded, current)) return;
  throw new InputError(
    `--out: '${folder}' was begun by ${describeBuild(recorded)}; this is ${describeBuild(current)}, whose random streams differ: resuming would mix them; use another folder or the build that began it`,
  );
}

/** For `compare`: a sentence when two runs come from builds with different random streams, else null. */
export function streamsNote(older: Partial<BuildStamp> | null | undefined, newer: Partial<BuildStamp> | null | undefined): string | null {
  if (sameStreams(older, newer)) return null;
  return `the runs come from builds with different random streams (old: ${describeBuild(older)}; new: ${describeBuild(newer)}): same seeds, different draws, so solver results differ cell by cell; compare their distributions only`;
}
