/**
 * Exact k-SAT / CNF ground truth by exhaustive enumeration: the minimum number of violated clauses over a slice
 * of the 2^n assignments and the number of assignments reaching it (the model count when the minimum is 0).
 *
 * Method (numbered as in the code):
 * 1. Preparation. The top `prefixBits` variables are fixed by the slice; clauses they satisfy are dropped, their
 *    false literals removed, repeated literals merged and tautologies dropped. The remaining ("free") variables
 *    are ordered greedily, and the last `laneBits` of that order form a block of 2^laneBits "lanes" evaluated
 *    bit-parallel in 32-bit words; the others ("high" positions) are enumerated. Every clause splits into a lane
 *    part and a high part and keeps a counter of its true high literals; while that counter is 0 the clause is
 *    violated exactly on the lanes where its lane part is false, a mask precomputed once. A clause without a
 *    lane part ("high-only") then violates every lane of the block: only how many of them are false matters.
 * 2. Gray-code order over the high positions, each step flipping one of them and updating only the counters of
 *    the clauses that contain it, with blocks skipped when they cannot reach the bound. The walk is a tree walk:
 *    level g fixes high positions ≥ g, and a high-only clause is decided once its lowest position is fixed, so a
 *    whole subtree of 2^g blocks is skipped when the clauses it has already decided exceed the bound. The greedy
 *    order puts at the top the variables that decide clauses soonest.
 * 3. Passes with a bound t: blocks whose certain violations exceed min(t, best so far) are skipped; evaluated
 *    blocks count each lane's violations bit-parallel (thermometer-coded planes saturating just above the
 *    remaining budget, or binary bit-sliced counters for large budgets), giving the exact number of lanes at the
 *    block's smallest cost. Pass t = 0 is a model count; if it finds no model, one more pass with t = an upper
 *    bound from a short local search (the cost of an actual assignment) yields minimum and degeneracy.
 *
 * Covered assignments are 2^(n−prefixBits) for every complete run, whatever was skipped. Tree skipping makes
 * the time grow much more slowly than 2^n on random 3-SAT (n = 40 in milliseconds); `skipping: "block"` keeps
 * the plain enumerator whose time grows as 2^n.
 */
import { walksatBound } from "./local-search-upper-bound.js";
import type { Cnf } from "../harness/model/cnf.js";
import type { ExactResult, StopFlag } from "./types.js";

/**
 * Largest n accepted: up to 2^40 ≈ 1.1·10^12 assignments per run, so a formula on which skipping barely helps
 * (long clauses, far above threshold) still finishes in minutes per core at the measured plain rate (≈ 10^10/s,
 * see test/bench/exhaustive-cnf.bench.ts); every count up to 2^40 is exact in a double (2^53 limit).
 */
export const CNF_EXACT_MAX_VARIABLES = 40;

/**
 * Default number of lane variables with tree skipping (2^laneBits lanes, 32 per Int32 word). Measured on random
 * 3-SAT at density 4.26 (test/bench/exhaustive-cnf.bench.ts, lane sweep at n = 36): 5–8 lane bits are within
 * noise of each other, 10 is slower; with tree skipping few blocks are evaluated and each costs about one pass
 * over its lane words per alive clause, so a small block wins.
 */
export const CNF_EXACT_LANE_BITS = 6;

/**
 * Default number of lane variables with single-block skipping. Measured as above at n = 28–30: 12 lane bits
 * (128 words) gave 2–5·10^10 assignments/s, 10 gave 1.5·10^10, 8 gave 4·10^9 (per-step counter updates
 * dominate), 16 gave 0.5–1.4·10^10 (evaluated blocks dominate).
 */
export const CNF_EXACT_BLOCK_LANE_BITS = 12;

/**
 * Largest remaining budget evaluated with thermometer planes (cost ∝ budget per clause and word, with an early
 * exit once every lane is over budget); above it, binary counters (cost ≈ 2 per clause and word, no early exit).
 * Measured on random 3-SAT n = 26–28 at densities 8 and 15 (optima 2–19): thresholds 1, 3 and 100 were within
 * the run-to-run noise; the binary path exists so that budgets in the hundreds stay linear in the clauses.
 */
const THERMOMETER_MAX_BUDGET = 3;

