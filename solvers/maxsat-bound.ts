/**
 * Exact MaxSAT ground truth for CNF: the minimum number of violated clauses over all 2^n assignments (the
 * optimum) and the exact number of assignments reaching it (the degeneracy), beyond the reach of enumeration.
 *
 * Method (numbered as in the code):
 * 1. A model count ({@link countModels}) first: when the formula is satisfiable the optimum is 0 and the
 *    degeneracy is the model count.
 * 2. Otherwise passes k = L, L+1, … (L a lower bound at the root) each count exactly the assignments that violate
 *    k clauses, by depth-first branch and bound over the variables: a node is pruned when its violated clauses
 *    plus a lower bound on those still to be violated exceed k. The lower bound is the number of disjoint
 *    inconsistent subsets found by unit propagation on the residual formula (Li, Manyà & Planes, "Exploiting unit
 *    propagation to compute lower bounds in branch and bound Max-SAT solvers", CP 2005): propagate the unit
 *    clauses until a clause is falsified, collect the clauses of that conflict's implication graph, set them
 *    aside, and repeat. A node that has already violated k clauses must satisfy all the others: its assignments
 *    are counted exactly by the model counter on the residual formula. The first pass with a non-zero count
 *    gives the optimum (earlier passes proved that fewer violations are impossible) and its degeneracy.
 * Pure: no clock, console or file; polls the stop flag every few hundred nodes and inside the counter.
 */
import { cleanClauses, indexClauses } from "./clause-index.js";
import type { Cnf } from "../harness/model/cnf.js";
import { countModels } from "./count-cnf.js";
import { stopRequested, type StopFlag } from "./types.js";

/** Result of {@link maxsatExact}. */
export interface MaxsatResult {
  /** Minimum number of violated clauses (+Infinity when stopped before it was proved). */
  readonly optimum: number;
  /** Number of assignments of all n variables violating exactly `optimum` clauses (0n when stopped). */
  readonly degeneracy: bigint;
  /** False when the stop flag cut the search short. */
  readonly complete: boolean;
  /** Branch-and-bound nodes over all passes (0 for a satisfiable formula). */
  readonly nodes: number;
  /** Model-counter calls (the first one on the whole formula included). */
  readonly counterCalls: number;
  /** Decisions made by the model counter over all its calls. */
  readonly counterNodes: number;
}

/** Nodes between two polls of the stop flag. */
const POLL_NODES = 256;

const UNASSIGNED = 2;

/**
 * Exact optimum (minimum violated clauses) and degeneracy of a CNF formula. Tautologies are never violated;
 * empty clauses always are; repeated literals are merged.
 * @param cnf - the formula.
 * @param stop - cooperative stop flag, or null.
 * @throws RangeError when a literal is 0 or out of range.
 */
export function maxsatExact(cnf: Cnf, stop: StopFlag): MaxsatResult {
  // 1. Satisfiable formulas: the model count is the degeneracy of optimum 0.
  const first = countModels(cnf, stop);
  if (!first.complete) return { optimum: Infinity, degeneracy: 0n, complete: false, nodes: 0, counterCalls: 1, counterNodes: first.nodes };
  if (first.count > 0n) return { optimum: 0, degeneracy: first.count, complete: true, nodes: 0, counterCalls: 1, counterNodes: first.nodes };
  const k = new MaxsatKernel(cnf, stop);
  k.counterCalls = 1;
  k.counterNodes = first.nodes;
  // 2. Passes with bound k from the root lower bound (at least 1: the formula is unsatisfiable).
  let bound = Math.max(1, k.lowerBound(Number.MAX_SAFE_INTEGER));
  for (; bound <= k.m; bound++) {
    k.bound = bound;
    const count = k.search();
    if (k.stopped) break;
    if (count > 0n) {
      return { optimum: bound + k.alwaysViolated, degeneracy: count, complete: true, nodes: k.nodes, counterCalls: k.counterCalls, counterNodes: k.counterNodes };
    }
  }
  return { optimum: Infinity, degeneracy: 0n, complete: false, nodes: k.nodes, counterCalls: k.counterCalls, counterNodes: k.counterNodes };
}

