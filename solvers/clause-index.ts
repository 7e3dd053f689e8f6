/**
 * Flat clause storage shared by the exact CNF searches (model counter, MaxSAT bound): the literal codes of every
 * clause in one Int32Array with start offsets, and for every literal code the clauses it occurs in (compressed
 * rows), so propagation walks typed arrays only.
 */

import type { Cnf } from "../harness/model/cnf.js";

/** A formula's clauses as literal codes (2(v−1) for v, 2(v−1)+1 for ¬v), cleaned. */
export interface CleanClauses {
  /** Non-empty clauses without repeated literals, tautologies dropped, in input order. */
  readonly clauses: number[][];
  /** Number of empty clauses (violated by every assignment). */
  readonly empty: number;
}

/**
 * Merges repeated literals, drops tautologies and counts empty clauses (set-up only).
 * @throws RangeError naming the clause when a literal is out of range.
 */
export function cleanClauses(cnf: Cnf): CleanClauses {
  const n = cnf.variables;
  const clauses: number[][] = [];
  let empty = 0;
  const seen = new Int32Array(2 * n + 2).fill(-1);
  for (let c = 0; c + 1 < cnf.offsets.length; c++) {
    const out: number[] = [];
    let tautology = false;
    for (let i = cnf.offsets[c]; i < cnf.offsets[c + 1]; i++) {
      const d = cnf.literals[i];
      const v = Math.abs(d);
      if (!Number.isInteger(d) || d === 0 || v > n) throw new RangeError(`clause ${c + 1}: literal ${d} is out of range for ${n} variables`);
      const code = 2 * (v - 1) + (d < 0 ? 1 : 0);
      if (seen[code ^ 1] === c) tautology = true;
      if (seen[code] === c) continue;
      seen[code] = c;
      out.push(code);
    }
    if (tautology) continue;
    if (out.length === 0) empty++;
    else clauses.push(out);
  }
  return { clauses, empty };
}

/** Clauses as compressed rows plus literal-occurrence lists. */
export interface ClauseIndex {
  /** Literal codes of all clauses, clause after clause. */
  readonly lits: Int32Array;
  /** Clause c occupies lits[start[c] .. start[c+1]); length m + 1. */
  readonly start: Int32Array;
  /** Length of each clause. */
  readonly len: Int32Array;
  /** Occurrences of literal code l are occ[occStart[l] .. occStart[l+1]); length 2n + 1. */
  readonly occStart: Int32Array;
  /** Clause numbers, grouped by literal code. */
  readonly occ: Int32Array;
}

/**
 * Builds the index of clauses given as lists of literal codes in [0, 2n) (set-up only, not a hot path).
 * @param clauses - the clauses, each a list of distinct literal codes.
 * @param n - number of variables (codes range over 2n values).
 */
export function indexClauses(clauses: ReadonlyArray<ReadonlyArray<number>>, n: number): ClauseIndex {
  const m = clauses.length;
  let total = 0;
  for (const c of clauses) total += c.length;
  const lits = new Int32Array(total);
  const start = new Int32Array(m + 1);
  const len = new Int32Array(m);
  const occCount = new Int32Array(2 * n + 1);
  let at = 0;
  for (let i = 0; i < m; i++) {
    const c = clauses[i];
    start[i] = at;
    len[i] = c.length;
    for (const code of c) {
      lits[at++] = code;
      occCount[code]++;
    }
  }
  start[m] = at;
  const occStart = new Int32Array(2 * n + 1);
  for (let l = 0; l < 2 * n; l++) occStart[l + 1] = occStart[l] + occCount[l];
  const occ = new Int32Array(total);
  const fill = occStart.slice();
  for (let c = 0; c < m; c++) for (let i = start[c]; i < start[c + 1]; i++) occ[fill[lits[i]]++] = c;
  return { lits, start, len, occStart, occ };
}