/** Within one 32-lane word, the lanes where lane variable j < 5 is 1 (bit j of the lane index). */
const LANE_PATTERN = [0xaaaaaaaa | 0, 0xcccccccc | 0, 0xf0f0f0f0 | 0, 0xff00ff00 | 0, 0xffff0000 | 0];

/** Tree nodes visited between two polls of the stop flag (each covers ≥ 2^laneBits assignments). */
const POLL_NODES = 256;

/** Tuning of {@link exhaustiveCnfSlice}; every field optional. */
export interface CnfExactOptions {
  /**
   * Lane variables evaluated bit-parallel per block, 0..16. Default {@link CNF_EXACT_LANE_BITS} with tree
   * skipping, {@link CNF_EXACT_BLOCK_LANE_BITS} with block skipping.
   */
  readonly laneBits?: number;
  /**
   * "tree" (default): skip any subtree of blocks whose decided high-only clauses exceed the bound;
   * "block": skip single blocks only (the plain bit-parallel Gray-code enumerator, whose time grows as 2^n;
   * kept for comparison in the benchmark).
   */
  readonly skipping?: "tree" | "block";
}

/**
 * Exact minimum number of violated clauses and the number of assignments reaching it, over the 2^(n−prefixBits)
 * assignments whose top `prefixBits` variables (variables n−prefixBits+1 .. n, i.e. bits n−prefixBits .. n−1 of
 * z) equal the bits of `prefix`. prefixBits = 0 covers everything. Polls `stop` at the start of each pass and
 * every 256 visited tree nodes (each covers at least 2^laneBits assignments; microseconds apart). When stopped,
 * returns complete: false with the lowest cost at or below the current pass's bound among the assignments that
 * pass covered (+Infinity when none), its count, and `assignments` = the assignments that pass covered; complete
 * runs report assignments = 2^(n−prefixBits).
 * @param cnf - the formula; clauses may have any length, repeat literals, be tautologies or be empty.
 * @param prefixBits - number of fixed top variables, 0 ≤ prefixBits ≤ n.
 * @param prefix - their values, an integer in [0, 2^prefixBits).
 * @param stop - cooperative stop flag, or null.
 * @param options - lane width and skipping mode (defaults are the fastest measured).
 * @throws RangeError when n exceeds {@link CNF_EXACT_MAX_VARIABLES}, a literal is out of range, or the slice is invalid.
 */
export function exhaustiveCnfSlice(
  cnf: Cnf,
  prefixBits: number,
  prefix: number,
  stop: StopFlag,
  options: CnfExactOptions = {},
): ExactResult {
  const n = cnf.variables;
  const block = options.skipping === "block";
  const laneBits = options.laneBits ?? (block ? CNF_EXACT_BLOCK_LANE_BITS : CNF_EXACT_LANE_BITS);
  if (!Number.isInteger(n) || n < 0 || n > CNF_EXACT_MAX_VARIABLES) {
    throw new RangeError(
      `exact CNF enumeration accepts at most ${CNF_EXACT_MAX_VARIABLES} variables (2^n work); this formula has ${n}`,
    );
  }
  if (!Number.isInteger(prefixBits) || prefixBits < 0 || prefixBits > n) {
    throw new RangeError(`prefixBits must be an integer in [0, ${n}], got ${prefixBits}`);
  }
  if (!Number.isInteger(prefix) || prefix < 0 || prefix >= 2 ** prefixBits) {
    throw new RangeError(`prefix must be an integer in [0, 2^${prefixBits}), got ${prefix}`);
  }
  if (!Number.isInteger(laneBits) || laneBits < 0 || laneBits > 16) {
    throw new RangeError(`laneBits must be an integer in [0, 16], got ${laneBits}`);
  }
  const k = prepare(cnf, prefixBits, prefix, laneBits);
  const maxSkipLevel = block ? 0 : k.high;
  const sliceSize = 2 ** (n - prefixBits);

  // 3. Threshold passes. A pass with bound t finds the exact minimum whenever it is ≤ t. The first (t = 0) is a
  // model count, the cheapest pass because it skips the most. If it finds no model, a short local search gives
  // an upper bound U (the cost of an actual assignment of the slice), and the pass with t = U is the last one.
  // (Doubling t is only a fallback: U bounds the minimum, so the pass with t = U always finishes.) Measured
  // against t = 0, 1, 2, 4, … (CPU time, 8 random 3-SAT instances each, best of 3): density 6, n = 30 (optima
  // 2–4) 69 vs 98 ms; density 8, n = 28 (optima 3–8) 154 vs 228 ms; density 15, n = 26 (optima 17–21) 1.4 vs
  // 2.5 s; at density 4.26 (optima 0–1) the same.
  let t = 0;
  for (;;) {
    const done = runPass(k, t, maxSkipLevel, stop);
    if (!done) return { optimum: k.best, degeneracy: k.count, assignments: k.covered, evaluated: k.evaluated, complete: false };
    if (k.best <= t) return { optimum: k.best, degeneracy: k.count, assignments: sliceSize, evaluated: k.evaluated, complete: true };
    t = t === 0 ? Math.max(1, walksatBound(k.lsStart, k.lsLits, k.empties, 1)) : 2 * t;
  }
}

