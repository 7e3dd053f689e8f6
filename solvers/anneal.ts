/**
 * Metropolis simulated annealing with single-spin flips (Kirkpatrick, Gelatt & Vecchi, "Optimization by
 * simulated annealing", Science 220 (1983) 671–680), for every problem kind the tool computes on.
 *
 * One trial: a uniformly random start, then `sweeps` sequential sweeps (variables 0..n−1 in order, one flip
 * attempt each); the inverse temperature β is constant within a sweep and follows the schedule from sweep to
 * sweep. A flip with cost change ΔE is accepted when ΔE ≤ 0, otherwise with probability exp(−βΔE).
 *
 * Success and work (our choice, stated once here): a trial succeeds when its cost reaches `target` (within
 * `tolerance`) at any point, the start included, and every trial runs its full length even after success, so
 * each trial costs exactly sweeps·n flip attempts. This keeps the per-trial cost fixed, which is what the
 * time-to-solution formula TTS = t_trial·ln(0.01)/ln(1−p) of Rønnow et al. ("Defining and detecting quantum
 * speedup", Science 345 (2014) 420) assumes, and what the search for the run length minimising TTS needs.
 *
 * Trial t draws only from `trialRng(seed, t)` (solvers/walk.ts), so any split of the trial range over calls
 * or workers gives the same counts. Draws of a trial: the start as in the walk (⌈n/32⌉ `nextU32` calls, bit b of
 * call i giving variable 32·i + b), then one `nextU32` = u per flip attempt in the CNF engine (accept when
 * ⌊u/2⌋ < 2^31·exp(−β·ΔE) and β·ΔE ≤ 32 ln 2; every attempt draws, so that the test is one integer compare
 * against a precomputed table) and one per uphill attempt with
 * β·ΔE ≤ 32 ln 2 in the Ising engines (accept when u < 2^32·exp(−β·ΔE); steeper uphill moves are rejected
 * without a draw, their probability being below the 2^−32 resolution of u).
 */
import { deriveSeed, Rng } from "../harness/random.js";
import type { Ising } from "../harness/model/ising.js";
import type { Problem } from "../harness/model/problem.js";
import { costTolerance } from "../harness/model/problem.js";
import { stopRequested, type StopFlag, type TrialsResult } from "./types.js";
import { compileCnf, trialKey, trialRng, type CompiledCnf } from "./walk.js";

/** Inverse-temperature schedule across sweeps. */
export type AnnealSchedule = "linear" | "geometric";

/** Options of {@link annealTrials}. */
export interface AnnealOptions {
  /** Number of trials (independent anneals), an integer ≥ 0. */
  readonly trials: number;
  /** Sweeps per trial (n flip attempts each), an integer ≥ 0: the run length. */
  readonly sweeps: number;
  /** Inverse temperature of the first sweep (1/cost unit), finite, ≥ 0 (> 0 for "geometric"). */
  readonly betaStart: number;
  /** Inverse temperature of the last sweep (1/cost unit), finite, ≥ 0 (> 0 for "geometric"). */
  readonly betaEnd: number;
  /**
   * "linear": β_s = β_start + (β_end − β_start)·s/(S−1); "geometric": β_s = β_start·(β_end/β_start)^(s/(S−1)),
   * for sweep s = 0..S−1 (a single sweep runs at β_start).
   */
  readonly schedule: AnnealSchedule;
  /** Cost counted as success, normally the exact optimum from ground truth (violated clauses or energy). */
  readonly target: number;
  /** Absolute tolerance: success when cost ≤ target + tolerance, ≥ 0. */
  readonly tolerance: number;
  /** Index of the first trial (trial t draws from trialRng(seed, t) of solvers/walk.ts). Default 0. */
  readonly firstTrial?: number;
  /** Cell seed the trial generators are derived from. */
  readonly seed: string;
  /** Cooperative stop flag, polled between sweeps about every {@link ANNEAL_POLL_INTERVAL} flip attempts. */
  readonly stop: StopFlag;
}

/** Flip attempts between two polls of the stop flag (polled at sweep boundaries). */
export const ANNEAL_POLL_INTERVAL = 4096;

/**
 * Uphill moves with β·ΔE above this are rejected without drawing a number: their acceptance probability
 * exp(−β·ΔE) < 2^−32 is below the resolution of the 32-bit uniform the test compares with anyway.
 */
const MAX_EXPONENT = 32 * Math.LN2;

/** Steps per unit of β·ΔE in {@link EXP_TABLE}. */
const EXP_STEPS = 64;

/**
 * EXP_TABLE[k] = exp(−k/64)·2^32, for exact Metropolis tests without calling Math.exp on most attempts:
 * with x = β·ΔE in [k/64, (k+1)/64], EXP_TABLE[k+1] ≤ exp(−x)·2^32 ≤ EXP_TABLE[k], so a 32-bit uniform u
 * below the lower entry accepts, at or above the upper one rejects, and only the band between them (a
 * fraction ≤ 1/64 of the draws) needs Math.exp. The decision equals `u < exp(−x)·2^32` exactly.
 * Measured on SK n = 26: 1.9× the attempt rate of calling Math.exp on every uphill attempt.
 */
