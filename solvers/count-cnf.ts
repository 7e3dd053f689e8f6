/**
 * Exact model counting for CNF: the number of assignments of all n variables that satisfy every clause.
 *
 * Method (after Bayardo & Pehoushek, "Counting models using connected components", AAAI 2000; Sang, Bacchus,
 * Beame, Kautz & Pitassi, "Combining component caching and clause learning for effective model counting",
 * SAT 2004; Thurley, "sharpSAT – counting models with advanced component caching and implicit BCP", SAT 2006):
 * 1. DPLL with unit propagation over clause counters (true and false literals per clause, flat typed arrays;
 *    one trail of assigned literals, undone to a mark on backtrack; no allocation per node).
 * 2. After each decision and its propagation, the unassigned variables of the current component are split into
 *    connected components of the residual formula (variables linked by an unsatisfied clause); the count is the
 *    product of the components' counts times 2 for each variable left in no unsatisfied clause.
 * 3. Component cache: a component is identified by its set of unassigned variables and its set of unsatisfied
 *    clauses (an unsatisfied clause restricted to unassigned variables is fixed by these two sets), so equal
 *    keys mean equal residual formulas and equal counts. Keys are stored in full and compared exactly; their
 *    hash is order-independent (a sum of mixed ids), so no sorting is needed. Memory is bounded: when the key
 *    pool or the table is full, the cache is emptied and refilled.
 * 4. Branching: the variable of the component occurring in the most unsatisfied clauses, residual binary
 *    clauses weighted 3 (dynamic largest degree within the component, the occurrence part of VSADS in Sang,
 *    Beame & Kautz, "Heuristics for fast exact model counting", SAT 2005), true first.
 * 5. Counts: doubles while every intermediate count stays below 2^53 (exact); if one does not, the count is
 *    redone in BigInt arithmetic.
 */
import { cleanClauses, indexClauses } from "./clause-index.js";
import type { Cnf } from "../harness/model/cnf.js";
import { stopRequested, type StopFlag } from "./types.js";

/** Result of {@link countModels}. */
export interface CountResult {
  /** Number of satisfying assignments of all n variables (0 when unsatisfiable; a partial figure when stopped). */
  readonly count: bigint;
  /** False when the stop flag cut the count short (count is then meaningless). */
  readonly complete: boolean;
  /** Decisions (branching nodes) made, over all passes. */
  readonly nodes: number;
  /** Component counts answered by the cache. */
  readonly cacheHits: number;
  /** Components (with at least one clause) met, cache hits included. */
  readonly components: number;
  /** True when the count needed BigInt arithmetic (some intermediate count ≥ 2^53). */
  readonly big: boolean;
}

/** Tuning of {@link countModels}; every field optional. */
export interface CountOptions {
  /**
   * Bound on the cache's key pool in 32-bit words (default 2^23 = 32 MiB; the table and values add about
   * 20 bytes a component). When full the cache is emptied.
   */
  readonly cacheWords?: number;
  /**
   * A second stop condition, polled with the stop flag: for a caller whose limit no other thread can raise in the
   * flag while this thread counts (the run loop generating --satisfiable / --unique formulas reads its clock;
   * harness/families/draw-stop.ts). Pure itself as far as the counter is concerned: it only asks.
   */
  readonly stopCheck?: () => boolean;
}

/** Default cache key pool, 32-bit words (32 MiB: common practice for a per-worker cache on a shared machine). */
export const COUNT_CACHE_WORDS = 1 << 23;

/**
 * Branching score weight of a residual binary clause (a ternary or longer one counts 1). Measured as decisions
 * over all 1000 SATLIB uf50-218 files / on planted 3-SAT α = 4.2 n = 100 (bench-count-like instance): weight 1
 * 90506 / 11583, 2: 62724 / 9058, 3: 57132 / 8688, 5: 55426 / 8859 (but more decisions at n = 70–90); 3 chosen.
 */
