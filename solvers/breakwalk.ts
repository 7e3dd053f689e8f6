/**
 * Focused local search with a break-weighted flip rule (A. Balint and U. Schöning, "Choosing probability
 * distributions for stochastic local search and the role of make versus break", SAT 2012, LNCS 7317, 16–29).
 *
 * One trial: a uniformly random assignment, then, until no clause is violated or `cap` flips are done: pick a
 * violated clause uniformly, flip one of its variables with probability ∝ f(break), where break(v) counts the
 * clauses v alone satisfies; polynomial f(b) = (ε + b)^(−cb) or exponential f(b) = cb^(−b). No restarts inside
 * a trial: each trial records its flips to solution, censored at the cap (a run-length distribution, see
 * harness/stats/run-length.ts), from which the success probability and TTS at any cut-off follow.
 *
 * Defaults per clause length k ({@link defaultBreakwalkRule}): k ≤ 3 polynomial cb = 2.38, ε = 1; k = 4, 5, 6
 * exponential cb = 3.0, 3.6, 4.4; k ≥ 7 exponential cb = 4.4. From memory of the SAT 2012 paper (its table could
 * not be read here); a public third-party implementation of the method carries the same table and attributes it
 * to that paper. The authors' later competition code uses tuned values (k = 3:
 * cb = 2.06, ε = 0.9; k = 4, 5, 6, 7: cb = 2.85, 3.7, 5.1, 5.4); pass --breakwalk-cb/--breakwalk-eps for those.
 *
 * Bookkeeping: per clause its true-literal count and the XOR of its true variables (which names the critical
 * variable when the count is 1), per variable its break count, and the violated clauses in an indexed list, all
 * updated incrementally by a flip in O(occurrences of the flipped variable); f comes from a table indexed by
 * break. For 3-SAT the authors' code computes breaks on the fly instead (scanning the picked clause's variables'
 * occurrences); we measured both on random 3-SAT n = 200 (same draws, interleaved runs on the loaded 2-core test
 * machine): cached 6.6–7.7e6, on the fly 5.0–6.0e6 flips per CPU-second, so every k uses the cached counts.
 * Clauses of three literals run in a copy of the trial loop written for k = 3 ({@link threeSatTrials}: the same
 * draws, 1.3–1.4× the general loop's flips per CPU-second). Nothing is allocated per flip. Trial t draws only
 * from trialRng(seed, t) (./trial-seeds.ts).
 */
import type { Cnf } from "../harness/model/cnf.js";
import { stepsToSolution, stopRequested, type StopFlag, type TrialsResult, type TrialsSolver } from "./types.js";
import { compileCnf, type CompiledCnf } from "./compile-cnf.js";
import { randomAssignment, trialKey, trialRng } from "./trial-seeds.js";
import { RunLengthTally } from "./run-length-tally.js";
import type { RunLengths } from "../harness/types.js";

/** The shape of f: polynomial (ε + b)^(−cb) or exponential cb^(−b). */
export type BreakRule = "poly" | "exp";

/** The flip rule's parameters. */
export interface BreakwalkRule {
  readonly rule: BreakRule;
  /** Base (exp) or exponent (poly), > 0 (> 1 for exp to prefer small breaks). */
  readonly cb: number;
  /** Offset ε of the polynomial rule, > 0 (ignored by exp). */
  readonly eps: number;
}

/** Options of {@link breakwalkTrials}. */
export interface BreakwalkOptions extends Partial<BreakwalkRule> {
  /** Number of trials, an integer ≥ 0. */
  readonly trials: number;
  /** Flips per trial at most (the cap of the run-length distribution), an integer ≥ 0. */
  readonly cap: number;
  /** Index of the first trial. Default 0. */
  readonly firstTrial?: number;
  /** Cell seed. */
  readonly seed: string;
  /** Cooperative stop flag, polled every {@link BREAKWALK_POLL_INTERVAL} flips. */
  readonly stop: StopFlag;
}

