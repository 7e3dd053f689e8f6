/**
 * An upper bound on the minimum number of violated clauses of a CNF slice, from a short WalkSAT-style local
 * search: the cost of an actual assignment. The exact CNF enumeration (exhaustive-cnf.ts) uses it as the
 * threshold of its last pass, so it never changes a result, only the time.
 */
import { Rng } from "../harness/random.js";

/**
 * Fixed seed of the local search (32 hex digits). The search only supplies a bound for the exact passes, so
 * its randomness never changes a result, only the time; a fixed seed keeps the time reproducible too.
 */
const LOCAL_SEARCH_SEED = "c0ffee00c0ffee00c0ffee00c0ffee00";

/**
 * Local search effort: 10 flips per clause, capped at 2^22 occurrence visits (a few milliseconds) so formulas
 * with very many clauses per variable do not spend longer here than in the exact pass. Measured on random 3-SAT
 * n = 26–30 at densities 6, 8 and 15: 10 flips per clause found the exact minimum in 23 of 24 instances (one off
 * by 1) and made whole runs 10–30% faster than 30 or 100 flips per clause, whose extra accuracy bought nothing.
 */
const LOCAL_SEARCH_FLIPS_PER_CLAUSE = 10;
const LOCAL_SEARCH_MAX_VISITS = 2 ** 22;

/**
 * Upper bound on the slice's minimum: the best cost seen by WalkSAT with noise 1/2 (Selman, Kautz, Cohen,
 * "Noise strategies for improving local search", AAAI 1994) over the free variables, stopping early at
 * `target` (a known lower bound). Returns empties + fewest violated kept clauses seen.
 * @param start - clause c occupies lits[start[c] .. start[c+1]).
 * @param lits - DIMACS-style literals over the free variables 1..F (±v).
 * @param empties - clauses already violated whatever the free variables (added to the result).
 * @param target - stop once the bound reaches it.
 */
export function walksatBound(start: Int32Array, lits: Int32Array, empties: number, target: number): number {
  const m = start.length - 1;
  let free = 0;
  for (let i = 0; i < lits.length; i++) free = Math.max(free, lits[i] > 0 ? lits[i] : -lits[i]);
  // Occurrence lists per literal: index 2(v−1) positive, 2(v−1)+1 negative.
  const occStart = new Int32Array(2 * free + 1);
  for (let i = 0; i < lits.length; i++) {
    const lit = lits[i];
    occStart[2 * ((lit > 0 ? lit : -lit) - 1) + (lit > 0 ? 0 : 1) + 1]++;
  }
  for (let i = 0; i < 2 * free; i++) occStart[i + 1] += occStart[i];
  const occ = new Int32Array(lits.length);
  const fill = occStart.slice(0, 2 * free);
  for (let c = 0; c < m; c++) {
    for (let i = start[c]; i < start[c + 1]; i++) {
      const lit = lits[i];
      occ[fill[2 * ((lit > 0 ? lit : -lit) - 1) + (lit > 0 ? 0 : 1)]++] = c;
    }
  }
  const rng = new Rng(LOCAL_SEARCH_SEED);
  const value = new Uint8Array(free + 1);
  for (let v = 1; v <= free; v++) value[v] = rng.bit();
  const trueCount = new Int32Array(m);
  const unsat = new Int32Array(m);
  const unsatPos = new Int32Array(m);
  let unsatCount = 0;
  for (let c = 0; c < m; c++) {
    for (let i = start[c]; i < start[c + 1]; i++) {
      const lit = lits[i];
      if ((lit > 0) === (value[lit > 0 ? lit : -lit] === 1)) trueCount[c]++;
    }
    if (trueCount[c] === 0) {
      unsatPos[c] = unsatCount;
      unsat[unsatCount++] = c;
    }
  }
  let best = unsatCount;
  const goal = Math.max(0, target - empties); // no fewer than zero kept clauses can be violated
  const flips = LOCAL_SEARCH_FLIPS_PER_CLAUSE * m;
  let visits = 0;
  for (let f = 0; f < flips && best > goal && visits < LOCAL_SEARCH_MAX_VISITS; f++) {
    const c = unsat[rng.below(unsatCount)];
    // Choose: a literal whose flip breaks nothing, else a random one with probability 1/2, else the least breaking.
    let pick = 0;
    let pickBreak = Infinity;
    for (let i = start[c]; i < start[c + 1]; i++) {
      const v = lits[i] > 0 ? lits[i] : -lits[i];
      // Clauses made false by flipping v: those where v's current literal is their only true one.
      const cur = 2 * (v - 1) + (value[v] === 1 ? 0 : 1);
      let breaks = 0;
      for (let j = occStart[cur]; j < occStart[cur + 1]; j++) if (trueCount[occ[j]] === 1) breaks++;
      visits += occStart[cur + 1] - occStart[cur];
      if (breaks < pickBreak) {
        pickBreak = breaks;
        pick = v;
      }
    }
    if (pickBreak > 0 && rng.bit() === 1) {
      const i = start[c] + rng.below(start[c + 1] - start[c]);
      pick = lits[i] > 0 ? lits[i] : -lits[i];
    }
    const wasTrue = 2 * (pick - 1) + (value[pick] === 1 ? 0 : 1);
    const nowTrue = wasTrue ^ 1;
    value[pick] ^= 1;
    for (let j = occStart[wasTrue]; j < occStart[wasTrue + 1]; j++) {
      const d = occ[j];
      if (--trueCount[d] === 0) {
        unsatPos[d] = unsatCount;
        unsat[unsatCount++] = d;
      }
    }
    for (let j = occStart[nowTrue]; j < occStart[nowTrue + 1]; j++) {
      const d = occ[j];
      if (trueCount[d]++ === 0) {
        const p = unsatPos[d];
        const last = unsat[--unsatCount];
        unsat[p] = last;
        unsatPos[last] = p;
      }
    }
    if (unsatCount < best) best = unsatCount;
  }
  return empties + best;
}