const EXP_TABLE = (() => {
  const table = new Float64Array(Math.ceil(MAX_EXPONENT * EXP_STEPS) + 2);
  for (let k = 0; k < table.length; k++) table[k] = Math.exp(-k / EXP_STEPS) * 4294967296;
  return table;
})();

/** The generator an engine holds before its first start (never drawn from). */
const PLACEHOLDER_RNG = Rng.fromWords(1, 0, 0, 0);

/** Largest n for the dense pair matrix (8·n² bytes: 32 MiB at 2048). */
const DENSE_MAX_SPINS = 2048;

/**
 * Runs annealing trials `firstTrial .. firstTrial + trials − 1` on a problem.
 *
 * `work` = flip attempts over finished trials (sweeps·n each); `best` = lowest cost seen at any point of any
 * finished trial (+Infinity when none finished; for Ising energies an incrementally updated value, exact to
 * rounding, and recomputed from scratch whenever it is taken as success). When the stop flag is raised the
 * trial in progress is dropped and `censored` is true.
 *
 * Cost bookkeeping: CNF (cost = violated clauses) keeps true-literal counts and, per variable, the integer
 * ΔE of flipping it, so an attempt is O(1) and an accepted flip O(occurrences × clause length); acceptance
 * thresholds come from a table of ⌈2^31·exp(−β_s·d)⌉ for every sweep s and integer d, computed once per call. Ising models of order ≤ 2 whose
 * couplings fill at least a quarter of the pairs (and n ≤ 2048) keep a dense coupling matrix and local fields
 * (attempt O(1), accepted flip O(n)); all other models (sparse graphs, higher orders) keep term products and
 * per-spin sums over the terms containing the spin (attempt O(1), accepted flip O(Σ sizes of its terms)).
 */
export function annealTrials(problem: Problem, options: AnnealOptions): TrialsResult {
  const { trials, sweeps, betaStart, betaEnd, schedule, target, tolerance } = options;
  const firstTrial = options.firstTrial ?? 0;
  checkCount("trials", trials);
  checkCount("sweeps", sweeps);
  checkCount("firstTrial", firstTrial);
  if (!Number.isFinite(target)) throw new RangeError(`target must be finite, got ${target}`);
  if (!(tolerance >= 0) || !Number.isFinite(tolerance)) throw new RangeError(`tolerance must be finite and ≥ 0, got ${tolerance}`);
  const betas = betaSchedule(betaStart, betaEnd, sweeps, schedule);

  const engine = makeEngine(problem);
  const n = engine.n;
  engine.prepare(betas);
  const threshold = target + tolerance;
  const key = trialKey(options.seed);
  const poll: Poll = { stop: options.stop, since: ANNEAL_POLL_INTERVAL }; // poll before the first trial
  let done = 0;
  let successes = 0;
  let best = Infinity;
  let censored = false;

  for (let t = firstTrial; t < firstTrial + trials; t++) {
    if (pollStop(poll)) {
      censored = true;
      break;
    }
    engine.start(trialRng(key, t), threshold);
    poll.since += 1;
    // The whole trial runs inside the engine, so the sweep loop keeps its arrays in locals (the stop flag is
    // still polled between sweeps, through `poll`).
    if (!engine.run(poll)) {
      censored = true; // the trial in progress is dropped
      break;
    }
    done++;
    if (engine.hit) successes++;
    if (engine.best < best) best = engine.best;
  }
  return { trials: done, successes, work: done * sweeps * n, best, censored };
}

/** Stop-flag polling shared by the trial loop and the engines' sweep loops (exported for solvers/tempering.ts). */
export interface Poll {
  readonly stop: StopFlag;
  /** Flip attempts (and trial starts) since the last poll. */
  since: number;
}

/** Polls the stop flag when {@link ANNEAL_POLL_INTERVAL} attempts have passed since the last poll. */
export function pollStop(poll: Poll): boolean {
  if (poll.since < ANNEAL_POLL_INTERVAL) return false;
  poll.since = 0;
  return stopRequested(poll.stop);
}

/**
 * Default inverse-temperature range of a problem, derived from its own energy scale by this rule
 * (deterministic: the sample comes from a fixed seed, so the range is a pure function of the instance):
 *
 * 1. Draw R = min(64, max(4, ⌈4096/n⌉)) uniformly random states and record |ΔE| of all n single flips of each.
 *    β_start = ln 2 / median of the non-zero |ΔE|: a typical uphill move from a random state is accepted
 *    with probability 1/2.
 * 2. From each of those states, descend greedily (sequential sweeps flipping every variable whose flip
 *    lowers the cost, until a sweep flips none) and record the uphill ΔE > 0 of all single flips at the local
 *    minimum reached. β_end = ln 1000 / (their 10% quantile, nearest rank): the smallest escape steps out of
 *    low-lying states are accepted with probability ~1e−3. For integer costs (CNF) this quantile is the
 *    smallest non-zero |ΔE|, 1, so β_end = ln 1000; for continuous couplings (SK) the quantile stands in for
 *    the minimum, which a finite sample of a continuous distribution would put arbitrarily close to zero.
 * 3. β_end is raised, if need be, to (ln 1000/ln 2)·β_start (the typical random-state uphill move accepted with
 *    probability 1e−3), so β_end > β_start always. Without any non-zero ΔE (no clauses, all J = 0) both
 *    scales are taken as 1.
 *
 * "Non-zero" means above 0.5 for CNF and above the problem's cost tolerance for Ising models.
 * @returns β_start, β_end (1/cost unit) and the rule in words, for the manifest.
 */