/** Trial counts plus the run-length distribution. */
export interface BreakwalkResult extends TrialsResult {
  /** Flips to solution per finished trial (censored at the cap). */
  readonly runLengths: RunLengths;
  /** The rule used (defaults resolved). */
  readonly rule: BreakwalkRule;
}

/** Flips between two polls of the stop flag. */
export const BREAKWALK_POLL_INTERVAL = 4096;

/**
 * Default rule for clause length k (the longest clause of the formula): see the file comment for the source.
 */
export function defaultBreakwalkRule(k: number): BreakwalkRule {
  if (k <= 3) return { rule: "poly", cb: 2.38, eps: 1 };
  if (k === 4) return { rule: "exp", cb: 3.0, eps: 1 };
  if (k === 5) return { rule: "exp", cb: 3.6, eps: 1 };
  return { rule: "exp", cb: 4.4, eps: 1 };
}

/** Table f(b) for b = 0..maxBreak. */
export function breakTable(rule: BreakwalkRule, maxBreak: number): Float64Array {
  const t = new Float64Array(maxBreak + 1);
  for (let b = 0; b <= maxBreak; b++) t[b] = rule.rule === "poly" ? Math.pow(rule.eps + b, -rule.cb) : Math.pow(rule.cb, -b);
  return t;
}

/** Runs breakwalk trials on a formula. See {@link breakwalkCompiled}. */
export function breakwalkTrials(cnf: Cnf, options: BreakwalkOptions): BreakwalkResult {
  return breakwalkCompiled(compileCnf(cnf), options);
}

/**
 * Breakwalk trials `firstTrial .. firstTrial + trials − 1` on a compiled formula.
 *
 * Draws of trial t (all from trialRng(seed, t)): the start as in the walk (⌈n/32⌉ `nextU32`, bit b of call i
 * giving variable 32·i + b); then per flip `below(U)` for the entry of the violated list (U entries) and one
 * `nextU32` = u choosing the first literal i of that clause whose cumulative weight Σ_{j≤i} f(break_j) exceeds
 * u·2^−32·Σ_j f(break_j) (the last literal when rounding leaves none).
 * `work` = flips of finished trials; success = no violated clause (never with an empty clause in the input).
 */
