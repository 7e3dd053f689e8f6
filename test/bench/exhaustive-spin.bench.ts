/**
 * Benchmark of the exact spin enumeration: configurations covered per second (mirror partners counted) for SK at
 * n = 24, 26, 28 on one thread, and the ratio to the reference plain single-threaded C Gray-code enumerator
 * measured on this machine at 4.7–6×10^8 configurations covered per second (issue 3's target: at least half of it).
 * Also prints, for the record, the plain per-flip Gray-code kernel on the same SK model, the low-block size sweep
 * behind SPIN_LOW_BITS_DEFAULT, and the 3-spin rates of the walsh and plain kernels. Plain timing loops (tinybench's sampling does not fit
 * runs of a second). Runs in about 20–40 s.
 */
import { performance } from "node:perf_hooks";
import process from "node:process";
import { pspinFamily } from "../../harness/families/pspin.js";
import { skFamily } from "../../harness/families/sk.js";
import type { Ising } from "../../harness/model/ising.js";
import { SPIN_LOW_BITS_DEFAULT, type SpinExactOptions, exhaustiveSpinSlice } from "../../solvers/exhaustive-spin.js";

/** The C reference rate, low end of the measured range (configurations covered per second). */
const C_REFERENCE = 4.7e8;
const TOL = 1e-9;

function ising(p: ReturnType<typeof skFamily.generate>): Ising {
  if (p.problem.kind !== "ising") throw new Error("ising expected");
  return p.problem.ising;
}

interface Rate {
  /** Configurations covered per second of wall time, best of the repeats. */
  rate: number;
  /** The same per second of this process's CPU time (user + system), best of the repeats: on a machine shared
   * with other jobs this is the figure to compare with a single-threaded C run on an idle core. */
  cpuRate: number;
  seconds: number;
  optimum: number;
}

/** Best of `repeats` runs (the least disturbed by other processes on a shared machine). */
function rate(model: Ising, mirror: boolean, options: SpinExactOptions, repeats: number): Rate {
  const out: Rate = { rate: 0, cpuRate: 0, seconds: Infinity, optimum: 0 };
  for (let r = 0; r < repeats; r++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const res = exhaustiveSpinSlice(model, 0, 0, mirror, TOL, null, options);
    const dt = (performance.now() - t0) / 1000;
    const c1 = process.cpuUsage(c0);
    const cpu = Math.max((c1.user + c1.system) / 1e6, 1e-6);
    out.optimum = res.optimum;
    if (res.assignments / dt > out.rate) {
      out.rate = res.assignments / dt;
      out.seconds = dt;
    }
    out.cpuRate = Math.max(out.cpuRate, res.assignments / cpu);
  }
  return out;
}

const fmt = (x: number): string => x.toExponential(2);

/** Prints the figures. */
export async function run(): Promise<void> {
  console.log("exhaustive-spin: configurations covered per second (mirror partners counted), one thread");
  // Warm-up so that the JIT has compiled the kernels before timing.
  rate(ising(skFamily.generate("bench", {}, 22, 0)), true, {}, 3);

  console.log(`\nSK (Gaussian), pairs kernel, lowBits ${SPIN_LOW_BITS_DEFAULT}, mirror on;`);
  console.log(`ratio = rate / C reference ${fmt(C_REFERENCE)}/s (target ≥ 0.5):`);
  for (const n of [24, 26, 28]) {
    const model = ising(skFamily.generate("bench", {}, n, 0));
    const r = rate(model, true, {}, n === 28 ? 3 : 5);
    const wall = `wall ${fmt(r.rate)}/s, ratio ${(r.rate / C_REFERENCE).toFixed(2)}`;
    const cpu = `CPU ${fmt(r.cpuRate)}/s, ratio ${(r.cpuRate / C_REFERENCE).toFixed(2)}`;
    console.log(`  n=${n}: ${wall};  ${cpu}  (${r.seconds.toFixed(3)} s per 2^${n}; E0/n = ${(r.optimum / n).toFixed(4)})`);
  }

  console.log("\nLow-block size sweep, SK n=26, mirror on:");
  const m26 = ising(skFamily.generate("bench", {}, 26, 0));
  for (const lowBits of [8, 10, 12, 14, 16]) {
    const r = rate(m26, true, { lowBits }, 3);
    console.log(`  lowBits=${lowBits}: wall ${fmt(r.rate)}/s, CPU ${fmt(r.cpuRate)}/s`);
  }

  console.log("\nFor the record, same SK n=24 model:");
  const m24 = ising(skFamily.generate("bench", {}, 24, 0));
  const plain = rate(m24, true, { kernel: "terms" }, 2);
  const block = rate(m24, true, {}, 3);
  console.log(`  plain per-flip Gray code (terms kernel), mirror on: CPU ${fmt(plain.cpuRate)}/s`);
  console.log(`  pairs kernel without the mirror: CPU ${fmt(rate(m24, false, {}, 3).cpuRate)}/s`);
  console.log(`  pairs kernel / plain Gray code: ${(block.cpuRate / plain.cpuRate).toFixed(1)}× (CPU rates)`);

  console.log("\n3-spin (dense p-spin, p = 3), no mirror:");
  for (const n of [20, 24]) {
    const p3 = ising(pspinFamily.generate("bench", { p: 3 }, n, 0));
    const walsh = rate(p3, false, { kernel: "walsh" }, n === 20 ? 8 : 2);
    const line = `  n=${n} (${p3.coefficients.length} terms): walsh kernel CPU ${fmt(walsh.cpuRate)}/s`;
    if (n === 20) {
      const terms = rate(p3, false, { kernel: "terms" }, 1);
      console.log(`${line}; plain Gray code (terms kernel) CPU ${fmt(terms.cpuRate)}/s; ratio ${(walsh.cpuRate / terms.cpuRate).toFixed(0)}×`);
    } else console.log(line);
  }
}