const BINARY_WEIGHT = 3;


/** Largest first size of one recursion stack, in words (4 MiB): the full depth bound is used up to it. */
const STACK_WORDS = 1 << 20;

/** Largest count held exactly in a double. */
const EXACT_LIMIT = 2 ** 53;

/** Variable value codes. */
const FALSE = 0;
const TRUE = 1;
const UNASSIGNED = 2;

/** Why a pass ended early. */
const RUNNING = 0;
const STOPPED = 1;
const OVERFLOW = 2;

/**
 * Exact number of models of a CNF formula (assignments of all n variables satisfying every clause).
 * Clauses may repeat literals, be tautologies (ignored) or be empty (count 0). Polls `stop` (and
 * `options.stopCheck`) at every decision; when stopped returns complete: false.
 * @param cnf - the formula (DIMACS literals, variables 1..n).
 * @param stop - cooperative stop flag, or null.
 * @throws RangeError when a literal is 0 or out of range.
 */
export function countModels(cnf: Cnf, stop: StopFlag, options: CountOptions = {}): CountResult {
  const kernel = new CountKernel(cnf, options.cacheWords ?? COUNT_CACHE_WORDS, stop, options.stopCheck ?? null);
  return kernel.run();
}

/** Mixes a 32-bit integer (the finaliser of MurmurHash3, a well-known bit mixer; common practice). */
function mix32(x: number): number {
  x ^= x >>> 16;
  x = Math.imul(x, 0x85ebca6b);
  x ^= x >>> 13;
  x = Math.imul(x, 0xc2b2ae35);
  x ^= x >>> 16;
  return x;
}

/** The least power of two ≥ x, clamped to [lo, hi] (both powers of two). */
function powerOfTwoIn(x: number, lo: number, hi: number): number {
  let p = lo;
  while (p < x && p < hi) p *= 2;
  return p;
}

/**
 * Component cache: open addressing over entry indices; keys (variables, then clauses) in one pool. Values are
 * doubles in the fast pass and BigInts in the BigInt pass.
 */
class ComponentCache {
  private slots: Int32Array;
  private mask: number;
  hash: Int32Array;
  keyAt: Int32Array;
  keyVars: Int32Array;
  keyClauses: Int32Array;
  value: Float64Array;
  bigValue: bigint[] = [];
  entries = 0;
  pool: Int32Array;
  poolUsed = 0;
  private readonly maxEntries: number;

  /**
   * @param poolWords - bound on the key pool (words).
   * @param size - n·m of the formula: the first sizes of the table and the pool scale with it, so that most counts
   *   never grow them (a grown array is a new field value, which discards the optimised code of every function
   *   that read the field: measured 30% of a cold count's CPU at n = 100). Measured at planted 3-SAT α = 4.2
   *   n = 100 (n·m = 42 000), instances 0–6: 850–22 773 entries, 0.13–0.80 M pool words; SATLIB uf50-218
   *   (n·m = 10 900): at most 392 entries and 20 302 words.
   */
  constructor(private readonly poolWords: number, size: number) {
    const initial = powerOfTwoIn(size / 4, 1 << 12, 1 << 16);
    this.slots = new Int32Array(initial * 2);
    this.mask = initial * 2 - 1;
    this.hash = new Int32Array(initial);
    this.keyAt = new Int32Array(initial);
    this.keyVars = new Int32Array(initial);
    this.keyClauses = new Int32Array(initial);
    this.value = new Float64Array(initial);
    this.pool = new Int32Array(Math.min(poolWords, powerOfTwoIn(8 * size, 1 << 16, 1 << 20)));
    // Entries use ≥ 3 pool words each (a component has ≥ 2 variables and ≥ 1 clause).
    this.maxEntries = Math.max(16, Math.floor(poolWords / 3));
  }

  clear(): void {
    this.slots.fill(0);
    this.entries = 0;
    this.poolUsed = 0;
    this.bigValue = [];
  }

