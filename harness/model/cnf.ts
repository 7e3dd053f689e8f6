/**
 * Conjunctive normal form, the representation shared by the k-SAT generator, the DIMACS reader and the
 * k-SAT solvers. Literals follow DIMACS: variable v (1-based) is `v`, its negation `-v`.
 * Assignment convention everywhere in speedbound: bit v−1 of an assignment index z is the value of variable v.
 */
export interface Cnf {
  /** Number of variables n. */
  readonly variables: number;
  /** All clauses' literals, clause after clause (DIMACS signed, 1-based). */
  readonly literals: Int32Array;
  /** Clause c occupies literals[offsets[c] .. offsets[c+1]); length = clauses + 1. */
  readonly offsets: Int32Array;
}

/** Number of clauses m. */
export function clauseCount(cnf: Cnf): number {
  return cnf.offsets.length - 1;
}

/** Builds a {@link Cnf} from an array of clauses (each an array of DIMACS literals). */
export function cnfFromClauses(variables: number, clauses: ReadonlyArray<ReadonlyArray<number>>): Cnf {
  let total = 0;
  for (const c of clauses) total += c.length;
  const literals = new Int32Array(total);
  const offsets = new Int32Array(clauses.length + 1);
  let at = 0;
  clauses.forEach((c, i) => {
    offsets[i] = at;
    for (const lit of c) literals[at++] = lit;
  });
  offsets[clauses.length] = at;
  return { variables, literals, offsets };
}

/** The clauses as arrays of literals (for tests, writers and small tools; not for hot loops). */
export function clausesOf(cnf: Cnf): number[][] {
  const out: number[][] = [];
  for (let c = 0; c + 1 < cnf.offsets.length; c++) {
    out.push(Array.from(cnf.literals.subarray(cnf.offsets[c], cnf.offsets[c + 1])));
  }
  return out;
}

/**
 * Number of clauses violated by assignment index z (bit v−1 = value of variable v). Reference evaluation,
 * O(total literals); valid for n ≤ 52 (z must be an exact integer in a double).
 */
export function violatedBy(cnf: Cnf, z: number): number {
  const values = new Uint8Array(cnf.variables);
  for (let v = 0; v < cnf.variables; v++) values[v] = Math.floor(z / 2 ** v) % 2;
  return violatedByValues(cnf, values);
}

/** Number of clauses violated by an explicit assignment (values[v−1] ∈ {0,1}). */
export function violatedByValues(cnf: Cnf, values: Uint8Array): number {
  const { literals, offsets } = cnf;
  let violated = 0;
  for (let c = 0; c + 1 < offsets.length; c++) {
    let sat = false;
    for (let i = offsets[c]; i < offsets[c + 1]; i++) {
      const lit = literals[i];
      if (lit > 0 ? values[lit - 1] === 1 : values[-lit - 1] === 0) {
        sat = true;
        break;
      }
    }
    if (!sat) violated++;
  }
  return violated;
}

/**
 * Exact mean number of violated clauses over all 2^n assignments: Σ_c 2^(−distinct variables of c),
 * 0 for a tautological clause (it is never violated).
 */
export function meanViolated(cnf: Cnf): number {
  let mean = 0;
  for (let c = 0; c + 1 < cnf.offsets.length; c++) {
    const seen = new Map<number, number>();
    let tautology = false;
    for (let i = cnf.offsets[c]; i < cnf.offsets[c + 1]; i++) {
      const lit = cnf.literals[i];
      const prev = seen.get(Math.abs(lit));
      if (prev !== undefined && prev !== lit) tautology = true;
      seen.set(Math.abs(lit), lit);
    }
    if (!tautology) mean += 2 ** -seen.size;
  }
  return mean;
}