/** All state of one slice's enumeration, in typed arrays (one shape, so property access stays monomorphic). */
class Kernel {
  /** Lanes per block (2^laneBits) and 32-bit words holding them. */
  lanes = 0;
  words = 0;
  /** Free high variables (enumerated in Gray order; position g = 0 flips every other step). */
  high = 0;
  /** Always-violated clauses (empty after removing the slice's false prefix literals). */
  empties = 0;
  /** Valid-lane mask per word (all ones unless fewer than 32 lanes). */
  valid = new Int32Array(0);
  /** Violated-lane masks of the clauses with a lane part: mask of clause c at masks[c·words ..]. */
  masks = new Int32Array(0);
  /**
   * Occurrences of high position g in high-only clauses (ho) and in clauses with a lane part (mx), CSR:
   * list 2g holds the clauses where it is a positive literal, list 2g+1 where negative. hoLevel parallels
   * hoList with each clause's lowest high position (the level below which the clause is decided).
   */
  hoStart = new Int32Array(1);
  hoList = new Int32Array(0);
  hoLevel = new Int32Array(0);
  mxStart = new Int32Array(1);
  mxList = new Int32Array(0);
  /** Per high-only clause: initial counter of true literals (all high positions 0) and lowest position. */
  hoInit = new Int32Array(0);
  hoMin = new Int32Array(0);
  mxInit = new Int32Array(0);
  /** Live counters of true high literals, values of the high positions. */
  hoCnt = new Int32Array(0);
  mxCnt = new Int32Array(0);
  value = new Uint8Array(0);
  /**
   * violAt[g] = high-only clauses with lowest position g that are currently false (decided once positions ≥ g
   * are fixed); dLev[g] = empties + Σ_{g' ≥ g} violAt[g'], the violations already certain in every assignment
   * below a tree node whose positions ≥ g are fixed.
   */
  violAt = new Int32Array(0);
  dLev = new Int32Array(1);
  /** Scratch: offsets in `masks` of the alive clauses with a lane part, for the block being evaluated. */
  alive = new Int32Array(0);
  /** Scratch: count planes (thermometer or binary) and the per-block histogram. */
  planes = new Int32Array(1);
  hist = new Float64Array(1);
  /** Violations of the current block's alive high-only clauses plus the empties (set before evalBlock). */
  base = 0;
  /** The simplified clauses over the free variables (signed, 1-based), CSR, for the local search. */
  lsStart = new Int32Array(1);
  lsLits = new Int32Array(0);
  /** Results of the current pass. */
  best = Infinity;
  count = 0;
  covered = 0;
  /** Assignments evaluated over all passes (lanes of evaluated blocks): the work pruning leaves. */
  evaluated = 0;
}

