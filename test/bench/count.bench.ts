/**
 * Exact model counting (solvers/count-cnf.ts) against Debian's clasp enumerating models (`clasp --models 0`),
 * the targets of issue 16:
 * 1. Whole-process time of `speedbound solve FILE --json` vs `clasp --models 0 -q FILE` on planted random 3-SAT
 *    at α = 4.2 (the tool's own generator, harness/families/ksat.ts), n = 70, 80, 90, 100, instances 0–2 of the
 *    seed, summed (model counts vary by orders of magnitude between instances, and so does clasp's time, which
 *    grows with the number of models it enumerates). Target: ≤ 0.1×
 *    clasp's time at n = 100. Both are timed by /usr/bin/time (wall and user+system CPU); the best of 3 runs for
 *    speedbound (the machine is shared: the minimum filters out preemption), one run for clasp (it takes
 *    seconds); the two counts must agree.
 * 2. All 1000 SATLIB uf50-218 counts in this process, one core. Target: < 30 s. clasp's total over the same files
 *    is printed beside it.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { ksatFamily } from "../../harness/families/ksat.js";
import { parseDimacs, writeDimacs } from "../../harness/formats/dimacs.js";
import { countModels } from "../../solvers/count-cnf.js";

// This module runs compiled, from dist/test/bench/: the CLI is dist/harness/cli/cli.js, the repository two levels up.
const CLI = fileURLToPath(new URL("../../harness/cli/cli.js", import.meta.url));
const REPO = resolve(fileURLToPath(new URL("../../..", import.meta.url)));
const SATLIB_DIR = resolve(REPO, "../shared/datasets/satlib");
const HAVE_SATLIB = existsSync(SATLIB_DIR);

/** Issue 16: speedbound's whole-process time at most this fraction of clasp's at n = 100. */
const RATIO_TARGET = 0.1;
/** Issue 16: every uf50-218 count, 1000 files, one core, under this many seconds. */
const SATLIB_TARGET_S = 30;
const SIZES = [70, 80, 90, 100];
/** Planted instances per size. */
const INSTANCES = 3;
/** clasp gets this long per formula before the bench gives up on it (s). */
const CLASP_TIMEOUT_S = 300;

interface Timed {
  wall: number;
  cpu: number;
  stdout: string;
}

/** Runs a command under /usr/bin/time; wall and user+system CPU seconds. */
function timed(cmd: string, args: string[]): Timed {
  const r = spawnSync("/usr/bin/time", ["-f", "TIME %e %U %S", "timeout", String(CLASP_TIMEOUT_S), cmd, ...args], { encoding: "utf8", maxBuffer: 1 << 26 });
  const m = /TIME (\S+) (\S+) (\S+)/.exec(r.stderr);
  if (!m) throw new Error(`could not time ${cmd}: ${r.stderr}`);
  return { wall: Number(m[1]), cpu: Number(m[2]) + Number(m[3]), stdout: r.stdout };
}

function claspCount(stdout: string): string | null {
  return /^c Models\s*:\s*(\d+)/m.exec(stdout)?.[1] ?? null;
}