export function breakwalkCompiled(f: CompiledCnf, options: BreakwalkOptions): BreakwalkResult {
  const n = f.variables;
  const m = f.clauses;
  const trials = options.trials;
  const cap = options.cap;
  const firstTrial = options.firstTrial ?? 0;
  checkCount("trials", trials);
  checkCount("cap", cap);
  checkCount("firstTrial", firstTrial);
  let maxLength = 0;
  for (let c = 0; c < m; c++) maxLength = Math.max(maxLength, f.clauseStart[c + 1] - f.clauseStart[c]);
  const defaults = defaultBreakwalkRule(maxLength);
  const rule: BreakwalkRule = { rule: options.rule ?? defaults.rule, cb: options.cb ?? defaults.cb, eps: options.eps ?? defaults.eps };
  if (rule.rule !== "poly" && rule.rule !== "exp") throw new RangeError(`breakwalk rule must be poly or exp, got ${String(rule.rule)}`);
  if (!(rule.cb > 0) || !Number.isFinite(rule.cb)) throw new RangeError(`breakwalk cb must be finite and > 0, got ${rule.cb}`);
  if (!(rule.eps > 0) || !Number.isFinite(rule.eps)) throw new RangeError(`breakwalk eps must be finite and > 0, got ${rule.eps}`);
  const table = breakTable(rule, f.maxOccurrences);
  if (f.clauseLength === 3) return threeSatTrials(f, table, rule, options);

  const { clauseStart, clauseLiterals, occurrenceStart, occurrences } = f;
  const empty = f.emptyClauses;
  const value = new Uint8Array(n);
  // One word per clause: its true-literal count in the low `bits` bits, above them the XOR of the variables whose
  // literal in it is true (the critical variable when the count is 1). One array instead of two: measured
  // on random 3-SAT n = 200, 6.6 → 7.4e6 flips per CPU-second.
  const bits = 32 - Math.clz32(Math.max(maxLength, 1));
  const mask = (1 << bits) - 1;
  if (2 ** Math.ceil(Math.log2(Math.max(n, 2))) * 2 ** bits > 2 ** 31) throw new RangeError(`breakwalk: ${n} variables with clauses of ${maxLength} literals do not fit the packed clause words`);
  const word = new Int32Array(m);
  // Padded to a power of two: an XOR of variable indices (read with weight 0) stays inside.
  const breaks = new Int32Array(2 ** Math.ceil(Math.log2(Math.max(n, 2))));
  // violated[1 .. unsat], position[c] its slot; slots 0 and unsat + 1 are scratch for the branch-free updates.
  const violated = new Int32Array(m + 2);
  const position = new Int32Array(m);
  const removed = new Int32Array(f.maxOccurrences + 1);
  const weight = new Float64Array(Math.max(maxLength, 1));
  const key = trialKey(options.seed);
  const stop = options.stop;
  const tally = new RunLengthTally(trials);
  let censored = false;
  let sincePoll = BREAKWALK_POLL_INTERVAL;

  for (let t = firstTrial; t < firstTrial + trials; t++) {
    if (++sincePoll >= BREAKWALK_POLL_INTERVAL) {
      sincePoll = 0;
      if (stopRequested(stop)) {
        censored = true;
        break;
      }
    }
    const rng = trialRng(key, t);

    // 1. Uniform random start.
    randomAssignment(rng, value);

    // 2. Counts, critical variables, breaks and the violated list from scratch.
    breaks.fill(0);
    let unsat = 0;
    for (let c = 0; c < m; c++) {
      let count = 0;
      let x = 0;
      for (let i = clauseStart[c], end = clauseStart[c + 1]; i < end; i++) {
        const code = clauseLiterals[i];
        const isTrue = (value[code >> 1] ^ code ^ 1) & 1;
        count += isTrue;
        x ^= (code >> 1) & -isTrue;
      }
      word[c] = count | (x << bits);
      if (count === 0) {
        violated[++unsat] = c;
        position[c] = unsat;
      } else if (count === 1) {
        breaks[x]++;
      }
    }

    // 3. The walk.
    let trialBest = unsat;
    let flips = 0;
    let aborted = false;
    while (unsat > 0 && flips < cap) {
      if (++sincePoll >= BREAKWALK_POLL_INTERVAL) {
        sincePoll = 0;
        if (stopRequested(stop)) {
          aborted = true;
          break;
        }
      }
      const c = violated[rng.below(unsat) + 1];
      const from = clauseStart[c];
      const len = clauseStart[c + 1] - from;
      let sum = 0;
      for (let i = 0; i < len; i++) {
        const w = table[breaks[clauseLiterals[from + i] >> 1]];
        weight[i] = w;
        sum += w;
      }
      let r = rng.nextU32() * 2.3283064365386963e-10 * sum;
      let i = 0;
      for (; i < len - 1; i++) {
        r -= weight[i];
        if (r < 0) break;
      }
      const v = clauseLiterals[from + i] >> 1;

      // Flip v: its literal with the new value became true in the `up` clauses, false in the `down` ones.
      const now = value[v] ^ 1;
      value[v] = now;
      // Branch-free, as in the walk: [count = 0] = (count − 1) >>> 31 and [count = 1] = ((count ^ 1) − 1) >>> 31
      // weight the updates (the branches mispredict on random formulas). When the weight is 0 the XOR may name
      // variable 0 or any variable; it then gets ± 0. The clauses that stop being violated are collected first
      // and removed after the loop, in visiting order.
      const up = 2 * v + now;
      const vx = v << bits;
      let nRemoved = 0;
      let gained = 0;
      for (let i = occurrenceStart[up], end = occurrenceStart[up + 1]; i < end; i++) {
        const d = occurrences[i];
        const w = word[d];
        const count = w & mask;
        const x = w >>> bits;
        word[d] = (w + 1) ^ vx;
        const wasZero = (count - 1) >>> 31;
        breaks[x] -= ((count ^ 1) - 1) >>> 31; // count 1 → 2: x is no longer critical
        gained += wasZero; // count 0 → 1: v alone satisfies it now
        removed[nRemoved] = d;
        nRemoved += wasZero;
      }
      breaks[v] += gained;
      for (let r = 0; r < nRemoved; r++) {
        const d = removed[r];
        const last = violated[unsat--];
        const p = position[d];
        violated[p] = last;
        position[last] = p;
      }
      const down = up ^ 1;
      let lost = 0;
      for (let i = occurrenceStart[down], end = occurrenceStart[down + 1]; i < end; i++) {
        const d = occurrences[i];
        const w = (word[d] ^ vx) - 1;
        word[d] = w;
        const count = w & mask;
        const x = w >>> bits;
        const isZero = (count - 1) >>> 31;
        lost += isZero; // count 1 → 0: v was its critical variable
        breaks[x] += ((count ^ 1) - 1) >>> 31; // count 2 → 1: the remaining true variable x became critical
        violated[unsat + 1] = d;
        position[d] = unsat + 1;
        unsat += isZero;
      }
      breaks[v] -= lost;
      flips++;
      if (unsat < trialBest) trialBest = unsat;
    }
    if (aborted) {
      censored = true;
      break;
    }
    const solved = unsat === 0 && empty === 0;
    tally.add(flips, solved, trialBest + empty);
  }
  return {
    trials: tally.done, successes: tally.successes, work: tally.work, best: tally.best, censored, rule,
    runLengths: tally.runLengths(cap),
  };
}