export function defaultBetaRange(problem: Problem): { betaStart: number; betaEnd: number; rule: string } {
  const engine = makeEngine(problem);
  const n = engine.n;
  const eps = problem.kind === "cnf" ? 0.5 : costTolerance(problem);
  const samples = Math.min(64, Math.max(4, Math.ceil(4096 / Math.max(n, 1))));
  const rng = new Rng(deriveSeed("speedbound", "anneal", "default-beta-range"));
  const random: number[] = [];
  const minima: number[] = [];
  for (let r = 0; r < samples; r++) {
    engine.start(rng, -Infinity);
    for (let i = 0; i < n; i++) {
      const d = Math.abs(engine.delta(i));
      if (d > eps) random.push(d);
    }
    // Every flip lowers the cost by more than eps, so the descent ends; the sweep cap only guards the loop.
    for (let sweep = 0, improved = true; improved && sweep < 10 * n + 100; sweep++) {
      improved = false;
      for (let i = 0; i < n; i++) {
        if (engine.delta(i) < -eps) {
          engine.flip(i);
          improved = true;
        }
      }
    }
    for (let i = 0; i < n; i++) {
      const d = engine.delta(i);
      if (d > eps) minima.push(d);
    }
  }
  const typical = random.length > 0 ? quantile(random, 0.5) : 1;
  const small = minima.length > 0 ? quantile(minima, 0.1) : typical;
  const betaStart = Math.LN2 / typical;
  const betaEnd = Math.max(Math.log(1000) / small, (Math.log(1000) / Math.LN2) * betaStart);
  const rule =
    `beta_start = ln2/median|dE| over single flips of ${samples} random states (median ${fmt(typical)}); ` +
    `beta_end = max(ln1000/q10, (ln1000/ln2)*beta_start), q10 = 10% quantile of uphill dE at greedy local minima ` +
    `of those states (${fmt(small)})`;
  return { betaStart, betaEnd, rule };
}

/** The inverse temperature of each sweep (see {@link AnnealOptions.schedule}). */
export function betaSchedule(betaStart: number, betaEnd: number, sweeps: number, schedule: AnnealSchedule): Float64Array {
  if (!Number.isFinite(betaStart) || !Number.isFinite(betaEnd) || betaStart < 0 || betaEnd < 0) {
    throw new RangeError(`betaStart and betaEnd must be finite and ≥ 0, got ${betaStart}, ${betaEnd}`);
  }
  if (schedule !== "linear" && schedule !== "geometric") throw new RangeError(`unknown schedule '${String(schedule)}'`);
  if (schedule === "geometric" && (betaStart <= 0 || betaEnd <= 0)) {
    throw new RangeError(`a geometric schedule needs betaStart, betaEnd > 0, got ${betaStart}, ${betaEnd}`);
  }
  const betas = new Float64Array(sweeps);
  for (let s = 0; s < sweeps; s++) {
    const f = sweeps === 1 ? 0 : s / (sweeps - 1);
    betas[s] = schedule === "linear" ? betaStart + (betaEnd - betaStart) * f : betaStart * Math.pow(betaEnd / betaStart, f);
  }
  return betas;
}

/** What the trial loop needs from a cost representation (exported for solvers/tempering.ts, which runs one engine per replica). */
export interface Engine {
  readonly n: number;
  /** Lowest cost of the current trial. */
  best: number;
  /** True once the current trial has reached the success threshold (verified from scratch for Ising). */
  hit: boolean;
  /** Takes the inverse temperature of each sweep, once per call of annealTrials. */
  prepare(betas: Float64Array): void;
  /**
   * Random start from `rng`, every cache rebuilt from scratch; `threshold` = target + tolerance. The engine
   * keeps `rng` for the sweeps of {@link Engine.run}.
   */
  start(rng: Rng, threshold: number): void;
  /**
   * The prepared sweeps from the started state (sweeps `from` .. `to` − 1 of the prepared schedule, default all;
   * tempering runs one sweep at a time): before each sweep `poll` is checked (and advanced by n after it). Returns
   * false when the stop flag stopped the trial.
   */
  run(poll: Poll, from?: number, to?: number): boolean;
  /** Cost of the current state (violated clauses, or the running Ising energy, exact to rounding). */
  current(): number;
  /** Cost change of flipping variable i in the current state. */
  delta(i: number): number;
  /** Flips variable i unconditionally. */
  flip(i: number): void;
}

/** The fastest engine for a problem (see {@link annealTrials}). */
export function makeEngine(problem: Problem): Engine {
  if (problem.kind === "cnf") return new CnfEngine(compileCnf(problem.cnf));
  const model = problem.ising;
  const n = model.spins;
  let order = 0;
  let pairs = 0;
  for (let t = 0; t + 1 < model.termOffsets.length; t++) {
    const size = model.termOffsets[t + 1] - model.termOffsets[t];
    order = Math.max(order, size);
    if (size === 2) pairs++;
  }
  if (order <= 2 && n <= DENSE_MAX_SPINS && 4 * pairs >= (n * (n - 1)) / 2) return new DenseEngine(model);
  return new TermEngine(model);
}

