/**
 * CNF compiled for local search (shared by the walk and the CNF annealing engine): typed clause and
 * occurrence lists, built once per instance.
 */
import type { Cnf } from "../harness/model/cnf.js";

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
