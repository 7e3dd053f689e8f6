import { describe, expect, it } from "vitest";
import { deriveSeed, Rng } from "../harness/random.js";
import { cnfFromClauses, violatedBy, type Cnf } from "../harness/model/cnf.js";
import { wilsonInterval } from "../harness/stats/tts.js";
import { compileCnf, trialRng, uniformBelow, walkTrials } from "../solvers/walk.js";

/** Fewest violated clauses over all 2^n assignments (brute force, n ≤ 20). */
function bruteOptimum(cnf: Cnf): number {
  let best = Infinity;
  for (let z = 0; z < 2 ** cnf.variables; z++) best = Math.min(best, violatedBy(cnf, z));
  return best;
}

/** Random clauses of length 1..5 with repeated literals and tautologies allowed, to exercise compilation. */
function messyFormula(rng: Rng, n: number, m: number): Cnf {
  const clauses: number[][] = [];
  for (let c = 0; c < m; c++) {
    const len = 1 + rng.below(5);
    const clause: number[] = [];
    for (let i = 0; i < len; i++) clause.push((1 + rng.below(n)) * (rng.bit() === 1 ? 1 : -1));
    clauses.push(clause);
  }
  return cnfFromClauses(n, clauses);
}

/**
 * Planted 3-SAT: a uniform hidden assignment, clauses of 3 distinct variables with random signs, each
 * rejected while the hidden assignment violates it (so the formula is satisfiable by construction).
 */
function planted3Sat(rng: Rng, n: number, m: number): Cnf {
  const hidden = Array.from({ length: n }, () => rng.bit());
  const clauses: number[][] = [];
  while (clauses.length < m) {
    const vars: number[] = [];
    while (vars.length < 3) {
      const v = rng.below(n);
      if (!vars.includes(v)) vars.push(v);
    }
    const clause = vars.map((v) => (rng.bit() === 1 ? v + 1 : -(v + 1)));
    if (clause.some((lit) => (lit > 0 ? hidden[lit - 1] === 1 : hidden[-lit - 1] === 0))) clauses.push(clause);
  }
  return cnfFromClauses(n, clauses);
}

/**
 * Lower bound on the success probability of one Schöning trial (uniform start, 3n steps) on a satisfiable
 * 3-CNF, from the Hamming-distance argument of Schöning (Algorithmica 32 (2002)): fix a satisfying a*; in a
 * violated clause a* differs from the current assignment on at least one of the ≤ 3 variables, so a step
 * lowers the distance to a* with probability ≥ 1/3. By coupling, the distance stays below a walk W that
 * steps −1 with probability 1/3 and +1 with 2/3, until it hits 0 (reaching another solution first only
 * helps). W started at j first hits 0 at step j + 2i with probability (ballot theorem)
 * j/(j + 2i)·C(j + 2i, i)·(2/3)^i·(1/3)^(j+i); we sum over j + 2i ≤ 3n and over the start distance j ~
 * Binomial(n, 1/2). Exact arithmetic on that sum; no asymptotics.
 */
function schoningBallotBound(n: number): number {
  const choose = (a: number, b: number): number => {
    let r = 1;
    for (let k = 1; k <= b; k++) r = (r * (a - b + k)) / k;
    return r;
  };
  let bound = 0;
  for (let j = 0; j <= n; j++) {
    let q = j === 0 ? 1 : 0;
    for (let i = 0; j > 0 && j + 2 * i <= 3 * n; i++) {
      q += (j / (j + 2 * i)) * choose(j + 2 * i, i) * (2 / 3) ** i * (1 / 3) ** (j + i);
    }
    bound += (choose(n, j) / 2 ** n) * q;
  }
  return bound;
}

/**
 * The (3/4)^n·poly(n) form of the same bound. Keeping only the i = j term (first hit at step 3j ≤ 3n):
 * q_j ≥ (1/3)·C(3j, j)·2^j/27^j, and C(3j, j) ≥ (27/4)^j/√(16j/3) (the entropy bound C(m, αm) ≥
 * 2^(m·H(α))/√(8mα(1−α)), MacWilliams & Sloane, The Theory of Error-Correcting Codes, ch. 10, Lemma 7, with
 * m = 3j, α = 1/3), so q_j ≥ 2^−j/(4√(3j)) ≥ 2^−j/(4√(3n)); averaging over j ~ Binomial(n, 1/2) gives
 * p ≥ (3/4)^n/(4√(3n)). The polynomial factor is 1/(4√(3n)).
 */
