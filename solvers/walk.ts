/**
 * Schöning's random walk for k-SAT (U. Schöning, "A probabilistic algorithm for k-SAT based on limited local
 * search and restart", Algorithmica 32 (2002) 615–623).
 *
 * One trial: a uniformly random assignment, then at most `maxFlips` steps (default 3n), each flipping a
 * uniformly chosen variable of a uniformly chosen violated clause; the trial succeeds as soon as no clause is
 * violated (the start included). Trials are independent restarts; trial t draws only from
 * {@link trialRng}(seed, t), so any split of the trial range over calls or workers gives the same counts.
 *
 * The violated-clause set is maintained incrementally: per-clause true-literal counts, literal occurrence
 * lists in compressed-row typed arrays, and an indexed list of violated clauses with O(1) insert and delete.
 * A step costs O(occurrences of the flipped variable); nothing is ever rescanned.
 */
import { deriveSeed, Rng } from "../harness/random.js";
import type { Cnf } from "../harness/model/cnf.js";
import { stopRequested, type StopFlag, type TrialsResult } from "./types.js";

/** Options of {@link walkTrials}. */
export interface WalkOptions {
  /** Number of trials to run (restarts), an integer ≥ 0. */
  readonly trials: number;
  /** Maximum flips per trial, an integer ≥ 0. Default 3n (Schöning's run length). */
  readonly maxFlips?: number;
  /** Index of the first trial (trial t draws from {@link trialRng}(seed, t)). Default 0. */
  readonly firstTrial?: number;
  /** Cell seed the trial generators are derived from. */
  readonly seed: string;
  /** Cooperative stop flag, polled every {@link WALK_POLL_INTERVAL} steps and at the start of a trial. */
  readonly stop: StopFlag;
}

/** Steps (flips or trial starts) between two polls of the stop flag. */
export const WALK_POLL_INTERVAL = 4096;

/**
 * A CNF formula compiled for local search: duplicate literals merged, tautological clauses (x ∨ ¬x ∨ …)
 * dropped (no assignment violates them), empty clauses counted apart (every assignment violates them).
 * Literal code = 2·(variable index, 0-based) + (1 for a positive literal); a literal is true when
 * `value[code >> 1] === (code & 1)`.
 */
export interface CompiledCnf {
  /** Number of variables n. */
  readonly variables: number;
  /** Number of kept clauses (non-empty, non-tautological). */
  readonly clauses: number;
  /** Number of empty clauses in the input: a constant part of the cost. */
  readonly emptyClauses: number;
  /** Kept clause c occupies clauseLiterals[clauseStart[c] .. clauseStart[c+1]); length clauses + 1. */
  readonly clauseStart: Int32Array;
  /** Literal codes, clause after clause, each variable at most once per clause. */
  readonly clauseLiterals: Int32Array;
  /** Clauses containing literal code ℓ: occurrences[occurrenceStart[ℓ] .. occurrenceStart[ℓ+1]); length 2n + 1. */
  readonly occurrenceStart: Int32Array;
  /** Clause indices, literal code after literal code. */
  readonly occurrences: Int32Array;
  /** Largest number of kept clauses containing one variable (either sign). */
  readonly maxOccurrences: number;
  /**
   * The common length k of all kept clauses (then clause c occupies clauseLiterals[k·c .. k·c + k)), or 0 when
   * lengths differ or no clause was kept.
   */
  readonly clauseLength: number;
}

/**
 * Compiles a {@link Cnf} for local search (see {@link CompiledCnf}).
 * @throws RangeError on a literal 0 or a variable outside 1..n.
 */
