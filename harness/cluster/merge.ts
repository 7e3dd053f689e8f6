/**
 * Joins shard folders of one study into a single output folder: checks that every shard belongs to the same
 * study, that each shard number appears exactly once, and that no cell is missing or doubled; then writes the
 * merged journal, from which all tables are rebuilt.
 */
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { InputError } from "../errors.js";
import { readJournal, type JournalRecord } from "../engine/journal.js";
import { type StudySpec, cellsOfInstance, instancesOf } from "../engine/study.js";
import { writeFileAtomic } from "../engine/files.js";
import { OUT_FILES, readStudyFolder } from "../engine/output-folder.js";
import { describeBuild, sameStreams, type BuildStamp } from "../engine/build-info.js";

/** What a merge produced. */
export interface MergeResult {
  readonly spec: StudySpec;
  readonly records: JournalRecord[];
  readonly shards: number;
  /** The build stamp of the shards (all share one stream scheme). */
  readonly build: Partial<BuildStamp> | undefined;
}

/** Reads and checks shard folders; returns the merged records (throws InputError naming the problem). */
export function mergeShards(dirs: ReadonlyArray<string>): MergeResult {
  if (dirs.length === 0) throw new InputError("merge: give at least one shard folder");
  const first = readStudyFolder(dirs[0]);
  const specText = JSON.stringify(first.spec);
  const count = first.shard?.count ?? 1;
  const seenShard = new Map<number, string>();
  const byKey = new Map<string, { record: JournalRecord; dir: string }>();
  for (const dir of dirs) {
    const { spec, shard } = readStudyFolder(dir);
    if (JSON.stringify(spec) !== specText) throw new InputError(`${dir}: belongs to a different study than ${dirs[0]} (spec.json differs)`);
    const build = readStudyFolder(dir).build;
    if (!sameStreams(build, first.build)) {
      throw new InputError(`${dir}: made by ${describeBuild(build)}, but ${dirs[0]} by ${describeBuild(first.build)}: their random streams differ, so the shards do not form one study`);
    }
    const k = shard?.k ?? 1;
    if ((shard?.count ?? 1) !== count) throw new InputError(`${dir}: is shard ${k}/${shard?.count ?? 1} but ${dirs[0]} has ${count} shards`);
    const earlier = seenShard.get(k);
    if (earlier !== undefined) throw new InputError(`${dir}: shard ${k}/${count} given twice (also ${earlier})`);
    seenShard.set(k, dir);
    const journal = readJournal(join(dir, OUT_FILES.journal));
    for (const record of journal.records) {
      const prior = byKey.get(record.key);
      if (prior) throw new InputError(`${dir}: cell ${record.key} is also in ${prior.dir} (a cell may be run by one shard only)`);
      byKey.set(record.key, { record, dir });
    }
  }
  const missingShards: number[] = [];
  for (let k = 1; k <= count; k++) if (!seenShard.has(k)) missingShards.push(k);
  if (missingShards.length > 0) throw new InputError(`merge: shard${missingShards.length > 1 ? "s" : ""} ${missingShards.join(", ")} of ${count} missing`);
  const missingCells: string[] = [];
  for (const inst of instancesOf(first.spec)) {
    for (const cell of cellsOfInstance(first.spec, inst)) if (!byKey.has(cell.key)) missingCells.push(cell.key);
  }
  if (missingCells.length > 0) {
    throw new InputError(`merge: ${missingCells.length} cell(s) not finished in any shard (first: ${missingCells[0]}); rerun the shard that owns them`);
  }
  return { spec: first.spec, records: [...byKey.values()].map((v) => v.record), shards: count, build: first.build };
}

/** Writes a merged folder's spec and journal (refusing a folder that holds another study). */
export function writeMerged(out: string, merged: MergeResult): void {
  const specPath = join(out, OUT_FILES.spec);
  const identity = JSON.stringify({ spec: merged.spec, shard: null, build: merged.build }, null, 2) + "\n";
  if (existsSync(specPath) && JSON.stringify((JSON.parse(readFileSync(specPath, "utf8")) as { spec: unknown }).spec) !== JSON.stringify(merged.spec)) {
    throw new InputError(`${out}: holds a different study (see its ${OUT_FILES.spec}); merge into another folder`);
  }
  writeFileAtomic(specPath, identity);
  writeFileAtomic(join(out, OUT_FILES.journal), merged.records.map((r) => JSON.stringify(r)).join("\n") + "\n");
}