function schoningPolyBound(n: number): number {
  return 0.75 ** n / (4 * Math.sqrt(3 * n));
}

describe("walkTrials", () => {
  it("agrees with brute force on small formulas: success iff satisfiable, best ≥ the true optimum", () => {
    // Source of truth: exhaustive evaluation of every assignment (violatedBy from harness/model/cnf.ts).
    const rng = new Rng(deriveSeed("walk-test", "brute"));
    let sat = 0;
    let unsat = 0;
    for (let f = 0; f < 40; f++) {
      const n = 5 + rng.below(6);
      const cnf = messyFormula(rng, n, 2 + rng.below(6 * n));
      const optimum = bruteOptimum(cnf);
      const r = walkTrials(cnf, { trials: 300, maxFlips: 20 * n, seed: `brute-${f}`, stop: null });
      expect(r.trials).toBe(300);
      expect(r.best).toBeGreaterThanOrEqual(optimum);
      expect(r.work).toBeLessThanOrEqual(300 * 20 * n);
      if (optimum === 0) {
        sat++;
        expect(r.successes).toBeGreaterThan(0);
        expect(r.best).toBe(0);
      } else {
        unsat++;
        expect(r.successes).toBe(0);
        expect(r.work).toBe(300 * 20 * n); // no trial can stop early
      }
    }
    // Both kinds must occur, or the check above would be vacuous for one of them.
    expect(sat).toBeGreaterThan(5);
    expect(unsat).toBeGreaterThan(5);
  });

  it("never succeeds with an empty clause, whose violation is counted in best", () => {
    // An empty clause is false under every assignment (DIMACS semantics of the empty disjunction).
    const cnf = cnfFromClauses(3, [[1, 2], [], [-3]]);
    const r = walkTrials(cnf, { trials: 50, seed: "empty", stop: null });
    expect(r.successes).toBe(0);
    expect(r.best).toBe(1);
  });

  it("runs 3n flips a trial by default (Schöning's run length)", () => {
    // x1 ∧ ¬x1 is unsatisfiable, so every trial runs to its limit.
    const cnf = cnfFromClauses(7, [[1], [-1], [2, 3]]);
    const r = walkTrials(cnf, { trials: 10, seed: "default", stop: null });
    expect(r.work).toBe(10 * 3 * 7);
    expect(r.successes).toBe(0);
  });

  it("is deterministic and splits over trial ranges: [0,T) = [0,a) + [a,b) + [b,T)", () => {
    const cnf = planted3Sat(new Rng(deriveSeed("walk-test", "split")), 16, 68);
    const whole = walkTrials(cnf, { trials: 600, seed: "split", stop: null });
    expect(walkTrials(cnf, { trials: 600, seed: "split", stop: null })).toEqual(whole);
    const parts = [
      walkTrials(cnf, { trials: 250, seed: "split", stop: null }),
      walkTrials(cnf, { trials: 100, firstTrial: 250, seed: "split", stop: null }),
      walkTrials(cnf, { trials: 250, firstTrial: 350, seed: "split", stop: null }),
    ];
    expect(parts.reduce((a, r) => a + r.trials, 0)).toBe(whole.trials);
    expect(parts.reduce((a, r) => a + r.successes, 0)).toBe(whole.successes);
    expect(parts.reduce((a, r) => a + r.work, 0)).toBe(whole.work);
    expect(Math.min(...parts.map((r) => r.best))).toBe(whole.best);
    // The seed matters: another seed gives another run (work is a sum over 600 random trials).
    expect(walkTrials(cnf, { trials: 600, seed: "other", stop: null }).work).not.toBe(whole.work);
  });

  it("checks the start: a formula every assignment satisfies succeeds in every trial with zero flips", () => {
    const cnf = cnfFromClauses(4, [[1, -1], [2, 3, -2]]); // tautologies only
    expect(walkTrials(cnf, { trials: 20, seed: "taut", stop: null })).toEqual({ trials: 20, successes: 20, work: 0, best: 0, censored: false });
  });

  it("returns at once, censored, when the stop flag is already raised", () => {
    const stop = new Int32Array(new SharedArrayBuffer(4));
    Atomics.store(stop, 0, 1);
    const cnf = cnfFromClauses(3, [[1], [-1]]);
    expect(walkTrials(cnf, { trials: 1000, seed: "stop", stop })).toEqual({ trials: 0, successes: 0, work: 0, best: Infinity, censored: true });
  });

  it("rejects bad options and literals outside 1..n", () => {
    const cnf = cnfFromClauses(3, [[1, 2]]);
    expect(() => walkTrials(cnf, { trials: -1, seed: "x", stop: null })).toThrow(RangeError);
    expect(() => walkTrials(cnf, { trials: 1, maxFlips: 1.5, seed: "x", stop: null })).toThrow(RangeError);
    expect(() => compileCnf(cnfFromClauses(3, [[4]]))).toThrow(RangeError);
  });

  it("compiles away repeated literals and tautologies, and counts empty clauses apart", () => {
    const c = compileCnf(cnfFromClauses(3, [[1, 1, -2], [2, -2, 3], [], [-3]]));
    expect(c.clauses).toBe(2);
    expect(c.emptyClauses).toBe(1);
    expect(Array.from(c.clauseLiterals)).toEqual([1, 2, 4]); // x1 → 2·0+1, ¬x2 → 2·1+0, ¬x3 → 2·2+0
  });

  it("per-trial success probability on planted 3-SAT is not below Schöning's bound (one-sided Wilson 99%)", () => {
    // Planted at density 4.26 (m = round(4.26 n)); bounds derived in schoningBallotBound/schoningPolyBound.
    for (let n = 12; n <= 20; n += 2) {
      const cnf = planted3Sat(new Rng(deriveSeed("walk-test", "schoening", n)), n, Math.round(4.26 * n));
      const ballot = schoningBallotBound(n);
      const poly = schoningPolyBound(n);
      expect(ballot).toBeGreaterThanOrEqual(poly); // the polynomial form is a weakening of the sum
      // Enough trials that a true p of a third of the bound would push the upper limit below it.
      const trials = Math.ceil(100 / ballot);
      const r = walkTrials(cnf, { trials, seed: `schoening-${n}`, stop: null });
      const upper = wilsonInterval(r.successes, r.trials, 2.326348).high; // z for one-sided 99%
      expect(upper).toBeGreaterThanOrEqual(ballot);
      expect(upper).toBeGreaterThanOrEqual(poly);
    }
  });
});

