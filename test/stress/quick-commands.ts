/**
 * The long stress count of issue 14 (run by .ci/run, and by hand): `node dist/test/stress/quick-commands.js [COUNT]`
 * runs COUNT quick commands (default 1000: solve, a tiny run, spectral and bare pool start/stop cycles in rotation,
 * two at a time) and exits 1 when any of them ended abnormally (a signal, exit 134, or a non-zero exit code).
 */
import { stressQuickCommands } from "../helpers/stress.js";

const count = Number(process.argv[2] ?? 1000);
const started = Date.now();
const r = await stressQuickCommands(count, 2);
const seconds = ((Date.now() - started) / 1000).toFixed(0);
console.log(`stress: ${r.commands} quick commands (${Object.entries(r.byKind).map(([k, v]) => `${k} ${v}`).join(", ")}) in ${seconds} s, Node ${process.version}: ${r.abnormal.length} abnormal exits`);
for (const a of r.abnormal.slice(0, 20)) console.log(`  ${a.kind}: code ${a.code} signal ${a.signal}: ${a.stderr}`);
process.exitCode = r.abnormal.length === 0 ? 0 : 1;
