/**
 * CNF encoders and random formulas for the exact-enumeration tests and benchmark. Not used by the tool itself.
 * Variable numbering is stated per encoder; every encoder returns a {@link Cnf} in the shared DIMACS convention.
 */
import { type Cnf, cnfFromClauses } from "../../harness/model/cnf.js";
import { Rng } from "../../harness/random.js";

/**
 * n-queens: variable q(r,c) = r·n + c + 1 says "a queen on row r, column c" (0-based r, c). Clauses: at least one
 * queen per row, at most one per row, per column and per diagonal (pairwise). Its models are exactly the
 * placements of n non-attacking queens (n per row forces exactly one per row).
 */
export function queensCnf(n: number): Cnf {
  const q = (r: number, c: number) => r * n + c + 1;
  const clauses: number[][] = [];
  for (let r = 0; r < n; r++) {
    const row: number[] = [];
    for (let c = 0; c < n; c++) row.push(q(r, c));
    clauses.push(row);
  }
  for (let r1 = 0; r1 < n; r1++) {
    for (let c1 = 0; c1 < n; c1++) {
      for (let r2 = r1; r2 < n; r2++) {
        for (let c2 = 0; c2 < n; c2++) {
          if (r2 === r1 && c2 <= c1) continue;
          const attack = r1 === r2 || c1 === c2 || Math.abs(r1 - r2) === Math.abs(c1 - c2);
          if (attack) clauses.push([-q(r1, c1), -q(r2, c2)]);
        }
      }
    }
  }
  return cnfFromClauses(n * n, clauses);
}

/**
 * Proper q-colourings of the cycle C_n, one-hot: variable x(v,c) = v·q + c + 1 says "vertex v has colour c".
 * Clauses: each vertex at least one colour and at most one (pairwise), and adjacent vertices v, v+1 (mod n) not
 * both colour c. Models correspond one-to-one to proper colourings.
 */
export function cycleColouringCnf(n: number, q: number): Cnf {
  const x = (v: number, c: number) => v * q + c + 1;
  const clauses: number[][] = [];
  for (let v = 0; v < n; v++) {
    const some: number[] = [];
    for (let c = 0; c < q; c++) some.push(x(v, c));
    clauses.push(some);
    for (let c1 = 0; c1 < q; c1++) for (let c2 = c1 + 1; c2 < q; c2++) clauses.push([-x(v, c1), -x(v, c2)]);
  }
  for (let v = 0; v < n; v++) {
    const u = (v + 1) % n;
    for (let c = 0; c < q; c++) clauses.push([-x(v, c), -x(u, c)]);
  }
  return cnfFromClauses(n * q, clauses);
}

/**
 * Pigeonhole principle PHP(p, h): variable x(i,j) = i·h + j + 1 says "pigeon i sits in hole j". Clauses: each
 * pigeon in at least one hole (p clauses of length h), no two pigeons share a hole (h·C(p,2) binary clauses).
 */
export function pigeonholeCnf(pigeons: number, holes: number): Cnf {
  const x = (i: number, j: number) => i * holes + j + 1;
  const clauses: number[][] = [];
  for (let i = 0; i < pigeons; i++) {
    const some: number[] = [];
    for (let j = 0; j < holes; j++) some.push(x(i, j));
    clauses.push(some);
  }
  for (let j = 0; j < holes; j++) {
    for (let i1 = 0; i1 < pigeons; i1++) for (let i2 = i1 + 1; i2 < pigeons; i2++) clauses.push([-x(i1, j), -x(i2, j)]);
  }
  return cnfFromClauses(pigeons * holes, clauses);
}

/**
 * Uniform random k-SAT for tests and benchmarks: m clauses of k distinct variables each with random signs.
 * (The tool's own generator is harness/families/ksat.ts; this one keeps the kernel's tests independent of it.)
 */
export function randomKsat(rng: Rng, n: number, k: number, m: number): Cnf {
  const clauses: number[][] = [];
  for (let c = 0; c < m; c++) {
    const vars: number[] = [];
    while (vars.length < k) {
      const v = rng.below(n) + 1;
      if (!vars.includes(v)) vars.push(v);
    }
    clauses.push(vars.map((v) => (rng.bit() === 1 ? v : -v)));
  }
  return cnfFromClauses(n, clauses);
}

/**
 * Random formula with mixed clause lengths 1..maxLength, variables drawn with replacement (so literals may repeat
 * and clauses may be tautologies), for agreement tests against brute force.
 */
export function randomMixedCnf(rng: Rng, n: number, m: number, maxLength: number): Cnf {
  const clauses: number[][] = [];
  for (let c = 0; c < m; c++) {
    const len = 1 + rng.below(maxLength);
    const clause: number[] = [];
    for (let i = 0; i < len; i++) {
      const v = rng.below(n) + 1;
      clause.push(rng.bit() === 1 ? v : -v);
    }
    clauses.push(clause);
  }
  return cnfFromClauses(n, clauses);
}