/** 1. Splits clauses into lane and high parts, builds masks, occurrence lists and initial counters. */
function prepare(cnf: Cnf, prefixBits: number, prefix: number, laneBits: number): Kernel {
  const n = cnf.variables;
  const free = n - prefixBits;
  // At most 30 high positions keep the Gray index a small integer (2^30): n = 40 gets at least 10 lane bits.
  const low = Math.min(free, Math.max(laneBits, free - 30));
  const high = free - low;
  const lanes = 2 ** low;
  const words = Math.max(1, lanes >>> 5);
  const k = new Kernel();
  k.lanes = lanes;
  k.words = words;
  k.high = high;
  k.valid = new Int32Array(words).fill(lanes >= 32 ? -1 : (1 << lanes) - 1);

  const { literals, offsets } = cnf;
  const m = offsets.length - 1;
  // Per clause: distinct literals over the free variables (signed, 1-based), after applying the prefix.
  const mark = new Int32Array(n + 1);
  const sign = new Int8Array(n + 1);
  const kept: number[][] = [];
  for (let c = 0; c < m; c++) {
    let satisfied = false;
    const lits: number[] = [];
    for (let i = offsets[c]; i < offsets[c + 1]; i++) {
      const lit = literals[i];
      const v = lit > 0 ? lit : -lit;
      if (!Number.isInteger(lit) || v === 0 || v > n) {
        throw new RangeError(`clause ${c + 1}: literal ${lit} is out of range for ${n} variables`);
      }
      const s = lit > 0 ? 1 : -1;
      if (mark[v] === c + 1) {
        if (sign[v] !== s) satisfied = true; // tautology: x ∨ ¬x
        continue; // repeated literal
      }
      mark[v] = c + 1;
      sign[v] = s;
      const bit = v - 1;
      if (bit >= free) {
        const fixed = Math.floor(prefix / 2 ** (bit - free)) % 2;
        if ((s > 0 ? fixed : 1 - fixed) === 1) satisfied = true;
      } else {
        lits.push(lit);
      }
    }
    if (satisfied) continue;
    if (lits.length === 0) k.empties++;
    else kept.push(lits);
  }
  k.lsStart = new Int32Array(kept.length + 1);
  k.lsLits = new Int32Array(kept.reduce((a, c) => a + c.length, 0));
  for (let c = 0, at = 0; c < kept.length; c++) {
    for (const lit of kept[c]) k.lsLits[at++] = lit;
    k.lsStart[c + 1] = at;
  }

  // Position of each free variable: 0..low−1 a lane bit, low+g the high position g (g = high−1 is the root).
  const order = greedyOrder(kept, free);
  const laneVars = order.slice(0, low);
  const highVars = order.slice(low);
  const position = new Int32Array(free);
  laneVars.forEach((v, i) => (position[v] = i));
  highVars.forEach((v, i) => (position[v] = low + i));

  const hoClauses: number[][] = [];
  const mxClauses: { laneLits: number[]; highLits: number[] }[] = [];
  for (const lits of kept) {
    const laneLits: number[] = [];
    const highLits: number[] = [];
    for (const lit of lits) {
      const p = position[(lit > 0 ? lit : -lit) - 1];
      if (p < low) laneLits.push(lit > 0 ? p + 1 : -(p + 1));
      else highLits.push(lit > 0 ? p - low + 1 : -(p - low + 1));
    }
    if (laneLits.length === 0) hoClauses.push(highLits);
    else mxClauses.push({ laneLits, highLits });
  }

  // Masks: lane ℓ (bit ℓ&31 of word ℓ>>5) has lane variable j equal to bit j of ℓ; a clause's lane part is false
  // where every lane literal is. Built a word at a time: lane variables 0..4 follow a fixed pattern inside each
  // word, variables ≥ 5 are constant across a word.
  const mx = mxClauses.length;
  k.masks = new Int32Array(mx * words);
  for (let c = 0; c < mx; c++) {
    const lits = mxClauses[c].laneLits;
    for (let w = 0; w < words; w++) {
      let mask = k.valid[w];
      for (const lit of lits) {
        const j = (lit > 0 ? lit : -lit) - 1;
        const ones = j < 5 ? LANE_PATTERN[j] : (w >>> (j - 5)) & 1 ? -1 : 0; // lanes where variable j is 1
        mask &= lit > 0 ? ~ones : ones;
      }
      k.masks[c * words + w] = mask;
    }
  }

  // Occurrence lists by high position (literals here are ±(g+1)).
  const build = (clauses: number[][]) => {
    const start = new Int32Array(2 * high + 1);
    const init = new Int32Array(clauses.length);
    const min = new Int32Array(clauses.length);
    clauses.forEach((lits, c) => {
      min[c] = high;
      for (const lit of lits) {
        const g = (lit > 0 ? lit : -lit) - 1;
        start[2 * g + (lit > 0 ? 0 : 1) + 1]++;
        if (lit < 0) init[c]++;
        if (g < min[c]) min[c] = g;
      }
    });
    for (let i = 0; i < 2 * high; i++) start[i + 1] += start[i];
    const list = new Int32Array(start[2 * high]);
    const level = new Int32Array(start[2 * high]);
    const fill = start.slice(0, 2 * high);
    clauses.forEach((lits, c) => {
      for (const lit of lits) {
        const g = (lit > 0 ? lit : -lit) - 1;
        const at = fill[2 * g + (lit > 0 ? 0 : 1)]++;
        list[at] = c;
        level[at] = min[c];
      }
    });
    return { start, list, level, init, min };
  };
  const ho = build(hoClauses);
  const mxb = build(mxClauses.map((c) => c.highLits));
  k.hoStart = ho.start;
  k.hoList = ho.list;
  k.hoLevel = ho.level;
  k.hoInit = ho.init;
  k.hoMin = ho.min;
  k.mxStart = mxb.start;
  k.mxList = mxb.list;
  k.mxInit = mxb.init;
  k.hoCnt = new Int32Array(hoClauses.length);
  k.mxCnt = new Int32Array(mx);
  k.value = new Uint8Array(high);
  k.violAt = new Int32Array(high);
  k.dLev = new Int32Array(high + 1);
  k.alive = new Int32Array(mx);
  return k;
}