  /** Slot index of the key (entry stored there or the empty slot where it would go). */
  find(h: number, nv: number, nc: number, vmark: Int32Array, cmark: Int32Array, stamp: number): number {
    const slots = this.slots;
    let i = h & this.mask;
    for (;;) {
      const e = slots[i];
      if (e === 0) return i;
      const id = e - 1;
      if (this.hash[id] === h && this.keyVars[id] === nv && this.keyClauses[id] === nc) {
        const pool = this.pool;
        let at = this.keyAt[id];
        let same = true;
        for (const end = at + nv; at < end; at++) {
          if (vmark[pool[at]] !== stamp) {
            same = false;
            break;
          }
        }
        if (same) {
          for (const end = at + nc; at < end; at++) {
            if (cmark[pool[at]] !== stamp) {
              same = false;
              break;
            }
          }
        }
        if (same) return i;
      }
      i = (i + 1) & this.mask;
    }
  }

  /** Entry index stored at a slot, or −1 for an empty slot. */
  entryAt(slot: number): number {
    return this.slots[slot] - 1;
  }

  /**
   * Stores a key (variables vars[vs..ve), clauses cls[cs..ce)) and returns its entry index, or −1 when the
   * cache was full and has been emptied instead (the value is then simply not cached).
   */
  insert(h: number, vars: Int32Array, vs: number, ve: number, cls: Int32Array, cs: number, ce: number): number {
    const words = ve - vs + ce - cs;
    if (this.poolUsed + words > this.poolWords || this.entries >= this.maxEntries) {
      this.clear();
      return -1;
    }
    if (this.poolUsed + words > this.pool.length) {
      let size = this.pool.length * 2;
      while (size < this.poolUsed + words) size *= 2;
      const grown = new Int32Array(Math.min(size, this.poolWords));
      grown.set(this.pool.subarray(0, this.poolUsed));
      this.pool = grown;
    }
    if (this.entries >= this.hash.length) this.grow();
    const id = this.entries++;
    const at = this.poolUsed;
    // Element loops, not subarray views: a view is an allocation per stored component (measured GC share ~15%).
    const pool = this.pool;
    let w = at;
    for (let i = vs; i < ve; i++) pool[w++] = vars[i];
    for (let i = cs; i < ce; i++) pool[w++] = cls[i];
    this.poolUsed += words;
    this.hash[id] = h;
    this.keyAt[id] = at;
    this.keyVars[id] = ve - vs;
    this.keyClauses[id] = ce - cs;
    // Load factor ≤ 1/2: the table has twice as many slots as entry capacity. The probe starts one slot early so
    // that its step runs on every insert (a step first met after optimisation would discard the optimised code).
    const mask = this.mask;
    let i = (h - 1) & mask;
    do i = (i + 1) & mask;
    while (this.slots[i] !== 0);
    this.slots[i] = id + 1;
    return id;
  }

  private grow(): void {
    const cap = this.hash.length * 2;
    const widen = (a: Int32Array): Int32Array => {
      const b = new Int32Array(cap);
      b.set(a);
      return b;
    };
    this.hash = widen(this.hash);
    this.keyAt = widen(this.keyAt);
    this.keyVars = widen(this.keyVars);
    this.keyClauses = widen(this.keyClauses);
    const v = new Float64Array(cap);
    v.set(this.value);
    this.value = v;
    this.slots = new Int32Array(cap * 2);
    this.mask = cap * 2 - 1;
    for (let id = 0; id < this.entries; id++) {
      let i = this.hash[id] & this.mask;
      while (this.slots[i] !== 0) i = (i + 1) & this.mask;
      this.slots[i] = id + 1;
    }
  }
}