function randomBits(rng: Rng, out: Uint8Array): void {
  const n = out.length;
  for (let v = 0; v < n; v += 32) {
    const bits = rng.nextU32();
    const top = Math.min(32, n - v);
    for (let b = 0; b < top; b++) out[v + b] = (bits >>> b) & 1;
  }
}

/** Entries of a precomputed acceptance table above which {@link CnfEngine} fills one row per sweep instead. */
const CNF_TABLE_MAX = 1 << 20;

/**
 * CNF: cost = violated clauses; per-variable ΔE = break − make kept incrementally (the classic make/break
 * bookkeeping of local search for SAT: break(v) counts the clauses v alone satisfies, make(v) the violated
 * clauses containing v). Per clause one packed word: its true-literal count in the low `countBits` bits and,
 * above them, the XOR of the variables whose literal in it is true, which names the critical variable when the
 * count is 1. An attempt reads one ΔE and one threshold; an accepted flip visits the clauses of the variable.
 *
 * All integer data sit in one Int32Array, `mem`, and every stored index is a position in `mem` itself, so
 * the loops index with loaded values directly. V8 re-checks the map and reloads length and base of each
 * distinct typed array in every loop iteration, and the section offsets of a single array cost an addition
 * with an overflow check per access; this layout avoids both. Measured on 3-SAT n = 28, m = 119, 1000 sweeps
 * (bench schedule), against an earlier version of this loop on seven typed arrays: 317 → about 250
 * instructions an attempt (valgrind), 23.1 → 18.9 ns an attempt (per CPU-second, node 20, shared 2-core test
 * machine); the whole annealTrials went from 3.6–3.7e7 to 5.4e7 attempts/s there.
 *
 * Sections, in order:
 * - [0, P): per variable 2·ΔE + value bit, P = n rounded up to a power of two ≥ 2 (so an XOR of variable
 *   indices stays inside; the padding stays 0). Variable v's entry is at position v, so a clause's XOR of variable
 *   indices is also the position of the critical variable's entry.
 * - occurrence starts (2n + 1): for literal code ℓ, the positions of its occurrence entries are
 *   mem[occStartAt + ℓ] .. mem[occStartAt + ℓ + 1].
 * - occurrence entries: the position of the clause's word.
 * - clause words (m): count | xor << countBits; the word of clause c is at wordAt + c.
 * - clause variable starts (m + 1), right after the words: clause c's variables are at positions
 *   mem[wordAt + m + c] .. mem[wordAt + m + c + 1], found from the word's position w as mem[w + m].
 * - clause variables: variable indices (= positions of their ΔE entries).
 * - acceptance thresholds on a 31-bit uniform w: row s, entry d = ⌈2^31·exp(−β_s·d)⌉ − 1, so that
 *   w ≤ entry ⇔ w < 2^31·exp(−β_s·d); 2^31 − 1 at d = 0 (always), −1 when β·d > 32 ln 2 (never).
 */
class CnfEngine implements Engine {
  readonly n: number;
  best = Infinity;
  hit = false;
  private cost = 0;
  private threshold = -Infinity;
  private rng: Rng = PLACEHOLDER_RNG;
  private readonly f: CompiledCnf;
  private readonly countBits: number;
  private readonly occStartAt: number;
  private readonly wordAt: number;
  private readonly acceptAt: number;
  private mem: Int32Array;
  private readonly value: Uint8Array;
  private betas: Float64Array = new Float64Array(0);
  /** True when the table holds one row, refilled each sweep (very long schedules). */
  private rowPerSweep = false;

  constructor(f: CompiledCnf) {
    const n = f.variables;
    const m = f.clauses;
    const literals = f.clauseLiterals.length;
    this.f = f;
    this.n = n;
    this.value = new Uint8Array(n);
    let maxLength = 0;
    for (let c = 0; c < m; c++) maxLength = Math.max(maxLength, f.clauseStart[c + 1] - f.clauseStart[c]);
    this.countBits = 32 - Math.clz32(maxLength);
    // At least 2, so that occStartAt is even and the two literal codes 2v, 2v + 1 of a variable sit at positions
    // differing only in the lowest bit (the loops find one from the other by XOR 1).
    const padded = 2 ** Math.ceil(Math.log2(Math.max(n, 2)));
    if (padded * 2 ** this.countBits > 2 ** 32) {
      throw new RangeError(`anneal: ${n} variables with clauses of up to ${maxLength} literals do not fit the packed clause words`);
    }
    this.occStartAt = padded;
    const occAt = this.occStartAt + 2 * n + 1;
    this.wordAt = occAt + literals;
    const varStartAt = this.wordAt + m;
    const varAt = varStartAt + m + 1;
    this.acceptAt = varAt + literals;
    const mem = new Int32Array(this.acceptAt);
    for (let l = 0; l <= 2 * n; l++) mem[this.occStartAt + l] = occAt + f.occurrenceStart[l];
    for (let i = 0; i < literals; i++) mem[occAt + i] = this.wordAt + f.occurrences[i];
    for (let c = 0; c <= m; c++) mem[varStartAt + c] = varAt + f.clauseStart[c];
    for (let i = 0; i < literals; i++) mem[varAt + i] = f.clauseLiterals[i] >> 1;
    this.mem = mem;
  }

