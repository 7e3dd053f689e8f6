/** `speedbound merge OUT DIRS..`: join the shard folders of one study. */
import { join, resolve } from "node:path";
import { EXIT } from "../../errors.js";
import { OUT_FILES } from "../../engine/output-folder.js";
import { writeOutputs } from "../../report/outputs.js";
import { buildManifest } from "../../engine/manifest.js";
import { writeFileAtomic } from "../../engine/files.js";
import { formatComparison } from "../../report/paper.js";
import { mergeShards, writeMerged } from "../../cluster/merge.js";
import { mkdirOrFail, type Args } from "./shared.js";

/** `speedbound merge OUT DIRS..`: join the shard folders of one study. */
export async function merge(argv: Args, rawArgs: ReadonlyArray<string>): Promise<number> {
  const out = resolve(String(argv.out));
  const dirs = ((argv.dirs as string[] | undefined) ?? []).map((d) => resolve(d));
  const merged = mergeShards(dirs);
  mkdirOrFail(out, "merge");
  writeMerged(out, merged);
  const started = new Date();
  const { paper } = await writeOutputs(merged.spec, out);
  writeFileAtomic(
    join(out, OUT_FILES.manifest),
    JSON.stringify(buildManifest({ argv: rawArgs, spec: merged.spec, workers: 0, shard: null, started, ended: new Date(), summary: null, extra: { merged_from: dirs } }), null, 2) + "\n",
  );
  process.stdout.write(formatComparison(paper) + "\n");
  process.stdout.write(`speedbound: merged ${merged.shards} shard(s), ${merged.records.length} cells, into ${out}\n`);
  return EXIT.ok;
}