/** All state of one count, in typed arrays (one shape, so property access stays monomorphic). */
class CountKernel {
  readonly n: number;
  readonly m: number;
  /** Clause c's literal codes (2·var + sign, sign 1 = negated) are lits[start[c] .. start[c+1]). */
  readonly lits: Int32Array;
  readonly start: Int32Array;
  readonly len: Int32Array;
  /** Clauses containing literal code l: occ[occStart[l] .. occStart[l+1]). */
  readonly occ: Int32Array;
  readonly occStart: Int32Array;
  /** Processed true and false literals per clause. */
  readonly nTrue: Int32Array;
  readonly nFalse: Int32Array;
  readonly value: Uint8Array;
  readonly trail: Int32Array;
  trailLen = 0;
  qhead = 0;
  /** Component stacks: variables, clauses, and descriptors (varStart, varEnd, clauseStart, clauseEnd, branch var, stamp, hash). */
  vstack: Int32Array;
  cstack: Int32Array;
  dstack: Int32Array;
  varTop = 0;
  clTop = 0;
  dTop = 0;
  /** Mixed ids of variables and clauses, summed into a component's order-independent cache hash. */
  readonly varHash: Int32Array;
  readonly clauseHash: Int32Array;
  /** Component stamps (monotone): vmark[v] / cmark[c] = stamp of the component that last took them. */
  readonly vmark: Int32Array;
  readonly cmark: Int32Array;
  stamp = 0;
  readonly cache: ComponentCache;
  /** Units of the input and whether the input has an empty clause. */
  readonly units: number[] = [];
  emptyClause = false;
  nodes = 0;
  cacheHits = 0;
  components = 0;
  state = RUNNING;
  big = false;

  constructor(cnf: Cnf, cacheWords: number, private readonly stop: StopFlag, private readonly stopCheck: (() => boolean) | null) {
    const n = cnf.variables;
    this.n = n;
    // 1. Clean the clauses: merge repeated literals, drop tautologies, keep units aside.
    const clean = cleanClauses(cnf);
    if (clean.empty > 0) this.emptyClause = true;
    const kept: number[][] = [];
    for (const c of clean.clauses) {
      if (c.length === 1) this.units.push(c[0]);
      else kept.push(c);
    }
    const m = kept.length;
    this.m = m;
    const index = indexClauses(kept, n);
    this.lits = index.lits;
    this.start = index.start;
    this.len = index.len;
    this.occStart = index.occStart;
    this.occ = index.occ;
    this.nTrue = new Int32Array(m);
    this.nFalse = new Int32Array(m);
    this.value = new Uint8Array(n).fill(UNASSIGNED);
    this.trail = new Int32Array(n);
    // Each level of the recursion writes at most the variables of the component it splits (one fewer each level
    // down) and at most all m clauses, at depth ≤ n: the stacks are sized for that from the start, so the
    // growth paths never run (a grown stack is a new field value, which discards optimised code mid-count);
    // beyond STACK_WORDS (huge or dense formulas) they start at the old size and grow when needed.
    const deepest = (n * (n + 1)) / 2 + n;
    this.vstack = new Int32Array(Math.max(16, n * 4, Math.min(deepest, STACK_WORDS)));
    this.cstack = new Int32Array(Math.max(16, m * 4, Math.min((n + 2) * m, STACK_WORDS)));
    this.dstack = new Int32Array(7 * Math.max(16, n * 2, Math.min(deepest, STACK_WORDS)));
    this.vmark = new Int32Array(n);
    this.cmark = new Int32Array(m);
    // Mixed once here, looked up in split (was one mix per variable and clause of every component built).
    this.varHash = new Int32Array(n);
    for (let v = 0; v < n; v++) this.varHash[v] = mix32(v + 1);
    this.clauseHash = new Int32Array(m);
    for (let c = 0; c < m; c++) this.clauseHash[c] = mix32(c ^ 0x5bd1e995);
    this.cache = new ComponentCache(Math.max(64, cacheWords), n * m);
  }