/** Branch-and-bound state in typed arrays; literal codes 2·var + sign (sign 1 = negated), as in count-cnf.ts. */
class MaxsatKernel {
  readonly n: number;
  readonly m: number;
  readonly lits: Int32Array;
  readonly start: Int32Array;
  readonly len: Int32Array;
  readonly occ: Int32Array;
  readonly occStart: Int32Array;
  readonly nTrue: Int32Array;
  readonly nFalse: Int32Array;
  readonly value: Uint8Array;
  /** Clauses with every literal false under the current (real) assignment. */
  cost = 0;
  /** Empty input clauses: violated by every assignment. */
  alwaysViolated = 0;
  bound = 0;
  nodes = 0;
  counterCalls = 0;
  counterNodes = 0;
  stopped = false;
  // Lower-bound scratch: simulated assignments, their reasons, clauses set aside, the unit queue.
  readonly simTrail: Int32Array;
  simLen = 0;
  readonly reason: Int32Array;
  readonly removed: Int32Array;
  readonly inSubset: Int32Array;
  readonly queue: Int32Array;
  readonly subset: Int32Array;
  lbCall = 0;
  subsetStamp = 0;
  /** Branching scratch: occurrences of each variable in active clauses (all zero between uses). */
  readonly score: Int32Array;

  constructor(cnf: Cnf, private readonly stop: StopFlag) {
    const n = cnf.variables;
    this.n = n;
    const clean = cleanClauses(cnf);
    this.alwaysViolated += clean.empty;
    const kept = clean.clauses;
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
    this.simTrail = new Int32Array(n);
    this.reason = new Int32Array(n).fill(-1);
    this.removed = new Int32Array(m);
    this.inSubset = new Int32Array(m);
    this.queue = new Int32Array(2 * m + 1);
    this.subset = new Int32Array(m);
    this.score = new Int32Array(n);
  }

  /** Makes literal l true, updating counters and the violated-clause count. */
  private set(l: number): void {
    this.value[l >> 1] = (l & 1) ^ 1;
    const { occ, occStart, nTrue, nFalse, len } = this;
    for (let i = occStart[l], e = occStart[l + 1]; i < e; i++) nTrue[occ[i]]++;
    const nl = l ^ 1;
    for (let i = occStart[nl], e = occStart[nl + 1]; i < e; i++) {
      const c = occ[i];
      if (++nFalse[c] === len[c]) this.cost++;
    }
  }

  /** Reverses {@link set}. */
  private unset(l: number): void {
    const { occ, occStart, nTrue, nFalse, len } = this;
    for (let i = occStart[l], e = occStart[l + 1]; i < e; i++) nTrue[occ[i]]--;
    const nl = l ^ 1;
    for (let i = occStart[nl], e = occStart[nl + 1]; i < e; i++) {
      const c = occ[i];
      if (nFalse[c]-- === len[c]) this.cost--;
    }
    this.value[l >> 1] = UNASSIGNED;
  }

  /** Number of assignments extending the current one that violate exactly `bound` clauses. */
  search(): bigint {
    if (++this.nodes % POLL_NODES === 0 && stopRequested(this.stop)) this.stopped = true;
    if (this.stopped || this.cost > this.bound) return 0n;
    if (this.cost === this.bound) return this.countResidual();
    if (this.cost + this.lowerBound(this.bound - this.cost) > this.bound) return 0n;
    // Branch on the unassigned variable in the most active (neither satisfied nor violated) clauses.
    const { nTrue, nFalse, len, lits, start, value } = this;
    const score = this.score;
    let best = -1;
    let bestScore = 0;
    for (let c = 0; c < this.m; c++) {
      if (nTrue[c] !== 0 || nFalse[c] === len[c]) continue;
      for (let j = start[c], je = start[c + 1]; j < je; j++) {
        const v = lits[j] >> 1;
        if (value[v] !== UNASSIGNED) continue;
        const s = ++score[v];
        if (s > bestScore) {
          bestScore = s;
          best = v;
        }
      }
    }
    score.fill(0);
    // No active clause left while fewer than `bound` are violated: no extension violates exactly `bound`.
    if (best < 0) return 0n;
    let total = 0n;
    for (let side = 0; side < 2; side++) {
      const l = 2 * best + side;
      this.set(l);
      total += this.search();
      this.unset(l);
      if (this.stopped) return 0n;
    }
    return total;
  }