export function compileCnf(cnf: Cnf): CompiledCnf {
  const n = cnf.variables;
  const m = cnf.offsets.length - 1;
  const start: number[] = [0];
  const lits: number[] = [];
  let emptyClauses = 0;
  // Marks of the clause being read, reset after each clause: 0 unseen, 1 seen positive, 2 seen negative.
  const mark = new Uint8Array(n);
  for (let c = 0; c < m; c++) {
    const from = cnf.offsets[c];
    const to = cnf.offsets[c + 1];
    if (from === to) {
      emptyClauses++;
      continue;
    }
    const begin = lits.length;
    let tautology = false;
    for (let i = from; i < to; i++) {
      const lit = cnf.literals[i];
      const v = lit > 0 ? lit - 1 : -lit - 1;
      if (lit === 0 || v >= n) throw new RangeError(`clause ${c + 1}: literal ${lit} outside 1..${n}`);
      const sign = lit > 0 ? 1 : 2;
      if (mark[v] === 0) {
        mark[v] = sign;
        lits.push(2 * v + (lit > 0 ? 1 : 0));
      } else if (mark[v] !== sign) {
        tautology = true;
      }
    }
    for (let i = begin; i < lits.length; i++) mark[lits[i] >> 1] = 0;
    if (tautology) lits.length = begin;
    else start.push(lits.length);
  }
  const clauses = start.length - 1;
  const clauseStart = Int32Array.from(start);
  const clauseLiterals = Int32Array.from(lits);

  const occurrenceStart = new Int32Array(2 * n + 1);
  for (const code of clauseLiterals) occurrenceStart[code + 1]++;
  for (let l = 0; l < 2 * n; l++) occurrenceStart[l + 1] += occurrenceStart[l];
  const fill = occurrenceStart.slice(0, 2 * n);
  const occurrences = new Int32Array(clauseLiterals.length);
  for (let c = 0; c < clauses; c++) {
    for (let i = clauseStart[c]; i < clauseStart[c + 1]; i++) occurrences[fill[clauseLiterals[i]]++] = c;
  }
  let maxOccurrences = 0;
  for (let v = 0; v < n; v++) {
    maxOccurrences = Math.max(maxOccurrences, occurrenceStart[2 * v + 2] - occurrenceStart[2 * v]);
  }
  let clauseLength = clauses > 0 ? clauseStart[1] : 0;
  for (let c = 1; c < clauses && clauseLength > 0; c++) if (clauseStart[c + 1] - clauseStart[c] !== clauseLength) clauseLength = 0;
  return { variables: n, clauses, emptyClauses, clauseStart, clauseLiterals, occurrenceStart, occurrences, maxOccurrences, clauseLength };
}

/** The per-cell key of {@link trialRng}: four 32-bit words, computed once per call by {@link trialKey}. */
export type TrialKey = Int32Array;

/**
 * The key of a cell seed for {@link trialRng}: the first 128 bits of SHA-256 of the canonical JSON
 * `[seed, "trial"]` (that is, `deriveSeed(seed, "trial")`), read as four big-endian 32-bit words k0..k3.
 * Costs one SHA-256 (≈ 1.5 µs), so callers compute it once per cell and pass it to {@link trialRng}.
 */
export function trialKey(seed: string): TrialKey {
  const hex = deriveSeed(seed, "trial");
  const key = new Int32Array(4);
  for (let i = 0; i < 4; i++) key[i] = parseInt(hex.slice(8 * i, 8 * i + 8), 16);
  return key;
}

/** Odd increments of the four Weyl sequences in {@link trialRng} (fractional parts of √2, √3, √5, √7 × 2^32, made odd). */
const TRIAL_GAMMA = Int32Array.of(0x6a09e667, 0xbb67ae85 | 0, 0x3c6ef373, 0xa54ff53b | 0);