  run(): CountResult {
    if (this.emptyClause) return this.result(0n, true);
    // 2. Input units, then a fast pass in doubles; redo in BigInt if a count reached 2^53.
    for (const u of this.units) {
      const val = this.value[u >> 1];
      if (val === UNASSIGNED) this.assign(u);
      else if (val === (u & 1)) return this.result(0n, true);
    }
    if (!this.propagate()) return this.result(0n, true);
    const fixed = this.trailLen;
    let count = this.countRoot();
    if (this.state === OVERFLOW) {
      this.undo(fixed);
      this.cache.clear();
      this.state = RUNNING;
      this.big = true;
      this.varTop = this.clTop = this.dTop = 0;
      return this.result(this.countRootBig(), this.state === RUNNING);
    }
    return this.result(BigInt(count), this.state === RUNNING);
  }

  private result(count: bigint, complete: boolean): CountResult {
    return { count: complete ? count : 0n, complete, nodes: this.nodes, cacheHits: this.cacheHits, components: this.components, big: this.big };
  }

  /** Makes literal code l true (it must be unassigned) and queues it for propagation. */
  assign(l: number): void {
    this.value[l >> 1] = (l & 1) ^ 1;
    this.trail[this.trailLen++] = l;
  }

  /**
   * Unit propagation of the queued literals. Returns false on a conflict (an unsatisfied clause with every literal
   * false); the literal being processed is then fully processed, so {@link undo} can reverse exactly.
   */
  propagate(): boolean {
    const { occ, occStart, nTrue, nFalse, len, lits, start, value, trail } = this;
    let conflict = false;
    while (this.qhead < this.trailLen) {
      const l = trail[this.qhead++];
      for (let i = occStart[l], e = occStart[l + 1]; i < e; i++) nTrue[occ[i]]++;
      const nl = l ^ 1;
      for (let i = occStart[nl], e = occStart[nl + 1]; i < e; i++) {
        const c = occ[i];
        const f = ++nFalse[c];
        if (conflict || nTrue[c] !== 0) continue;
        const size = len[c];
        if (f === size) {
          conflict = true;
        } else if (f === size - 1) {
          // The one literal not yet counted false: unassigned (imply it), true but queued (nothing), or false
          // but queued (a conflict that its processing would find; found here).
          let unit = -1;
          let satisfied = false;
          for (let j = start[c], je = start[c + 1]; j < je; j++) {
            const x = lits[j];
            const val = value[x >> 1];
            if (val === UNASSIGNED) {
              unit = x;
              break;
            }
            if (val !== (x & 1)) {
              satisfied = true;
              break;
            }
          }
          if (unit >= 0) {
            value[unit >> 1] = (unit & 1) ^ 1;
            trail[this.trailLen++] = unit;
          } else if (!satisfied) {
            conflict = true;
          }
        }
      }
      if (conflict) return false;
    }
    return true;
  }

  /** Unassigns the trail back to length `mark`, reversing the counters of processed literals. */
  undo(mark: number): void {
    const { occ, occStart, nTrue, nFalse, value, trail } = this;
    while (this.trailLen > mark) {
      const l = trail[--this.trailLen];
      if (this.trailLen < this.qhead) {
        for (let i = occStart[l], e = occStart[l + 1]; i < e; i++) nTrue[occ[i]]--;
        const nl = l ^ 1;
        for (let i = occStart[nl], e = occStart[nl + 1]; i < e; i++) nFalse[occ[i]]--;
      }
      value[l >> 1] = UNASSIGNED;
    }
    if (this.qhead > mark) this.qhead = mark;
  }

