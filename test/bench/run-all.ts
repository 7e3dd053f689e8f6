/**
 * `npm run bench`: runs every benchmark module in this folder (compiled to dist/test/bench/*.bench.js) in turn
 * and prints their figures. Benchmarks are never part of `npm test` (timings on a shared machine are noisy).
 * Pass names to run a subset: `npm run bench -- exhaustive-cnf pool`.
 */
import { readdirSync } from "node:fs";
import { fileURLToPath, pathToFileURL } from "node:url";
import { join } from "node:path";
import { cpus } from "node:os";

const here = fileURLToPath(new URL(".", import.meta.url));
const wanted = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith(".bench.js"))
  .filter((f) => wanted.length === 0 || wanted.some((w) => f.startsWith(w)))
  .sort();

console.log(`speedbound benchmarks on ${cpus()[0]?.model ?? "unknown CPU"} (${cpus().length} cores), Node ${process.version}`);
for (const f of files) {
  console.log(`\n=== ${f.replace(/\.bench\.js$/, "")} ===`);
  const mod = (await import(pathToFileURL(join(here, f)).href)) as { run: () => Promise<void> };
  const started = Date.now();
  await mod.run();
  console.log(`(${((Date.now() - started) / 1000).toFixed(1)} s)`);
}