/**
 * {@link breakwalkCompiled} for formulas whose clauses all have three literals: the same draws, flips and counts,
 * in a copy of the trial loop written for k = 3 (the benches' and the families' common case).
 *
 * What differs from the general loop, each measured on random 3-SAT n = 200 and SATLIB uf50-218 (interleaved A/B
 * runs, the same draws checked, median of 30 per-round ratios of flips per CPU-second, the loaded 2-core test
 * machine, node 20):
 * - the generator's state words in local variables for the whole trial, `nextU32` and `below` written out (the
 *   same update and the same rejection rule as harness/random.ts; the words are stored back after the trial), and
 *   k = 3 fixed in a function of its own: 1.04× (n = 200), 1.06× (uf50);
 * - every integer the flip touches in one Int32Array `mem`, each stored index being a position in `mem` itself (as
 *   the annealer's CNF engine does, anneal-cnf.ts: V8 reloads base and length of every distinct typed array in
 *   each iteration), with the variable's value bit folded into its break entry (2·break + value): 1.16× and 1.14×
 *   over the general loop together with the first item;
 * - per clause one record of five words (packed word, slot in the violated list, the three variables), so that
 *   a clause's word and slot share a cache line: a further 1.04×, 1.05×;
 * - the layout's offsets marked int32 with `| 0`: V8 types sums of array lengths as doubles, and every index
 *   computed from them went through a checked double-to-integer conversion (seen in the optimised code with
 *   `perf`): a further 1.16×, 1.15×.
 * Tried without a gain (within ±2 %): branches instead of the branch-free list updates, a branch-free choice of the
 * literal, `| 0` on the loop's own sums while the offsets were still doubles, polling the stop flag in chunks of
 * flips. All together, against the general loop before this copy (bench `baselines`, five runs each on the same
 * day, the machine's load varying): random 3-SAT n = 200 6.6–7.9e6 → 8.4–10.6e6 flips per CPU-second, uf50-218
 * 6.2–7.4e6 → 8.0–11.4e6; against the walk, alternated calls in one process (median of 25 per-pair ratios): n = 200
 * 0.79 → 1.09 (walk 3n flips a trial), 0.69 → 0.97 (walk 1e5 flips a trial), uf50-218 0.69 → 0.89 (2 trials a call).
 *
 * Layout of `mem`:
 * - [0, P): per variable 2·break + value, P = n rounded up to a power of two (an XOR of variable indices read with
 *   weight 0 stays inside; the padding is written with weight 0 only);
 * - literal occurrence starts (2n + 1): the occurrences of literal code ℓ are mem[occStartAt + ℓ] ..
 *   mem[occStartAt + ℓ + 1];
 * - occurrences: the position of the clause's record;
 * - clause records (5m): at w the packed word (true-literal count | XOR of the true variables << 2), at w + 1 the
 *   clause's slot in the violated list (valid while it is violated), at w + 2 .. w + 4 its three variables;
 * - the violated list (m + 2): slots 1 .. unsat hold record positions; slot 0 and slot unsat + 1 are scratch;
 * - scratch for the clauses one flip satisfies (maxOccurrences + 1).
 */