  prepare(betas: Float64Array): void {
    const width = this.f.maxOccurrences + 1;
    this.betas = betas;
    this.rowPerSweep = betas.length * width > CNF_TABLE_MAX;
    const mem = new Int32Array(this.acceptAt + (this.rowPerSweep ? width : betas.length * width));
    mem.set(this.mem.subarray(0, this.acceptAt));
    this.mem = mem;
    if (!this.rowPerSweep) for (let s = 0; s < betas.length; s++) this.fillRow(this.acceptAt + s * width, betas[s]);
  }

  /** One row of thresholds (see the class comment), each entry from Math.exp. */
  private fillRow(at: number, beta: number): void {
    const mem = this.mem;
    mem[at] = 0x7fffffff;
    for (let d = 1; d <= this.f.maxOccurrences; d++) {
      const x = beta * d;
      mem[at + d] = x > MAX_EXPONENT ? -1 : Math.ceil(Math.exp(-x) * 2147483648) - 1;
    }
  }

  start(rng: Rng, threshold: number): void {
    const { clauses, clauseStart, clauseLiterals } = this.f;
    const value = this.value;
    const mem = this.mem;
    const words = this.wordAt;
    const bits = this.countBits;
    this.rng = rng;
    randomBits(rng, value);
    mem.fill(0, 0, this.occStartAt);
    let cost = this.f.emptyClauses;
    for (let c = 0; c < clauses; c++) {
      let count = 0;
      let x = 0;
      for (let i = clauseStart[c]; i < clauseStart[c + 1]; i++) {
        const code = clauseLiterals[i];
        const isTrue = (value[code >> 1] ^ code ^ 1) & 1; // branch-free, as in the walk's rebuild
        count += isTrue;
        x ^= (code >> 1) & -isTrue;
      }
      mem[words + c] = count | (x << bits);
      if (count === 0) {
        cost++;
        for (let i = clauseStart[c]; i < clauseStart[c + 1]; i++) mem[clauseLiterals[i] >> 1] -= 2;
      } else if (count === 1) {
        mem[x] += 2;
      }
    }
    for (let v = 0; v < this.n; v++) mem[v] |= value[v];
    this.cost = cost;
    this.best = cost;
    this.hit = cost <= threshold;
    this.threshold = this.hit ? -Infinity : threshold;
  }

  delta(i: number): number {
    return this.mem[i] >> 1;
  }

  flip(v: number): void {
    const mem = this.mem;
    const m = this.f.clauses;
    const bits = this.countBits;
    const mask = (1 << bits) - 1;
    const e = mem[v];
    this.cost += e >> 1;
    mem[v] = e ^ 1;
    const vx = v << bits;
    const up = this.occStartAt + 2 * v + ((e & 1) ^ 1);
    for (let k = mem[up], end = mem[up + 1]; k < end; k++) {
      const w = mem[k];
      const word = mem[w];
      const count = word & mask;
      if (count === 0) {
        // 0 → 1: the clause no longer offers a make to its variables; v is now its critical variable.
        for (let i = mem[w + m], e2 = mem[w + m + 1]; i < e2; i++) mem[mem[i]] += 2;
        mem[v] += 2;
      } else if (count === 1) {
        mem[word >>> bits] -= 2; // 1 → 2: the critical variable loses its break
      }
      mem[w] = (word + 1) ^ vx;
    }
    const down = up ^ 1;
    for (let k = mem[down], end = mem[down + 1]; k < end; k++) {
      const w = mem[k];
      const word = mem[w] ^ vx;
      const count = word & mask;
      if (count === 1) {
        // 1 → 0: v loses its break, every variable of the clause gains a make.
        mem[v] -= 2;
        for (let i = mem[w + m], e2 = mem[w + m + 1]; i < e2; i++) mem[mem[i]] -= 2;
      } else if (count === 2) {
        mem[word >>> bits] += 2; // 2 → 1: the remaining true variable becomes critical
      }
      mem[w] = word - 1;
    }
  }

  current(): number {
    return this.cost;
  }

