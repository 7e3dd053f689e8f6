/**
 * The CNF engine of the annealer (cost = violated clauses): true-literal counts and per-variable integer ΔE, so an
 * attempt is O(1), with acceptance thresholds precomputed per sweep and ΔE (see anneal.ts for the method).
 */
import type { Rng } from "../harness/random.js";
import type { CompiledCnf } from "./compile-cnf.js";
import { type Engine, type Poll, MAX_EXPONENT, PLACEHOLDER_RNG, pollStop } from "./anneal-setup.js";
import { randomAssignment } from "./trial-seeds.js";

/** Entries of a precomputed acceptance table above which {@link CnfEngine} fills one row per sweep instead. */
export const CNF_TABLE_MAX = 1 << 20;

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
export class CnfEngine implements Engine {
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
    randomAssignment(rng, value);
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