export async function run(): Promise<void> {
  const haveClasp = spawnSync("clasp", ["--version"]).status === 0;
  const haveTime = spawnSync("/usr/bin/time", ["-f", "%e", "true"]).status === 0;
  if (!haveClasp) console.log("clasp not installed (apt-get install -y clasp): clasp columns skipped");
  const dir = mkdtempSync(join(tmpdir(), "sb-count-bench-"));
  try {
    if (haveTime) {
      console.log(`planted random 3-SAT, α = 4.2, instances 0–${INSTANCES - 1} of seed bench-count, times summed; seconds (wall / CPU)`);
      console.log("   n                       models   speedbound solve --json      clasp --models 0     ratio wall   ratio CPU");
      for (const n of SIZES) {
        let oursWall = 0;
        let oursCpu = 0;
        let claspWall = 0;
        let claspCpu = 0;
        let claspMissing = !haveClasp;
        const models: string[] = [];
        for (let index = 0; index < INSTANCES; index++) {
          const inst = ksatFamily.generate("bench-count", { k: 3, density: 4.2, planted: true, satisfiable: false, unique: false }, n, index);
          if (inst.problem.kind !== "cnf") throw new Error("expected CNF");
          const file = join(dir, `planted-${n}-${index}.cnf`);
          writeFileSync(file, writeDimacs(inst.problem.cnf));
          let best: Timed | null = null;
          for (let rep = 0; rep < 3; rep++) {
            const t = timed(process.execPath, [CLI, "solve", file, "--json"]);
            if (best === null || t.wall < best.wall) best = t;
          }
          const ours = best as Timed;
          oursWall += ours.wall;
          oursCpu += ours.cpu;
          const count = String((JSON.parse(ours.stdout) as { degeneracy: number | string }).degeneracy);
          models.push(count);
          if (claspMissing) continue;
          const c = timed("clasp", ["--models", "0", "-q", file]);
          const cm = claspCount(c.stdout);
          if (cm === null) {
            claspMissing = true;
            continue;
          }
          if (cm !== count) throw new Error(`n = ${n} instance ${index}: speedbound counts ${count}, clasp ${cm}`);
          claspWall += c.wall;
          claspCpu += c.cpu;
        }
        let claspText = haveClasp ? `no answer in ${CLASP_TIMEOUT_S} s` : "skipped";
        let ratio = "";
        if (!claspMissing) {
          claspText = `${claspWall.toFixed(2)} / ${claspCpu.toFixed(2)}`;
          ratio = `${(oursWall / claspWall).toFixed(3).padStart(10)}   ${(oursCpu / claspCpu).toFixed(3).padStart(9)}`;
          if (n === 100) ratio += `   (target ≤ ${RATIO_TARGET}: ${oursWall / claspWall <= RATIO_TARGET ? "met" : "NOT met"})`;
        }
        console.log(`${String(n).padStart(4)} ${models.join("+").padStart(28)}   ${`${oursWall.toFixed(2)} / ${oursCpu.toFixed(2)}`.padStart(22)}   ${claspText.padStart(18)}   ${ratio}`);
      }
    } else {
      console.log("/usr/bin/time not found: whole-process comparison skipped");
    }

    if (!HAVE_SATLIB) {
      console.log(`SATLIB not found at ${SATLIB_DIR}: uf50-218 figure skipped`);
      return;
    }
    const folder = join(SATLIB_DIR, "uf50-218");
    const files = readdirSync(folder).filter((f) => f.endsWith(".cnf")).sort();
    const formulas = files.map((f) => parseDimacs(readFileSync(join(folder, f), "utf8"), f));
    const start = process.hrtime.bigint();
    const counts: bigint[] = [];
    let nodes = 0;
    for (const cnf of formulas) {
      const r = countModels(cnf, null);
      counts.push(r.count);
      nodes += r.nodes;
    }
    const seconds = Number(process.hrtime.bigint() - start) / 1e9;
    const zero = counts.filter((c) => c === 0n).length;
    console.log(`\nSATLIB uf50-218: ${files.length} files counted in ${seconds.toFixed(2)} s on one core (${nodes} decisions; ${zero} with no model)` +
      `; target < ${SATLIB_TARGET_S} s: ${seconds < SATLIB_TARGET_S ? "met" : "NOT met"} (${(seconds / SATLIB_TARGET_S).toFixed(3)} of it)`);
    if (haveClasp && haveTime) {
      let claspWall = 0;
      let claspCpu = 0;
      let differ = 0;
      files.forEach((f, i) => {
        const c = timed("clasp", ["--models", "0", "-q", join(folder, f)]);
        claspWall += c.wall;
        claspCpu += c.cpu;
        if (claspCount(c.stdout) !== counts[i].toString()) differ++;
      });
      console.log(`clasp --models 0 over the same files: ${claspWall.toFixed(2)} s wall, ${claspCpu.toFixed(2)} s CPU (one process a file); counts differing: ${differ}`);
      console.log(`ratio speedbound (in-process) / clasp wall: ${(seconds / claspWall).toFixed(3)}`);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