/**
 * Greedy variable order for tree skipping, returned bottom (lanes) first. Built from the root down: each next
 * variable maximises Σ 2^−(unplaced literals of the clause − 1) over its clauses, i.e. prefers the clauses that
 * the fewest further variables would decide. Measured on random 3-SAT, n = 28–32 at density 4.26: 2–5× faster
 * than ordering by occurrence count alone, 20× faster than the index order.
 */
function greedyOrder(clauses: number[][], free: number): number[] {
  // weight[r] = 2^−(r−1): a clause's pull with r unplaced literals. Scores are updated incrementally: placing a
  // variable changes only the weights of its clauses.
  const weight = new Float64Array(64);
  for (let r = 1; r < 64; r++) weight[r] = 2 ** -(r - 1);
  const w = (r: number) => weight[Math.min(r, 63)];
  const placed = new Uint8Array(free);
  const remaining = new Int32Array(clauses.length);
  const score = new Float64Array(free);
  const byVar: number[][] = Array.from({ length: free }, () => []);
  clauses.forEach((c, i) => {
    remaining[i] = c.length;
    for (const lit of c) byVar[(lit > 0 ? lit : -lit) - 1].push(i);
  });
  clauses.forEach((c, i) => {
    for (const lit of c) score[(lit > 0 ? lit : -lit) - 1] += w(remaining[i]);
  });
  const topDown: number[] = [];
  for (let step = 0; step < free; step++) {
    let pick = -1;
    for (let v = 0; v < free; v++) if (placed[v] === 0 && (pick < 0 || score[v] > score[pick])) pick = v;
    placed[pick] = 1;
    topDown.push(pick);
    for (const c of byVar[pick]) {
      const delta = w(remaining[c] - 1) - w(remaining[c]);
      remaining[c]--;
      for (const lit of clauses[c]) score[(lit > 0 ? lit : -lit) - 1] += delta;
    }
  }
  return topDown.reverse();
}

/** Puts the kernel in the state of Gray index 0 (all high positions 0) for a new pass. */
function resetPass(k: Kernel): void {
  k.hoCnt.set(k.hoInit);
  k.mxCnt.set(k.mxInit);
  k.value.fill(0);
  k.violAt.fill(0);
  for (let c = 0; c < k.hoInit.length; c++) if (k.hoInit[c] === 0) k.violAt[k.hoMin[c]]++;
  k.best = Infinity;
  k.count = 0;
  k.covered = 0;
}

/**
 * 2. One pass over the slice with bound t, in Gray-code order over the high positions with hierarchical block
 * skipping; returns false when stopped. The enumeration is a walk of the binary tree whose level g fixes high
 * positions ≥ g: a node is skipped whole when the high-only clauses it already decides exceed the bound
 * (dLev[g] > bound), otherwise its first child keeps position g−1 as it is and its second child flips it.
 * Visiting the leaves this way is exactly the reflected Gray code (step i flips position ctz(i)); skipping a
 * node at level q advances i by 2^q. Measured on random 3-SAT n = 30, density 4.26: a skip test per leaf only
 * leaves about 18 ns of counter updates per block; testing every level cuts the visited nodes to a few percent.
 */