  /** Models of the residual formula (active clauses over the unassigned variables), by the model counter. */
  private countResidual(): bigint {
    const { nTrue, nFalse, len, lits, start, value, n } = this;
    const index = new Int32Array(n);
    let vars = 0;
    for (let v = 0; v < n; v++) if (value[v] === UNASSIGNED) index[v] = ++vars;
    const literals: number[] = [];
    const offsets: number[] = [0];
    for (let c = 0; c < this.m; c++) {
      if (nTrue[c] !== 0 || nFalse[c] === len[c]) continue;
      for (let j = start[c], je = start[c + 1]; j < je; j++) {
        const x = lits[j];
        if (value[x >> 1] !== UNASSIGNED) continue;
        literals.push((x & 1) === 1 ? -index[x >> 1] : index[x >> 1]);
      }
      offsets.push(literals.length);
    }
    const r = countModels({ variables: vars, literals: Int32Array.from(literals), offsets: Int32Array.from(offsets) }, this.stop);
    this.counterCalls++;
    this.counterNodes += r.nodes;
    if (!r.complete) {
      this.stopped = true;
      return 0n;
    }
    return r.count;
  }

  /**
   * Disjoint inconsistent subsets of the active clauses found by unit propagation, counted up to budget + 1
   * (enough to decide a prune). The current assignment is left unchanged.
   */
  lowerBound(budget: number): number {
    const { nTrue, nFalse, len, lits, start, value, removed, reason, queue, simTrail, inSubset, subset, occ, occStart } = this;
    const call = ++this.lbCall;
    let lb = 0;
    while (lb <= budget) {
      // 1. Seed the queue with the unit clauses (one unassigned literal, not satisfied, not set aside).
      let qh = 0;
      let qt = 0;
      for (let c = 0; c < this.m; c++) {
        if (removed[c] === call || nTrue[c] !== 0) continue;
        if (nFalse[c] === len[c] - 1) queue[qt++] = c;
      }
      // 2. Propagate (simulated assignments with reasons) until a clause is falsified or no unit is left.
      let conflict = -1;
      while (qh < qt && conflict < 0) {
        const c = queue[qh++];
        if (nTrue[c] !== 0) continue;
        if (nFalse[c] === len[c]) {
          conflict = c;
          break;
        }
        let unit = -1;
        for (let j = start[c], je = start[c + 1]; j < je; j++) {
          if (value[lits[j] >> 1] === UNASSIGNED) {
            unit = lits[j];
            break;
          }
        }
        if (unit < 0) continue;
        const v = unit >> 1;
        value[v] = (unit & 1) ^ 1;
        reason[v] = c;
        simTrail[this.simLen++] = unit;
        for (let i = occStart[unit], e = occStart[unit + 1]; i < e; i++) nTrue[occ[i]]++;
        const nl = unit ^ 1;
        for (let i = occStart[nl], e = occStart[nl + 1]; i < e; i++) {
          const d = occ[i];
          const f = ++nFalse[d];
          if (removed[d] === call || nTrue[d] !== 0) continue;
          if (f === len[d]) {
            if (conflict < 0) conflict = d;
          } else if (f === len[d] - 1) {
            queue[qt++] = d;
          }
        }
      }
      // 3. On a conflict, set aside the clauses of its implication graph: one more inconsistent subset.
      if (conflict >= 0) {
        const mark = ++this.subsetStamp;
        let top = 0;
        subset[top++] = conflict;
        inSubset[conflict] = mark;
        for (let s = 0; s < top; s++) {
          const c = subset[s];
          removed[c] = call;
          for (let j = start[c], je = start[c + 1]; j < je; j++) {
            const r = reason[lits[j] >> 1];
            if (r >= 0 && inSubset[r] !== mark) {
              inSubset[r] = mark;
              subset[top++] = r;
            }
          }
        }
        lb++;
      }
      // 4. Undo the simulated assignments.
      while (this.simLen > 0) {
        const l = simTrail[--this.simLen];
        for (let i = occStart[l], e = occStart[l + 1]; i < e; i++) nTrue[occ[i]]--;
        const nl = l ^ 1;
        for (let i = occStart[nl], e = occStart[nl + 1]; i < e; i++) nFalse[occ[i]]--;
        value[l >> 1] = UNASSIGNED;
        reason[l >> 1] = -1;
      }
      if (conflict < 0) break;
    }
    return lb;
  }
}