function threeSatTrials(f: CompiledCnf, table: Float64Array, rule: BreakwalkRule, options: BreakwalkOptions): BreakwalkResult {
  const n = f.variables;
  const m = f.clauses;
  const trials = options.trials;
  const cap = options.cap;
  const firstTrial = options.firstTrial ?? 0;
  const { clauseLiterals, occurrenceStart, occurrences } = f;
  const empty = f.emptyClauses;
  const padded = 2 ** Math.ceil(Math.log2(Math.max(n, 2)));
  const size = padded + 2 * n + 1 + occurrences.length + 6 * m + 2 + f.maxOccurrences + 1;
  if (padded * 4 > 2 ** 31 || size > 2 ** 31 - 1) throw new RangeError(`breakwalk: a 3-SAT formula with ${n} variables and ${m} clauses does not fit the packed layout`);
  // `| 0` marks the offsets as int32 (sums of lengths are typed as doubles otherwise, and every index computed from
  // them went through a checked double-to-integer conversion: measured 1.05x on n = 200 and uf50-218).
  const occStartAt = padded | 0;
  const occAt = (occStartAt + 2 * n + 1) | 0;
  const recordAt = (occAt + occurrences.length) | 0;
  const violatedAt = (recordAt + 5 * m) | 0;
  const removedAt = (violatedAt + m + 2) | 0;
  const mem = new Int32Array(size);
  /** The variables' entries, where each trial's random start is written. */
  const starts = mem.subarray(0, n);
  for (let l = 0; l <= 2 * n; l++) mem[occStartAt + l] = occAt + occurrenceStart[l];
  for (let i = 0; i < occurrences.length; i++) mem[occAt + i] = recordAt + 5 * occurrences[i];
  for (let c = 0; c < m; c++) for (let j = 0; j < 3; j++) mem[recordAt + 5 * c + 2 + j] = clauseLiterals[3 * c + j] >> 1;
  // Below 2^21 entries the high word of x·unsat is one exact double product (as in Rng.below).
  const smallList = m <= 2097152;
  const key = trialKey(options.seed);
  const stop = options.stop;
  const tally = new RunLengthTally(trials);
  let censored = false;
  let sincePoll = BREAKWALK_POLL_INTERVAL;

  for (let t = firstTrial; t < firstTrial + trials; t++) {
    if (++sincePoll >= BREAKWALK_POLL_INTERVAL) {
      sincePoll = 0;
      if (stopRequested(stop)) {
        censored = true;
        break;
      }
    }
    const rng = trialRng(key, t);

    // 1. Uniform random start (value bits in the low bit of each variable's entry, breaks 0).
    mem.fill(0, n, padded);
    randomAssignment(rng, starts);

    // 2. Counts, critical variables, breaks and the violated list from scratch, clauses in increasing index.
    let unsat = 0;
    for (let c = 0, i = 0; c < m; c++, i += 3) {
      const a = clauseLiterals[i];
      const b = clauseLiterals[i + 1];
      const d = clauseLiterals[i + 2];
      const ta = (mem[a >> 1] ^ a ^ 1) & 1;
      const tb = (mem[b >> 1] ^ b ^ 1) & 1;
      const td = (mem[d >> 1] ^ d ^ 1) & 1;
      const count = ta + tb + td;
      const w = recordAt + 5 * c;
      mem[w] = count | ((((a >> 1) & -ta) ^ ((b >> 1) & -tb) ^ ((d >> 1) & -td)) << 2);
      if (count === 0) {
        mem[violatedAt + ++unsat] = w;
        mem[w + 1] = violatedAt + unsat;
      } else if (count === 1) {
        mem[mem[w] >>> 2] += 2;
      }
    }

    // 3. The walk, on the generator's state words in locals.
    const state = rng.state;
    let s0 = state[0];
    let s1 = state[1];
    let s2 = state[2];
    let s3 = state[3];
    let trialBest = unsat;
    let flips = 0;
    let aborted = false;
    while (unsat > 0 && flips < cap) {
      if (++sincePoll >= BREAKWALK_POLL_INTERVAL) {
        sincePoll = 0;
        if (stopRequested(stop)) {
          aborted = true;
          break;
        }
      }
      // below(unsat): x = nextU32(), redrawn while the low word of x·unsat is below 2^32 mod unsat.
      let m5 = Math.imul(s1, 5);
      let x = Math.imul((m5 << 7) | (m5 >>> 25), 9) >>> 0;
      s2 ^= s0;
      s3 ^= s1;
      let t9 = s1 << 9;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= t9;
      s3 = (s3 << 11) | (s3 >>> 21);
      let low = Math.imul(x, unsat) >>> 0;
      if (low < unsat) {
        const threshold = (4294967296 - unsat) % unsat;
        while (low < threshold) {
          m5 = Math.imul(s1, 5);
          x = Math.imul((m5 << 7) | (m5 >>> 25), 9) >>> 0;
          s2 ^= s0;
          s3 ^= s1;
          t9 = s1 << 9;
          s1 ^= s2;
          s0 ^= s3;
          s2 ^= t9;
          s3 = (s3 << 11) | (s3 >>> 21);
          low = Math.imul(x, unsat) >>> 0;
        }
      }
      const entry = smallList ? ((x * unsat) / 4294967296) | 0 : highWord(x, unsat) | 0;
      const record = mem[(violatedAt + 1 + entry) | 0];
      const a = mem[record + 2];
      const b = mem[record + 3];
      const d = mem[record + 4];
      const wa = table[mem[a] >> 1];
      const wb = table[mem[b] >> 1];
      // The literal: u = nextU32(), the first of a, b, d whose cumulative weight exceeds u·2^−32·(wa + wb + wd).
      m5 = Math.imul(s1, 5);
      const u = Math.imul((m5 << 7) | (m5 >>> 25), 9) >>> 0;
      s2 ^= s0;
      s3 ^= s1;
      t9 = s1 << 9;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= t9;
      s3 = (s3 << 11) | (s3 >>> 21);
      const r = u * 2.3283064365386963e-10 * (wa + wb + table[mem[d] >> 1]);
      const v = r < wa ? a : r < wa + wb ? b : d;

      // Flip v, as in the general loop (same order of visits, the same list moves), on the records.
      const entryV = mem[v];
      const now = (entryV & 1) ^ 1;
      const up = occStartAt + 2 * v + now;
      const vx = v << 2;
      let nRemoved = removedAt;
      let gained = 0;
      for (let i = mem[up], end = mem[up + 1]; i < end; i++) {
        const w = mem[i];
        const word = mem[w];
        const count = word & 3;
        mem[w] = (word + 1) ^ vx;
        const wasZero = ((count - 1) >>> 31) | 0;
        mem[word >>> 2] -= ((((count ^ 1) - 1) >>> 31) | 0) << 1; // count 1 → 2: its critical variable loses a break
        gained = (gained + wasZero) | 0; // count 0 → 1: v alone satisfies it now
        mem[nRemoved] = w;
        nRemoved = (nRemoved + wasZero) | 0;
      }
      for (let q = removedAt; q < nRemoved; q++) {
        const w = mem[q];
        const last = mem[violatedAt + unsat--];
        const slot = mem[w + 1];
        mem[slot] = last;
        mem[last + 1] = slot;
      }
      const down = up ^ 1;
      let lost = 0;
      for (let i = mem[down], end = mem[down + 1]; i < end; i++) {
        const w = mem[i];
        const word = ((mem[w] ^ vx) - 1) | 0;
        mem[w] = word;
        const count = word & 3;
        const isZero = ((count - 1) >>> 31) | 0;
        lost = (lost + isZero) | 0; // count 1 → 0: v was its critical variable
        mem[word >>> 2] += ((((count ^ 1) - 1) >>> 31) | 0) << 1; // count 2 → 1: the remaining true variable is critical
        const slot = (violatedAt + unsat + 1) | 0;
        mem[slot] = w;
        mem[w + 1] = slot;
        unsat = (unsat + isZero) | 0;
      }
      mem[v] = entryV + ((gained - lost) << 1) + now - (entryV & 1);
      flips++;
      if (unsat < trialBest) trialBest = unsat;
    }
    state[0] = s0;
    state[1] = s1;
    state[2] = s2;
    state[3] = s3;
    if (aborted) {
      censored = true;
      break;
    }
    const solved = unsat === 0 && empty === 0;
    tally.add(flips, solved, trialBest + empty);
  }
  return {
    trials: tally.done, successes: tally.successes, work: tally.work, best: tally.best, censored, rule,
    runLengths: tally.runLengths(cap),
  };
}