function runPass(k: Kernel, t: number, maxSkipLevel: number, stop: StopFlag): boolean {
  resetPass(k);
  // Polled once before any work too, so a flag raised beforehand stops even a slice too small to reach a poll.
  if (stop !== null && Atomics.load(stop, 0) !== 0) return false;
  const high = k.high;
  const total = 2 ** high;
  const lanes = k.lanes;
  const empties = k.empties;
  const value = k.value;
  const hoStart = k.hoStart;
  const hoList = k.hoList;
  const hoLevel = k.hoLevel;
  const hoCnt = k.hoCnt;
  const mxStart = k.mxStart;
  const mxList = k.mxList;
  const mxCnt = k.mxCnt;
  const violAt = k.violAt;
  const dLev = k.dLev;
  let bound = t;
  let i = 0;
  let q = high;
  let d = empties;
  dLev[high] = empties;
  let polls = 0;
  let evaluatedBlocks = 0;
  for (;;) {
    // Descend while the node at level q is within the bound.
    while (q > 0 && (d <= bound || q > maxSkipLevel)) {
      q--;
      d += violAt[q];
      dLev[q] = d;
    }
    if (d <= bound) {
      k.base = d;
      bound = evalBlock(k, bound);
      evaluatedBlocks++;
    }
    // The node at level q is finished (evaluated or skipped): go to the next one in Gray order.
    i += 1 << q;
    if (i >= total) break;
    if (++polls % POLL_NODES === 0 && stop !== null && Atomics.load(stop, 0) !== 0) {
      k.covered = i * lanes;
      k.evaluated += evaluatedBlocks * lanes;
      return false;
    }
    const p = 31 - Math.clz32(i & -i);
    const one = (value[p] ^= 1);
    // The literals that became true are p's positive ones when it went to 1, its negative ones otherwise.
    const up = 2 * p + 1 - one;
    const down = 2 * p + one;
    // Branch-free: (old − 1) >> 31 is −1 exactly when old was 0 (the clause stops being false).
    for (let j = hoStart[up], e = hoStart[up + 1]; j < e; j++) {
      const c = hoList[j];
      const old = hoCnt[c];
      hoCnt[c] = old + 1;
      violAt[hoLevel[j]] += (old - 1) >> 31;
    }
    for (let j = hoStart[down], e = hoStart[down + 1]; j < e; j++) {
      const c = hoList[j];
      const now = hoCnt[c] - 1;
      hoCnt[c] = now;
      violAt[hoLevel[j]] -= (now - 1) >> 31;
    }
    // Clauses with a lane part only need their counters; evaluated blocks rebuild their alive list (measured,
    // block skipping, n = 28–32: 13–18% faster than keeping the list incrementally, whose swap-removals
    // mispredict on every step).
    for (let j = mxStart[up], e = mxStart[up + 1]; j < e; j++) mxCnt[mxList[j]]++;
    for (let j = mxStart[down], e = mxStart[down + 1]; j < e; j++) mxCnt[mxList[j]]--;
    q = p;
    d = dLev[p + 1] + violAt[p];
    dLev[p] = d;
  }
  k.covered = total * lanes;
  k.evaluated += evaluatedBlocks * lanes;
  return true;
}

/**
 * Evaluates the current block against `bound` (≥ k.base, its certain violations): lanes whose total violations
 * are ≤ bound update best/count. Returns the new bound min(bound, best).
 */