  run(poll: Poll, from = 0, to = this.betas.length): boolean {
    // The flip is written out here rather than calling flip(), so that everything stays in locals for the
    // whole trial. `| 0` marks the values read from fields as int32 once, here (read from fields, they were
    // untagged and checked at every use inside the loops, as the optimised code showed; measured with valgrind
    // on the seven-array version: 301 → 293 instructions an attempt), and on index sums, which then need no
    // overflow check.
    const mem = this.mem;
    const occStart = this.occStartAt | 0;
    const acceptAt = this.acceptAt | 0;
    const m = this.f.clauses | 0;
    const n = this.n | 0;
    const betas = this.betas;
    const bits = this.countBits | 0;
    const mask = (1 << bits) - 1;
    const width = (this.f.maxOccurrences + 1) | 0;
    const threshold = this.threshold;
    const state = this.rng.state;
    let s0 = state[0];
    let s1 = state[1];
    let s2 = state[2];
    let s3 = state[3];
    let cost = this.cost;
    let best = this.best;
    let hit = this.hit;
    let stopped = false;
    for (let s = from; s < to; s++) {
      if (pollStop(poll)) {
        stopped = true;
        break;
      }
      poll.since += n;
      let row = acceptAt;
      if (this.rowPerSweep) this.fillRow(row, betas[s]);
      else row = (acceptAt + s * width) | 0;
      for (let v = 0; v < n; v++) {
        const e = mem[v];
        const delta = e >> 1;
        // xoshiro128** (Rng.nextU32) on local copies of the state words, rotations written out (a call of a
        // module-level function is re-checked at every use in optimised code).
        const m5 = Math.imul(s1, 5);
        const u = Math.imul((m5 << 7) | (m5 >>> 25), 9) >>> 1;
        s2 ^= s0;
        s3 ^= s1;
        const t9 = s1 << 9;
        s1 ^= s2;
        s0 ^= s3;
        s2 ^= t9;
        s3 = (s3 << 11) | (s3 >>> 21);
        // Threshold index max(ΔE, 0). Every attempt draws, so the test is a single compare.
        if (u > mem[(row + (delta & ~(delta >> 31))) | 0]) continue;
        cost += delta;
        mem[v] = e ^ 1;
        const vx = v << bits;
        const up = (occStart + 2 * v + ((e & 1) ^ 1)) | 0;
        // The count = 1 (up) and count = 2 (down) cases update unconditionally with a 0/1 weight,
        // ((count ^ 1) − 1) >>> 31 = [count = 1]: measured 22.4 → 27.7 ns an attempt with those branches
        // instead (they mispredict often). The XOR of true variables may index the padding of the ΔE section
        // when the weight is 0.
        for (let k = mem[up], end = mem[(up + 1) | 0]; k < end; k = (k + 1) | 0) {
          const w = mem[k];
          const word = mem[w];
          const count = word & mask;
          if (count === 0) {
            for (let i = mem[(w + m) | 0], e2 = mem[(w + m + 1) | 0]; i < e2; i = (i + 1) | 0) mem[mem[i]] += 2;
            mem[v] += 2;
          }
          mem[word >>> bits] -= (((count ^ 1) - 1) >>> 31) << 1;
          mem[w] = (word + 1) ^ vx;
        }
        const down = up ^ 1;
        for (let k = mem[down], end = mem[(down + 1) | 0]; k < end; k = (k + 1) | 0) {
          const w = mem[k];
          const word = mem[w] ^ vx;
          const count = word & mask;
          if (count === 1) {
            mem[v] -= 2;
            for (let i = mem[(w + m) | 0], e2 = mem[(w + m + 1) | 0]; i < e2; i = (i + 1) | 0) mem[mem[i]] -= 2;
          }
          mem[word >>> bits] += (((count ^ 2) - 1) >>> 31) << 1;
          mem[w] = word - 1;
        }
        if (cost < best) {
          best = cost;
          if (cost <= threshold) hit = true;
        }
      }
    }
    state[0] = s0;
    state[1] = s1;
    state[2] = s2;
    state[3] = s3;
    this.cost = cost;
    this.best = best;
    this.hit = hit;
    return !stopped;
  }
}

/** Split of an Ising model into constant, local fields and the remaining terms. */
function splitTerms(model: Ising): { constant: number; field: Float64Array } {
  let constant = model.constant;
  const field = new Float64Array(model.spins);
  for (let t = 0; t + 1 < model.termOffsets.length; t++) {
    const size = model.termOffsets[t + 1] - model.termOffsets[t];
    if (size === 0) constant -= model.coefficients[t];
    else if (size === 1) field[model.termSpins[model.termOffsets[t]]] += model.coefficients[t];
  }
  return { constant, field };
}

/** Exact energy of spins s (±1) from the term list, for starts and for verifying a success. */
function energyFromTerms(model: Ising, s: Float64Array): number {
  let e = model.constant;
  for (let t = 0; t + 1 < model.termOffsets.length; t++) {
    let p = 1;
    for (let i = model.termOffsets[t]; i < model.termOffsets[t + 1]; i++) p *= s[model.termSpins[i]];
    e -= model.coefficients[t] * p;
  }
  return e;
}

/**
 * Read-only tables of a model, shared by all engines built on it: tempering (solvers/tempering.ts) runs one engine
 * per replica, and one shared copy stays in cache. Measured (spin-update attempts per CPU-second, tempering against
 * annealing at equal work, node 20, loaded 2-core test machine): SK n = 64, 8 replicas × 500 rounds 0.83 → 0.89 of the
 * annealer's rate, 16 × 100 0.76 → 0.83; 3-spin n = 32 unchanged within noise (its per-replica term products dominate).
 */
const SHARED_TABLES = new WeakMap<Ising, { coupling?: Float64Array; terms?: TermTables }>();

/** The dense symmetric coupling matrix of a model of order ≤ 2 (n×n, row-major), built once per model. */
function denseCoupling(model: Ising): Float64Array {
  const shared = SHARED_TABLES.get(model) ?? {};
  if (shared.coupling === undefined) {
    const n = model.spins;
    const coupling = new Float64Array(n * n);
    for (let t = 0; t + 1 < model.termOffsets.length; t++) {
      if (model.termOffsets[t + 1] - model.termOffsets[t] !== 2) continue;
      const i = model.termSpins[model.termOffsets[t]];
      const j = model.termSpins[model.termOffsets[t] + 1];
      coupling[i * n + j] += model.coefficients[t];
      coupling[j * n + i] += model.coefficients[t];
    }
    shared.coupling = coupling;
    SHARED_TABLES.set(model, shared);
  }
  return shared.coupling;
}