describe("uniformBelow", () => {
  it("draws what Rng.below draws for bounds up to 2^21 (same rejection method, Lemire 2019)", () => {
    const a = new Rng(deriveSeed("below"));
    const b = new Rng(deriveSeed("below"));
    for (const bound of [1, 2, 3, 7, 119, 1000, 65537, 2097152]) {
      for (let i = 0; i < 2000; i++) expect(uniformBelow(a, bound)).toBe(b.below(bound));
    }
  });

  it("gives ⌊x·bound/2^32⌋ exactly for large bounds (checked with BigInt)", () => {
    const a = new Rng(deriveSeed("below-large"));
    const b = new Rng(deriveSeed("below-large"));
    for (const bound of [2097153, 1e9, 4294967295]) {
      for (let i = 0; i < 2000; i++) {
        const got = uniformBelow(a, bound);
        // Replay the same draws: rejection happens only when the low word is below 2^32 mod bound.
        const threshold = (4294967296 - bound) % bound;
        let x = b.nextU32();
        while (Number((BigInt(x) * BigInt(bound)) % 4294967296n) < threshold) x = b.nextU32();
        expect(got).toBe(Number((BigInt(x) * BigInt(bound)) >> 32n));
      }
    }
  });
});

describe("trialRng", () => {
  it("is the generator new Rng(deriveSeed(seed, 'trial', t)) named in the brief", () => {
    const mine = trialRng("cell", 17);
    const ref = new Rng(deriveSeed("cell", "trial", 17));
    for (let i = 0; i < 10; i++) expect(mine.nextU32()).toBe(ref.nextU32());
  });
});