/** ⌊x·bound/2^32⌋ for bound above 2^21 (x·bound may exceed 2^53), from 16-bit halves as in Rng.below. */
function highWord(x: number, bound: number): number {
  const mid = (x & 0xffff) * bound;
  return Math.floor(((x >>> 16) * bound + Math.floor(mid / 65536)) / 65536);
}

function checkCount(name: string, value: number): void {
  if (!Number.isSafeInteger(value) || value < 0) throw new RangeError(`${name} must be an integer ≥ 0, got ${value}`);
}

/** Settings of breakwalk on the registry: the flip rule, nulls = the defaults for the formula's clause length. */
export interface BreakwalkSettings {
  readonly rule: BreakRule | null;
  readonly cb: number | null;
  readonly eps: number | null;
}

/**
 * Breakwalk on the solver registry (solvers/registry.ts). Run length = the flip cap of a trial (`--breakwalk-flips`
 * K·n); every trial reports its flips to solution (`stepsToSolution`, −1 when censored at the cap), so success and
 * TTS at any shorter cut-off follow from one cell (harness/stats/run-length.ts).
 */
export const breakwalkSolver: TrialsSolver<BreakwalkSettings> = {
  name: "breakwalk",
  kind: "trials",
  description: "focused local search, flip weight f(break) (Balint & Schöning 2012); records flips to solution per trial",
  options: ["breakwalk-flips", "breakwalk-rule", "breakwalk-cb", "breakwalk-eps", "trials"],
  runLengthUnit: "flips",
  defaultFor: ["cnf"],
  appliesTo: (target) => (target.kind === "cnf" ? null : `breakwalk applies to k-SAT/CNF families only, not '${target.family}'`),
  skipReason: (truth) => (truth.optimum > 0 ? "not applicable: unsatisfiable, and breakwalk only finds models" : null),
  runLengths: (n, study) => [Math.round(Number(study.options["breakwalk-flips"]) * n)],
  settings: (study) => ({
    rule: (study.options["breakwalk-rule"] as BreakRule | null) ?? null,
    cb: (study.options["breakwalk-cb"] as number | null) ?? null,
    eps: (study.options["breakwalk-eps"] as number | null) ?? null,
  }),
  run(problem, input) {
    if (problem.kind !== "cnf") throw new Error("breakwalk applies to CNF instances only");
    const s = input.settings;
    const r = breakwalkTrials(problem.cnf, {
      trials: input.trials, cap: input.runLength, seed: input.seed, stop: input.stop, firstTrial: 0,
      rule: s.rule ?? undefined, cb: s.cb ?? undefined, eps: s.eps ?? undefined,
    });
    const rule = r.rule.rule === "poly" ? `poly cb=${r.rule.cb} eps=${r.rule.eps}` : `exp cb=${r.rule.cb}`;
    return { trials: r.trials, successes: r.successes, work: r.work, best: r.best, censored: r.censored, stepsToSolution: stepsToSolution(r.runLengths), extra: { breakwalk_rule: rule } };
  },
};