/** Ising of order ≤ 2 with a dense symmetric coupling matrix; h_i = f_i + Σ_j J_ij s_j, ΔE_i = 2 s_i h_i. */
class DenseEngine implements Engine {
  readonly n: number;
  best = Infinity;
  hit = false;
  private energy = 0;
  private threshold = -Infinity;
  private rng: Rng = PLACEHOLDER_RNG;
  private betas: Float64Array = new Float64Array(0);
  private readonly model: Ising;
  private readonly coupling: Float64Array;
  private readonly field: Float64Array;
  private readonly spin: Float64Array;
  private readonly local: Float64Array;
  private readonly bits: Uint8Array;

  constructor(model: Ising) {
    const n = model.spins;
    this.n = n;
    this.model = model;
    this.field = splitTerms(model).field;
    this.coupling = denseCoupling(model);
    this.spin = new Float64Array(n);
    this.local = new Float64Array(n);
    this.bits = new Uint8Array(n);
  }

  prepare(betas: Float64Array): void {
    this.betas = betas;
  }

  current(): number {
    return this.energy;
  }

  run(poll: Poll, from = 0, to = this.betas.length): boolean {
    const betas = this.betas;
    for (let s = from; s < to; s++) {
      if (pollStop(poll)) return false;
      poll.since += this.n;
      this.sweep(betas[s], this.rng);
    }
    return true;
  }

  start(rng: Rng, threshold: number): void {
    this.rng = rng;
    const n = this.n;
    randomBits(rng, this.bits);
    for (let i = 0; i < n; i++) this.spin[i] = this.bits[i] === 0 ? 1 : -1;
    for (let i = 0; i < n; i++) {
      let h = this.field[i];
      for (let j = 0; j < n; j++) h += this.coupling[i * n + j] * this.spin[j];
      this.local[i] = h;
    }
    this.energy = energyFromTerms(this.model, this.spin);
    this.best = this.energy;
    this.hit = this.energy <= threshold;
    this.threshold = this.hit ? -Infinity : threshold;
  }

  delta(i: number): number {
    return 2 * this.spin[i] * this.local[i];
  }

  flip(i: number): void {
    const n = this.n;
    const s = this.spin;
    const h = this.local;
    const J = this.coupling;
    this.energy += 2 * s[i] * h[i];
    const c = -2 * s[i];
    s[i] = -s[i];
    const row = i * n;
    for (let j = 0; j < n; j++) h[j] += c * J[row + j];
  }

  sweep(beta: number, rng: Rng): void {
    const n = this.n;
    const s = this.spin;
    const h = this.local;
    const J = this.coupling;
    const table = EXP_TABLE;
    let e = this.energy;
    let best = this.best;
    for (let i = 0; i < n; i++) {
      const si = s[i];
      const d = 2 * si * h[i];
      if (d > 0) {
        const x = beta * d;
        if (x > MAX_EXPONENT) continue;
        const u = rng.nextU32();
        const k = (x * EXP_STEPS) | 0;
        if (u >= table[k] || (u >= table[k + 1] && u >= Math.exp(-x) * 4294967296)) continue;
      }
      s[i] = -si;
      const c = -2 * si;
      const row = i * n;
      for (let j = 0; j < n; j++) h[j] += c * J[row + j];
      e += d;
      if (e < best) {
        best = e;
        if (e <= this.threshold) e = this.confirm(e);
      }
    }
    this.energy = e;
    this.best = best;
  }

  /** Recomputes the energy from scratch when the running value claims success; returns the exact value. */
  private confirm(running: number): number {
    const exact = energyFromTerms(this.model, this.spin);
    if (exact <= this.threshold) {
      this.hit = true;
      this.threshold = -Infinity; // one success per trial is all we count
    }
    return Number.isFinite(exact) ? exact : running;
  }
}

/** The non-constant terms of a model and, per spin, the terms containing it (see {@link TermEngine}). */
interface TermTables {
  readonly termStart: Int32Array;
  readonly termSpins: Int32Array;
  readonly termJ: Float64Array;
  readonly memberStart: Int32Array;
  readonly memberOf: Int32Array;
}

/** {@link TermTables} of a model, built once per model. */
function termTables(model: Ising): TermTables {
  const shared = SHARED_TABLES.get(model) ?? {};
  if (shared.terms === undefined) {
    const n = model.spins;
    const start: number[] = [0];
    const spins: number[] = [];
    const J: number[] = [];
    for (let t = 0; t + 1 < model.termOffsets.length; t++) {
      const from = model.termOffsets[t];
      const to = model.termOffsets[t + 1];
      if (from === to) continue;
      for (let i = from; i < to; i++) spins.push(model.termSpins[i]);
      start.push(spins.length);
      J.push(model.coefficients[t]);
    }
    const memberStart = new Int32Array(n + 1);
    for (const i of spins) memberStart[i + 1]++;
    for (let i = 0; i < n; i++) memberStart[i + 1] += memberStart[i];
    const fill = memberStart.slice(0, n);
    const memberOf = new Int32Array(spins.length);
    for (let t = 0; t < J.length; t++) {
      for (let k = start[t]; k < start[t + 1]; k++) memberOf[fill[spins[k]]++] = t;
    }
    shared.terms = { termStart: Int32Array.from(start), termSpins: Int32Array.from(spins), termJ: Float64Array.from(J), memberStart, memberOf };
    SHARED_TABLES.set(model, shared);
  }
  return shared.terms;
}