  /**
   * Splits the unassigned variables among vstack[vs..ve) into connected components of the unsatisfied clauses,
   * pushing one descriptor per component with a clause; returns how many variables are in no unsatisfied clause.
   */
  split(vs: number, ve: number): number {
    const { occ, occStart, nTrue, nFalse, len, lits, start, value, vmark, cmark, varHash, clauseHash } = this;
    this.ensureRoom(ve - vs);
    const vstack = this.vstack;
    const cstack = this.cstack;
    const dstack = this.dstack;
    const base = this.stamp + 1;
    let free = 0;
    for (let i = vs; i < ve; i++) {
      const v = vstack[i];
      if (value[v] !== UNASSIGNED || vmark[v] >= base) continue;
      const stamp = ++this.stamp;
      const cvs = this.varTop;
      const ccs = this.clTop;
      let top = cvs;
      let ctop = ccs;
      vmark[v] = stamp;
      vstack[top++] = v;
      let h = 0;
      let best = v;
      let bestScore = -1;
      for (let head = cvs; head < top; head++) {
        const u = vstack[head];
        h = (h + varHash[u]) | 0;
        let score = 0;
        for (let l = 2 * u; l <= 2 * u + 1; l++) {
          for (let j = occStart[l], je = occStart[l + 1]; j < je; j++) {
            const c = occ[j];
            if (nTrue[c] !== 0) continue;
            score += len[c] - nFalse[c] === 2 ? BINARY_WEIGHT : 1;
            if (cmark[c] === stamp) continue;
            cmark[c] = stamp;
            cstack[ctop++] = c;
            h = (h + clauseHash[c]) | 0;
            for (let k = start[c], ke = start[c + 1]; k < ke; k++) {
              const w = lits[k] >> 1;
              if (value[w] === UNASSIGNED && vmark[w] !== stamp) {
                vmark[w] = stamp;
                vstack[top++] = w;
              }
            }
          }
        }
        if (score > bestScore) {
          bestScore = score;
          best = u;
        }
      }
      // Branch-free count of variables in no unsatisfied clause: the first such variable often comes late, and an
      // increment never seen before the function was optimised would discard the optimised code.
      const isFree = ctop === ccs;
      free += isFree ? 1 : 0;
      if (isFree) continue;
      this.varTop = top;
      this.clTop = ctop;
      if (this.dTop + 7 > dstack.length) this.growDescriptors();
      const d = this.dTop;
      const ds = this.dstack;
      ds[d] = cvs;
      ds[d + 1] = top;
      ds[d + 2] = ccs;
      ds[d + 3] = ctop;
      ds[d + 4] = best;
      ds[d + 5] = stamp;
      ds[d + 6] = h;
      this.dTop = d + 7;
    }
    return free;
  }

  /** Makes sure the stacks can take one more split of up to `vars` variables (and all clauses). */
  private ensureRoom(vars: number): void {
    if (this.varTop + vars > this.vstack.length) {
      const b = new Int32Array(Math.max(this.vstack.length * 2, this.varTop + vars));
      b.set(this.vstack);
      this.vstack = b;
    }
    if (this.clTop + this.m > this.cstack.length) {
      const b = new Int32Array(Math.max(this.cstack.length * 2, this.clTop + this.m));
      b.set(this.cstack);
      this.cstack = b;
    }
  }

  private growDescriptors(): void {
    const b = new Int32Array(this.dstack.length * 2);
    b.set(this.dstack);
    this.dstack = b;
  }

  private poll(): boolean {
    // Every decision: a poll first taken at decision 1024 found no type feedback (none is gathered in a function's
    // first calls) and discarded the optimised code of the whole recursion; one atomic load a decision is cheap.
    this.nodes++;
    if (stopRequested(this.stop) || (this.stopCheck !== null && this.stopCheck())) this.state = STOPPED;
    return this.state !== RUNNING;
  }

  /** Count over all variables in doubles (state OVERFLOW when a count reached 2^53). */
  private countRoot(): number {
    const vs = this.varTop;
    for (let v = 0; v < this.n; v++) this.vstack[this.varTop++] = v;
    const d0 = this.dTop;
    const free = this.split(vs, this.varTop);
    let prod = 2 ** free;
    if (prod >= EXACT_LIMIT) {
      this.state = OVERFLOW;
      return 0;
    }
    for (let d = d0; d < this.dTop && prod !== 0; d += 7) {
      prod *= this.countComponent(d);
      if (this.state !== RUNNING) return 0;
      if (prod >= EXACT_LIMIT) {
        this.state = OVERFLOW;
        return 0;
      }
    }
    return prod;
  }

