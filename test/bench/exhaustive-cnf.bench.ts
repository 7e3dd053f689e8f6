/**
 * Single-threaded throughput of the exact CNF kernel (solvers/exhaustive-cnf.ts) against the target of issue 2:
 * at least the speed of a careful single-threaded C enumerator of the same kind, measured on this machine at
 * 3.7–6.1·10^10 assignments/s covered for random 3-SAT n = 28–34 at density 4.26 (with block skipping).
 *
 * Rates are assignments covered (2^n per instance) over wall time, summed over seeded instances, in three
 * settings: the default (tree skipping), the plain bit-parallel Gray-code enumerator with single-block
 * skipping (`skipping: "block"`), and lane-width sweeps that justify CNF_EXACT_LANE_BITS and
 * CNF_EXACT_BLOCK_LANE_BITS.
 * Plain timing loops rather than tinybench: one call is a whole enumeration (milliseconds to a second), and the
 * spread between instances, not between repetitions, is what matters. The multi-worker figure is added by the
 * pool benchmark.
 */
import { cnfFromClauses, type Cnf } from "../../harness/model/cnf.js";
import { deriveSeed, Rng } from "../../harness/random.js";
import {
  type CnfExactOptions,
  CNF_EXACT_BLOCK_LANE_BITS,
  CNF_EXACT_LANE_BITS,
  exhaustiveCnfSlice,
} from "../../solvers/exhaustive-cnf.js";

/** The C enumerator's lower figure on this machine (issue 2). */
const TARGET = 3.7e10;
/** Clause density of the benchmark instances (near the 3-SAT threshold). */
const DENSITY = 4.26;
/** Instances per size, and timed runs of each. */
const INSTANCES = 12;
const REPEATS = 3;

/** Uniform random 3-SAT: 3 distinct variables a clause, random signs (drawn here so the bench stands alone). */
function random3Sat(n: number, rng: Rng): Cnf {
  const clauses: number[][] = [];
  for (let c = 0; c < Math.round(DENSITY * n); c++) {
    const vars: number[] = [];
    while (vars.length < 3) {
      const v = 1 + rng.below(n);
      if (!vars.includes(v)) vars.push(v);
    }
    clauses.push(vars.map((v) => (rng.bit() === 1 ? v : -v)));
  }
  return cnfFromClauses(n, clauses);
}

function instances(n: number): Cnf[] {
  return Array.from({ length: INSTANCES }, (_, i) => random3Sat(n, new Rng(deriveSeed("bench-exhaustive-cnf", n, i))));
}

interface Measured {
  /** Total assignments over total seconds. */
  rate: number;
  /** Median over instances of the per-instance rate. */
  median: number;
  seconds: number;
  satisfiable: number;
}

/**
 * Times each instance REPEATS times and keeps its fastest run: on a shared machine the minimum filters out
 * preemption by other processes, which only ever adds time.
 */
function measure(formulas: Cnf[], options: CnfExactOptions): Measured {
  let assignments = 0;
  let ns = 0;
  let satisfiable = 0;
  const rates: number[] = [];
  for (const cnf of formulas) {
    let fastest = Infinity;
    let covered = 0;
    let optimum = 0;
    for (let rep = 0; rep < REPEATS; rep++) {
      const t0 = process.hrtime.bigint();
      const r = exhaustiveCnfSlice(cnf, 0, 0, null, options);
      fastest = Math.min(fastest, Number(process.hrtime.bigint() - t0));
      covered = r.assignments;
      optimum = r.optimum;
    }
    assignments += covered;
    ns += fastest;
    rates.push((covered / Math.max(fastest, 1)) * 1e9);
    if (optimum === 0) satisfiable++;
  }
  rates.sort((a, b) => a - b);
  const median = (rates[(rates.length - 1) >> 1] + rates[rates.length >> 1]) / 2;
  return { rate: (assignments / ns) * 1e9, median, seconds: ns / 1e9, satisfiable };
}

function report(label: string, n: number, m: Measured): void {
  console.log(
    `  ${label.padEnd(24)} n=${n}  ${m.rate.toExponential(2)} assignments/s (median instance ${m.median.toExponential(2)})` +
      `  ×${(m.rate / TARGET).toFixed(2)} of 3.7e10  [${m.satisfiable}/${INSTANCES} sat, ${m.seconds.toFixed(2)} s]`,
  );
}

/** Prints assignments/s single-threaded for n = 28, 30, 32 and the ratio to the C enumerator's 3.7e10/s. */
export async function run(): Promise<void> {
  console.log(`exhaustive-cnf: random 3-SAT, density ${DENSITY}, ${INSTANCES} instances per n, 1 thread`);
  // Warm-up: lets the optimiser compile the hot loops of both modes before anything is timed.
  const warm = instances(24);
  measure(warm, {});
  measure(warm, { skipping: "block" });
  for (const n of [28, 30, 32]) {
    const formulas = instances(n);
    report(`tree, ${CNF_EXACT_LANE_BITS} lane bits (default)`, n, measure(formulas, {}));
    report(`block, ${CNF_EXACT_BLOCK_LANE_BITS} lane bits`, n, measure(formulas, { skipping: "block" }));
  }
  // Tree-skipping runs at n ≤ 32 last about a millisecond, too short to rank lane widths; n = 36 lasts longer.
  console.log("  lane-width sweep, tree skipping, n=36:");
  const sweep = instances(36);
  for (const laneBits of [4, 5, 6, 7, 8, 10]) report(`tree, ${laneBits} lane bits`, 36, measure(sweep, { laneBits }));
  console.log("  lane-width sweep, block skipping, n=28:");
  const sweepBlock = instances(28);
  for (const laneBits of [8, 10, 12, 14]) {
    report(`block, ${laneBits} lane bits`, 28, measure(sweepBlock, { skipping: "block", laneBits }));
  }
}

// Run directly: node dist/test/bench/exhaustive-cnf.bench.js
if (process.argv[1]?.endsWith("exhaustive-cnf.bench.js")) await run();