/**
 * The generator of trial t of a cell, shared by the walk and the annealer; the only place trial seeding is
 * defined. Trial t of a cell: write t = 2^32·t_hi + t_lo; with the key words k0..k3 of {@link trialKey}(seed),
 * state word i = fmix32((k_i XOR fmix32(t_hi)) + (t_lo + 1)·γ_i mod 2^32), i = 0..3, with γ the odd constants
 * 0x6a09e667, 0xbb67ae85, 0x3c6ef373, 0xa54ff53b and fmix32 the 32-bit finaliser of MurmurHash3 (x ^= x >>> 16;
 * x ·= 0x85ebca6b; x ^= x >>> 13; x ·= 0xc2b2ae35; x ^= x >>> 16, products mod 2^32); the generator is
 * `Rng.fromWords` of these words (xoshiro128**; an all-zero state is replaced there). Each word is thus the
 * output of a SplitMix-style generator (a Weyl sequence through a bijective mixer: Steele, Lea & Flood, "Fast
 * splittable pseudorandom number generators", OOPSLA 2014) at step t, keyed by the cell, following the advice
 * of xoshiro's authors to fill its state from such a generator. Depends on nothing but (seed, t), so trial
 * counts do not depend on how a range of trials is split. Cost: about 70 ns with a precomputed key, against
 * 1.7 µs for the SHA-256 per trial of the derivation it replaced (`new Rng(deriveSeed(seed, "trial", t))`, an
 * eighth of a 3n-flip walk trial at n = 28 then).
 * @param seed - the cell seed, or its {@link trialKey} (what the solvers pass, hashing once per call).
 * @param t - trial index, a safe integer ≥ 0.
 */
export function trialRng(seed: string | TrialKey, t: number): Rng {
  const key = typeof seed === "string" ? trialKey(seed) : seed;
  const hi = fmix32((t / 4294967296) >>> 0); // t_hi (t < 2^53)
  const step = (t + 1) | 0; // t_lo + 1 mod 2^32
  return Rng.fromWords(
    fmix32((key[0] ^ hi) + Math.imul(step, TRIAL_GAMMA[0])),
    fmix32((key[1] ^ hi) + Math.imul(step, TRIAL_GAMMA[1])),
    fmix32((key[2] ^ hi) + Math.imul(step, TRIAL_GAMMA[2])),
    fmix32((key[3] ^ hi) + Math.imul(step, TRIAL_GAMMA[3])),
  );
}

/** MurmurHash3's 32-bit finaliser (a bijection of 32-bit words with full avalanche), on int32 values. */
function fmix32(x: number): number {
  x ^= x >>> 16;
  x = Math.imul(x, 0x85ebca6b);
  x ^= x >>> 13;
  x = Math.imul(x, 0xc2b2ae35);
  return x ^ (x >>> 16);
}

/**
 * Uniform integer in [0, bound) for 1 ≤ bound ≤ 2^32, by the same rejection method as `Rng.below`
 * (Lemire, ACM TOMACS 29 (2019)) and drawing the same numbers. This was the walk's fast draw while `Rng.below`
 * used floating-point modulo; `Rng.below` now works the same way and the walk calls it, and this stays as a
 * second implementation the tests compare it with.
 */
export function uniformBelow(rng: Rng, bound: number): number {
  let x = rng.nextU32();
  let low = Math.imul(x, bound) >>> 0;
  if (low < bound) {
    const threshold = (4294967296 - bound) % bound;
    while (low < threshold) {
      x = rng.nextU32();
      low = Math.imul(x, bound) >>> 0;
    }
  }
  if (bound <= 2097152) return Math.floor((x * bound) / 4294967296);
  // x·bound exceeds 2^53 here: form the high word from 16-bit halves so it stays exact.
  const xh = x >>> 16;
  const xl = x & 0xffff;
  const mid = xl * bound;
  return Math.floor((xh * bound + Math.floor(mid / 65536)) / 65536);
}

/**
 * Runs Schöning's walk trials `firstTrial .. firstTrial + trials − 1` on a formula.
 *
 * Counts: `work` = flips over the finished trials (the start assignment is not a flip), `best` = fewest
 * violated clauses seen at any point of any finished trial (+Infinity when none finished), success = no
 * violated clause. A clause of any length is handled; an empty clause makes success impossible (the walk
 * still runs on the other clauses and stops early once only empty clauses are violated). When the stop
 * flag is raised the trial in progress is dropped and `censored` is true.
 */