  /** Count of the component described at dstack[d] in doubles. */
  private countComponent(d: number): number {
    const ds = this.dstack;
    const vs = ds[d], ve = ds[d + 1], cs = ds[d + 2], ce = ds[d + 3], bv = ds[d + 4], stamp = ds[d + 5], h = ds[d + 6];
    this.components++;
    const cache = this.cache;
    const slot = cache.find(h, ve - vs, ce - cs, this.vmark, this.cmark, stamp);
    const hit = cache.entryAt(slot);
    if (hit >= 0) {
      this.cacheHits++;
      return cache.value[hit];
    }
    if (this.poll()) return 0;
    const saveV = this.varTop, saveC = this.clTop, saveD = this.dTop;
    let total = 0;
    for (let side = 0; side < 2; side++) {
      const mark = this.trailLen;
      this.assign(2 * bv + side);
      if (this.propagate()) {
        const free = this.split(vs, ve);
        let prod = 2 ** free;
        for (let c = saveD; c < this.dTop && prod !== 0; c += 7) {
          prod *= this.countComponent(c);
          if (this.state !== RUNNING) break;
        }
        total += prod;
      }
      this.undo(mark);
      this.varTop = saveV;
      this.clTop = saveC;
      this.dTop = saveD;
      if (this.state !== RUNNING) return 0;
    }
    if (total >= EXACT_LIMIT) {
      this.state = OVERFLOW;
      return 0;
    }
    const id = cache.insert(h, this.vstack, vs, ve, this.cstack, cs, ce);
    if (id >= 0) cache.value[id] = total;
    return total;
  }

  /** Count over all variables in BigInt arithmetic. */
  private countRootBig(): bigint {
    const vs = this.varTop;
    for (let v = 0; v < this.n; v++) this.vstack[this.varTop++] = v;
    const d0 = this.dTop;
    const free = this.split(vs, this.varTop);
    let prod = 1n << BigInt(free);
    for (let d = d0; d < this.dTop && prod !== 0n; d += 7) {
      prod *= this.countComponentBig(d);
      if (this.state !== RUNNING) return 0n;
    }
    return prod;
  }

  /** Count of the component described at dstack[d] in BigInt arithmetic (same steps as {@link countComponent}). */
  private countComponentBig(d: number): bigint {
    const ds = this.dstack;
    const vs = ds[d], ve = ds[d + 1], cs = ds[d + 2], ce = ds[d + 3], bv = ds[d + 4], stamp = ds[d + 5], h = ds[d + 6];
    this.components++;
    const cache = this.cache;
    const slot = cache.find(h, ve - vs, ce - cs, this.vmark, this.cmark, stamp);
    const hit = cache.entryAt(slot);
    if (hit >= 0) {
      this.cacheHits++;
      return cache.bigValue[hit];
    }
    if (this.poll()) return 0n;
    const saveV = this.varTop, saveC = this.clTop, saveD = this.dTop;
    let total = 0n;
    for (let side = 0; side < 2; side++) {
      const mark = this.trailLen;
      this.assign(2 * bv + side);
      if (this.propagate()) {
        const free = this.split(vs, ve);
        let prod = 1n << BigInt(free);
        for (let c = saveD; c < this.dTop && prod !== 0n; c += 7) {
          prod *= this.countComponentBig(c);
          if (this.state !== RUNNING) break;
        }
        total += prod;
      }
      this.undo(mark);
      this.varTop = saveV;
      this.clTop = saveC;
      this.dTop = saveD;
      if (this.state !== RUNNING) return 0n;
    }
    const id = cache.insert(h, this.vstack, vs, ve, this.cstack, cs, ce);
    if (id >= 0) cache.bigValue[id] = total;
    return total;
  }
}