/**
 * Any Ising model through its term list: product sign of each term, and per spin g_i = Σ_{t∋i} J_t·Π_t s,
 * so ΔE_i = 2·g_i; flipping i negates its terms' products and moves g_j of their other spins.
 */
class TermEngine implements Engine {
  readonly n: number;
  best = Infinity;
  hit = false;
  private energy = 0;
  private threshold = -Infinity;
  private rng: Rng = PLACEHOLDER_RNG;
  private betas: Float64Array = new Float64Array(0);
  private readonly model: Ising;
  /** Non-constant terms: spins of term t are termSpins[termStart[t] .. termStart[t+1]). */
  private readonly termStart: Int32Array;
  private readonly termSpins: Int32Array;
  private readonly termJ: Float64Array;
  /** Terms containing spin i: memberOf[memberStart[i] .. memberStart[i+1]). */
  private readonly memberStart: Int32Array;
  private readonly memberOf: Int32Array;
  private readonly product: Float64Array;
  private readonly sum: Float64Array;
  private readonly spin: Float64Array;
  private readonly bits: Uint8Array;

  constructor(model: Ising) {
    const n = model.spins;
    this.n = n;
    this.model = model;
    const tables = termTables(model);
    this.termStart = tables.termStart;
    this.termSpins = tables.termSpins;
    this.termJ = tables.termJ;
    this.memberStart = tables.memberStart;
    this.memberOf = tables.memberOf;
    const terms = tables.termJ.length;
    this.product = new Float64Array(terms);
    this.sum = new Float64Array(n);
    this.spin = new Float64Array(n);
    this.bits = new Uint8Array(n);
  }

  prepare(betas: Float64Array): void {
    this.betas = betas;
  }

  current(): number {
    return this.energy;
  }

  run(poll: Poll, from = 0, to = this.betas.length): boolean {
    const betas = this.betas;
    for (let s = from; s < to; s++) {
      if (pollStop(poll)) return false;
      poll.since += this.n;
      this.sweep(betas[s], this.rng);
    }
    return true;
  }

  start(rng: Rng, threshold: number): void {
    this.rng = rng;
    const n = this.n;
    randomBits(rng, this.bits);
    for (let i = 0; i < n; i++) this.spin[i] = this.bits[i] === 0 ? 1 : -1;
    this.sum.fill(0);
    for (let t = 0; t < this.termJ.length; t++) {
      let p = 1;
      for (let k = this.termStart[t]; k < this.termStart[t + 1]; k++) p *= this.spin[this.termSpins[k]];
      this.product[t] = p;
      const w = this.termJ[t] * p;
      for (let k = this.termStart[t]; k < this.termStart[t + 1]; k++) this.sum[this.termSpins[k]] += w;
    }
    this.energy = energyFromTerms(this.model, this.spin);
    this.best = this.energy;
    this.hit = this.energy <= threshold;
    this.threshold = this.hit ? -Infinity : threshold;
  }

  delta(i: number): number {
    return 2 * this.sum[i];
  }

  flip(i: number): void {
    this.energy += 2 * this.sum[i];
    this.apply(i);
  }

  private apply(i: number): void {
    const { termStart, termSpins, termJ, memberStart, memberOf, product, sum } = this;
    this.spin[i] = -this.spin[i];
    for (let k = memberStart[i], end = memberStart[i + 1]; k < end; k++) {
      const t = memberOf[k];
      const w2 = 2 * termJ[t] * product[t];
      product[t] = -product[t];
      for (let q = termStart[t], e = termStart[t + 1]; q < e; q++) {
        const j = termSpins[q];
        if (j !== i) sum[j] -= w2;
      }
    }
    sum[i] = -sum[i];
  }

  sweep(beta: number, rng: Rng): void {
    const n = this.n;
    const sum = this.sum;
    const table = EXP_TABLE;
    let e = this.energy;
    let best = this.best;
    for (let i = 0; i < n; i++) {
      const d = 2 * sum[i];
      if (d > 0) {
        const x = beta * d;
        if (x > MAX_EXPONENT) continue;
        const u = rng.nextU32();
        const k = (x * EXP_STEPS) | 0;
        if (u >= table[k] || (u >= table[k + 1] && u >= Math.exp(-x) * 4294967296)) continue;
      }
      this.apply(i);
      e += d;
      if (e < best) {
        best = e;
        if (e <= this.threshold) e = this.confirm(e);
      }
    }
    this.energy = e;
    this.best = best;
  }

  private confirm(running: number): number {
    const exact = energyFromTerms(this.model, this.spin);
    if (exact <= this.threshold) {
      this.hit = true;
      this.threshold = -Infinity;
    }
    return Number.isFinite(exact) ? exact : running;
  }
}

/** Nearest-rank quantile of a list (sorted here in place). */
function quantile(values: number[], q: number): number {
  values.sort((a, b) => a - b);
  const rank = Math.max(1, Math.ceil(q * values.length));
  return values[rank - 1];
}

function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}

function checkCount(name: string, value: number): void {
  if (!Number.isSafeInteger(value) || value < 0) throw new RangeError(`${name} must be an integer ≥ 0, got ${value}`);
}