export function walkTrials(cnf: Cnf, options: WalkOptions): TrialsResult {
  return walkCompiled(compileCnf(cnf), options);
}

/**
 * {@link walkTrials} on an already compiled formula (for callers that run many cells on one instance).
 *
 * The draws of trial t, all from {@link trialRng}(seed, t), in this order (fixed so that results are
 * reproducible, and checked draw for draw against a plain transcription in test/walk.test.ts):
 * 1. the start: ⌈n/32⌉ calls of `nextU32`, bit b of call i giving variable 32·i + b;
 * 2. each step, with U violated clauses listed as described below: when all kept clauses have one length k,
 *    one `below(U·k)` = j picks entry ⌊j/k⌋ of the list and literal j mod k of that clause (a uniform clause and
 *    an independent uniform literal, as two draws would, for one draw); otherwise `below(U)` picks the entry
 *    and `below(length)` the literal.
 *
 * The violated list: after the start, the violated clauses in increasing index. A flip of v first visits
 * the clauses where v's literal became true, in increasing index, and removes each that was violated by
 * moving the list's last entry into its place; then the clauses where v's literal became false, in
 * increasing index, appending each that became violated.
 */
export function walkCompiled(f: CompiledCnf, options: WalkOptions): TrialsResult {
  const n = f.variables;
  const trials = options.trials;
  const maxFlips = options.maxFlips ?? 3 * n;
  const firstTrial = options.firstTrial ?? 0;
  checkCount("trials", trials);
  checkCount("maxFlips", maxFlips);
  checkCount("firstTrial", firstTrial);

  const m = f.clauses;
  const { clauseStart, clauseLiterals, occurrenceStart, occurrences } = f;
  const k = f.clauseLength;
  // ⌊j/k⌋ = ⌊j·invK⌋ exactly for 0 ≤ j < 2^39: invK exceeds 1/k by a relative 2^−40 (± rounding 2^−51),
  // which can neither lift j/k = q + r/k, r ≤ k − 1, to q + 1 nor leave an exact quotient below q.
  // Measured: 1.13 → 1.20e7 steps/s against Math.floor(j / k) (3-SAT n = 28, m = 119, 3n flips a trial; all
  // figures in this file are per CPU-second on that formula, node 20, the shared 2-core test machine).
  const invK = k > 0 ? (1 / k) * (1 + 2 ** -40) : 0;
  const empty = f.emptyClauses;
  const value = new Uint8Array(n);
  const trueCount = new Int32Array(m);
  // The violated list is violated[1 .. unsat] with position[c] its slot; slots 0 and unsat + 1 are scratch for
  // the branch-free updates below.
  const violated = new Int32Array(m + 2);
  const position = new Int32Array(m);
  const removed = new Int32Array(f.maxOccurrences + 1);
  const key = trialKey(options.seed);
  const stop = options.stop;

  let done = 0;
  let successes = 0;
  let work = 0;
  let best = Infinity;
  let censored = false;
  let sincePoll = WALK_POLL_INTERVAL; // poll before the first trial

  for (let t = firstTrial; t < firstTrial + trials; t++) {
    if (++sincePoll >= WALK_POLL_INTERVAL) {
      sincePoll = 0;
      if (stopRequested(stop)) {
        censored = true;
        break;
      }
    }
    const rng = trialRng(key, t);

    // 1. Uniform random start, 32 variables per draw.
    for (let v = 0; v < n; v += 32) {
      const bits = rng.nextU32();
      const top = Math.min(32, n - v);
      for (let b = 0; b < top; b++) value[v + b] = (bits >>> b) & 1;
    }

    // 2. True-literal counts and the violated list, built once per trial. Branch-free: (value ^ code ^ 1) & 1 is 1
    // when the literal is true, and every clause is written to the slot after the list, which advances only
    // when the clause is violated (a branch mispredicts on a random start; this rebuild was 22% of a 3n-flip
    // trial at n = 28). 3-SAT gets an unrolled copy: measured 950 → 585 ns a rebuild, 1.14 → 1.20e7 steps/s.
    let unsat = 0;
    if (k === 3) {
      for (let c = 0, i = 0; c < m; c++, i += 3) {
        const a = clauseLiterals[i];
        const b = clauseLiterals[i + 1];
        const d = clauseLiterals[i + 2];
        const count = ((value[a >> 1] ^ a ^ 1) & 1) + ((value[b >> 1] ^ b ^ 1) & 1) + ((value[d >> 1] ^ d ^ 1) & 1);
        trueCount[c] = count;
        violated[unsat + 1] = c;
        position[c] = unsat + 1;
        unsat += (count - 1) >>> 31;
      }
    } else {
      for (let c = 0; c < m; c++) {
        let count = 0;
        for (let i = clauseStart[c]; i < clauseStart[c + 1]; i++) {
          const code = clauseLiterals[i];
          count += (value[code >> 1] ^ code ^ 1) & 1;
        }
        trueCount[c] = count;
        violated[unsat + 1] = c;
        position[c] = unsat + 1;
        unsat += (count - 1) >>> 31;
      }
    }

    // 3. The walk.
    let trialBest = unsat;
    let flips = 0;
    let aborted = false;
    while (unsat > 0 && flips < maxFlips) {
      if (++sincePoll >= WALK_POLL_INTERVAL) {
        sincePoll = 0;
        if (stopRequested(stop)) {
          aborted = true;
          break;
        }
      }
      let code: number;
      if (k > 0) {
        // One draw for clause and literal: half the generator calls (measured 1.12 → 1.20e7 steps/s).
        const j = rng.below(unsat * k);
        const q = (j * invK) | 0;
        code = clauseLiterals[k * violated[q + 1] + j - k * q];
      } else {
        const c = violated[rng.below(unsat) + 1];
        const from = clauseStart[c];
        code = clauseLiterals[from + rng.below(clauseStart[c + 1] - from)];
      }
      const v = code >> 1;
      const now = value[v] ^ 1;
      value[v] = now;
      // Literals of v with the new value became true, the others false. Both loops are branch-free: the
      // first only counts and collects the clauses that stop being violated (at least the chosen one), which
      // are then removed in that order; the second writes every clause to the slot after the list and
      // advances it when the clause became violated. Measured against the branching version with the same
      // draws: 0.88 → 1.20e7 steps/s.
      const up = 2 * v + now;
      let nRemoved = 0;
      for (let i = occurrenceStart[up], end = occurrenceStart[up + 1]; i < end; i++) {
        const d = occurrences[i];
        const count = trueCount[d];
        trueCount[d] = count + 1;
        removed[nRemoved] = d;
        nRemoved += (count - 1) >>> 31;
      }
      for (let r = 0; r < nRemoved; r++) {
        const d = removed[r];
        const last = violated[unsat--];
        const p = position[d];
        violated[p] = last;
        position[last] = p;
      }
      const down = up ^ 1;
      for (let i = occurrenceStart[down], end = occurrenceStart[down + 1]; i < end; i++) {
        const d = occurrences[i];
        const count = trueCount[d] - 1;
        trueCount[d] = count;
        violated[unsat + 1] = d;
        position[d] = unsat + 1;
        unsat += (count - 1) >>> 31;
      }
      flips++;
      if (unsat < trialBest) trialBest = unsat;
    }
    if (aborted) {
      censored = true;
      break;
    }
    done++;
    work += flips;
    if (unsat === 0 && empty === 0) successes++;
    if (trialBest + empty < best) best = trialBest + empty;
  }
  return { trials: done, successes, work, best, censored };
}

function checkCount(name: string, value: number): void {
  if (!Number.isSafeInteger(value) || value < 0) throw new RangeError(`${name} must be an integer ≥ 0, got ${value}`);
}