function evalBlock(k: Kernel, bound: number): number {
  const base = k.base;
  const budget = bound - base; // ≥ 0: lanes may have at most this many violations among the alive masked clauses
  const words = k.words;
  const masks = k.masks;
  const valid = k.valid;
  const alive = k.alive;
  const mxCnt = k.mxCnt;
  let aliveCount = 0;
  for (let c = 0; c < mxCnt.length; c++) if (mxCnt[c] === 0) alive[aliveCount++] = c * words;
  if (budget === 0) {
    // Model-count style: a lane qualifies when no alive clause violates it. OR per word with an early exit once
    // the word is full (a clause with one or two lane literals alone covers a half or a quarter of the lanes).
    let hits = 0;
    for (let w = 0; w < words; w++) {
      let acc = ~valid[w];
      for (let i = 0; i < aliveCount && acc !== -1; i++) acc |= masks[alive[i] + w];
      hits += popcount32(~acc);
    }
    if (hits > 0) record(k, base, hits);
    return Math.min(bound, k.best);
  }
  if (budget === 1) {
    // Two planes in registers: one = lanes with ≥ 1 violation, two = lanes with ≥ 2.
    let hits0 = 0;
    let hits1 = 0;
    for (let w = 0; w < words; w++) {
      const invalid = ~valid[w];
      let one = 0;
      let two = invalid;
      for (let i = 0; i < aliveCount && two !== -1; i++) {
        const mk = masks[alive[i] + w];
        two |= one & mk;
        one |= mk;
      }
      hits0 += popcount32(~(one | invalid));
      hits1 += popcount32(one & ~two);
    }
    if (hits0 > 0) record(k, base, hits0);
    else if (hits1 > 0) record(k, base + 1, hits1);
    return Math.min(bound, k.best);
  }
  if (budget <= THERMOMETER_MAX_BUDGET) {
    // Thermometer planes: planes[j] = lanes with ≥ j+1 violations, j = 0..budget; planes[budget] = over budget.
    const planes = k.planes.length > budget ? k.planes : (k.planes = new Int32Array(budget + 1));
    const hist = k.hist.length > budget ? k.hist : (k.hist = new Float64Array(budget + 1));
    hist.fill(0, 0, budget + 1);
    for (let w = 0; w < words; w++) {
      const invalid = ~valid[w];
      planes.fill(0, 0, budget + 1);
      for (let i = 0; i < aliveCount; i++) {
        const mk = masks[alive[i] + w];
        for (let j = budget; j > 0; j--) planes[j] |= planes[j - 1] & mk;
        planes[0] |= mk;
        if ((planes[budget] | invalid) === -1) break;
      }
      let prev = ~invalid;
      for (let j = 0; j <= budget; j++) {
        const cur = planes[j];
        hist[j] += popcount32(prev & ~cur);
        prev = cur;
      }
    }
    for (let j = 0; j <= budget; j++) {
      if (hist[j] > 0) {
        record(k, base + j, hist[j]);
        break;
      }
    }
    return Math.min(bound, k.best);
  }
  // Large budgets: binary bit-sliced counters (planes[b] = bit b of each lane's count; a ripple-carry add per
  // clause costs about two operations on average, against budget+1 for the thermometer), then the smallest
  // count of each word found bit by bit from the top.
  let bits = 1;
  while (2 ** bits <= aliveCount) bits++;
  const planes = k.planes.length >= bits ? k.planes : (k.planes = new Int32Array(bits));
  let blockMin = Infinity;
  let blockHits = 0;
  for (let w = 0; w < words; w++) {
    planes.fill(0, 0, bits);
    for (let i = 0; i < aliveCount; i++) {
      let carry = masks[alive[i] + w];
      for (let b = 0; carry !== 0; b++) {
        const next = planes[b] & carry;
        planes[b] ^= carry;
        carry = next;
      }
    }
    let candidates = valid[w];
    let min = 0;
    for (let b = bits - 1; b >= 0; b--) {
      const zero = candidates & ~planes[b];
      if (zero !== 0) candidates = zero;
      else min += 2 ** b;
    }
    if (min < blockMin) {
      blockMin = min;
      blockHits = popcount32(candidates);
    } else if (min === blockMin) {
      blockHits += popcount32(candidates);
    }
  }
  if (blockMin <= budget) record(k, base + blockMin, blockHits);
  return Math.min(bound, k.best);
}

/** Adds `hits` lanes of cost `cost` (≤ best) to the pass's minimum and its count. */
function record(k: Kernel, cost: number, hits: number): void {
  if (cost < k.best) {
    k.best = cost;
    k.count = hits;
  } else {
    k.count += hits;
  }
}

/** Number of set bits of a 32-bit integer (SWAR; V8 has no popcount intrinsic). */
function popcount32(x: number): number {
  x -= (x >>> 1) & 0x55555555;
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  x = (x + (x >>> 4)) & 0x0f0f0f0f;
  return Math.imul(x, 0x01010101) >>> 24;
}
