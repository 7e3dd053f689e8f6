import { createHash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseDimacs } from "../harness/formats/dimacs.js";
import { deriveSeed, Rng } from "../harness/random.js";
import { clausesOf, cnfFromClauses, violatedBy, type Cnf } from "../harness/model/cnf.js";
import { wilsonInterval } from "../harness/stats/tts.js";
import { walkTrials } from "../solvers/walk.js";
import { compileCnf } from "../solvers/compile-cnf.js";
import { trialKey, trialRng, uniformBelow } from "../solvers/trial-seeds.js";
import { stepsToSolution } from "../solvers/types.js";
import { HAVE_SATLIB, SATLIB_DIR } from "./helpers/paths.js";

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
    expect(parts.flatMap((r) => [...r.runLengths.flips])).toEqual([...whole.runLengths.flips]);
    expect(parts.flatMap((r) => [...r.runLengths.solved])).toEqual([...whole.runLengths.solved]);
    expect(Math.min(...parts.map((r) => r.best))).toBe(whole.best);
    // The seed matters: another seed gives another run (work is a sum over 600 random trials).
    expect(walkTrials(cnf, { trials: 600, seed: "other", stop: null }).work).not.toBe(whole.work);
  });

  it("checks the start: a formula every assignment satisfies succeeds in every trial with zero flips", () => {
    const cnf = cnfFromClauses(4, [[1, -1], [2, 3, -2]]); // tautologies only
    const r = walkTrials(cnf, { trials: 20, seed: "taut", stop: null });
    expect(r).toMatchObject({ trials: 20, successes: 20, work: 0, best: 0, censored: false });
    expect([...r.runLengths.flips]).toEqual(new Array(20).fill(0));
    expect([...r.runLengths.solved]).toEqual(new Array(20).fill(1));
  });

  it("returns at once, censored, when the stop flag is already raised", () => {
    const stop = new Int32Array(new SharedArrayBuffer(4));
    Atomics.store(stop, 0, 1);
    const cnf = cnfFromClauses(3, [[1], [-1]]);
    const r = walkTrials(cnf, { trials: 1000, seed: "stop", stop });
    expect(r).toMatchObject({ trials: 0, successes: 0, work: 0, best: Infinity, censored: true });
    expect(r.runLengths.flips.length).toBe(0);
  });

  it("rejects bad options and literals outside 1..n", () => {
    const cnf = cnfFromClauses(3, [[1, 2]]);
    expect(() => walkTrials(cnf, { trials: -1, seed: "x", stop: null })).toThrow(RangeError);
    expect(() => walkTrials(cnf, { trials: 1, maxFlips: 1.5, seed: "x", stop: null })).toThrow(RangeError);
    expect(() => walkTrials(cnf, { trials: 1, restartFlips: 0, seed: "x", stop: null })).toThrow(RangeError);
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

/**
 * Schöning's walk transcribed plainly from the TSDoc of walkCompiled, with ordinary arrays, Rng.below and a
 * linear search for list positions: the same compilation (first occurrence of a repeated literal kept,
 * tautologies dropped, empty clauses counted), the same draws, restarts and violated-list discipline. The fast
 * loop must agree with it draw for draw. Per trial it also returns the flips, whether it was solved and the
 * final assignment (variable v + 1 true iff values[v] === 1).
 */
function referenceWalk(cnf: Cnf, trials: number, seed: string, maxFlips: number, restartFlips = maxFlips, firstTrial = 0) {
  const n = cnf.variables;
  const kept: number[][] = [];
  let empty = 0;
  for (const clause of clausesOf(cnf)) {
    if (clause.length === 0) {
      empty++;
      continue;
    }
    const lits: number[] = [];
    for (const lit of clause) if (!lits.includes(lit)) lits.push(lit);
    if (!lits.some((lit) => lits.includes(-lit))) kept.push(lits);
  }
  const k = kept.length > 0 && kept.every((c) => c.length === kept[0].length) ? kept[0].length : 0;
  let successes = 0;
  let work = 0;
  let best = Infinity;
  const perTrial: Array<{ flips: number; solved: boolean; values: number[] }> = [];
  for (let t = firstTrial; t < firstTrial + trials; t++) {
    const rng = trialRng(seed, t);
    let value: number[] = [];
    let flips = 0;
    let list: number[] = [];
    let trialBest = Infinity;
    do {
      value = [];
      for (let v = 0; v < n; v += 32) {
        const bits = rng.nextU32();
        for (let b = 0; b < 32 && v + b < n; b++) value.push((bits >>> b) & 1);
      }
      const isTrue = (lit: number): boolean => (lit > 0 ? value[lit - 1] === 1 : value[-lit - 1] === 0);
      const count = kept.map((c) => c.filter(isTrue).length);
      list = kept.map((_, c) => c).filter((c) => count[c] === 0);
      trialBest = Math.min(trialBest, list.length);
      const limit = Math.min(flips + restartFlips, maxFlips);
      while (list.length > 0 && flips < limit) {
        let lit: number;
        if (k > 0) {
          const j = rng.below(list.length * k);
          lit = kept[list[Math.floor(j / k)]][j % k];
        } else {
          const c = list[rng.below(list.length)];
          lit = kept[c][rng.below(kept[c].length)];
        }
        const v = Math.abs(lit) - 1;
        value[v] ^= 1;
        const nowTrue = value[v] === 1 ? v + 1 : -(v + 1); // the literal of v that is now true
        kept.forEach((c, i) => {
          if (c.includes(nowTrue) && count[i]++ === 0) {
            const at = list.indexOf(i);
            list[at] = list[list.length - 1];
            list.pop();
          }
        });
        kept.forEach((c, i) => {
          if (c.includes(-nowTrue) && --count[i] === 0) list.push(i);
        });
        flips++;
        trialBest = Math.min(trialBest, list.length);
      }
    } while (list.length > 0 && flips < maxFlips);
    work += flips;
    const solved = list.length === 0 && empty === 0;
    if (solved) successes++;
    best = Math.min(best, trialBest + empty);
    perTrial.push({ flips, solved, values: value });
  }
  return { counts: { trials, successes, work, best, censored: false }, perTrial };
}

describe("walkTrials against a plain transcription", () => {
  it("draws and flips exactly as documented: uniform 3-SAT, mixed clause lengths, repeats, tautologies, empty clauses", () => {
    const rng = new Rng(deriveSeed("walk-test", "reference"));
    const formulas: Array<[Cnf, number, number | undefined]> = [
      [planted3Sat(rng, 14, 60), 3 * 14, undefined], // one clause length: one draw a step
      [planted3Sat(rng, 20, 85), 3 * 20, undefined],
      [messyFormula(rng, 9, 30), 40, undefined], // mixed lengths: two draws a step
      [messyFormula(rng, 12, 25), 60, undefined],
      [cnfFromClauses(6, [[1, 2, 2], [-1, 3], [], [4, -4, 5], [-2, -3, -5, 6], [-6]]), 20, undefined],
      [planted3Sat(rng, 20, 85), 40 * 20, 3 * 20], // restarts every 3n flips within a cap of 40n
      [messyFormula(rng, 10, 28), 400, 25],
    ];
    let successes = 0;
    formulas.forEach(([formula, maxFlips, restartFlips], f) => {
      const { counts, perTrial } = referenceWalk(formula, 150, `reference-${f}`, maxFlips, restartFlips);
      const r = walkTrials(formula, { trials: 150, maxFlips, restartFlips, seed: `reference-${f}`, stop: null });
      expect(r, `formula ${f}`).toMatchObject(counts);
      expect([...r.runLengths.flips], `formula ${f}`).toEqual(perTrial.map((p) => p.flips));
      expect([...r.runLengths.solved], `formula ${f}`).toEqual(perTrial.map((p) => (p.solved ? 1 : 0)));
      expect(r.runLengths.cap).toBe(maxFlips);
      expect(counts.work, `formula ${f}`).toBeGreaterThan(0);
      // A restart really happens: some trial runs past its first start's flips.
      if (restartFlips !== undefined) expect(perTrial.some((p) => p.flips > restartFlips), `formula ${f}`).toBe(true);
      successes += counts.successes;
    });
    // Both draw paths, restarts and both outcomes are covered.
    expect(formulas.map(([formula]) => compileCnf(formula).clauseLength > 0)).toEqual([true, true, false, false, false, true, false]);
    expect(successes).toBeGreaterThan(0);
    expect(successes).toBeLessThan(7 * 150);
  });
});

/** The clauses of a DIMACS file read plainly from its text: integer lines split at 0; c, p and SATLIB's % lines skipped. */
function plainClauses(text: string): number[][] {
  const clauses: number[][] = [];
  let current: number[] = [];
  for (const line of text.split("\n")) {
    const t = line.trim();
    if (t === "" || t.startsWith("c") || t.startsWith("p")) continue;
    if (t.startsWith("%")) break;
    for (const word of t.split(/\s+/)) {
      const lit = Number(word);
      if (lit === 0) {
        clauses.push(current);
        current = [];
      } else current.push(lit);
    }
  }
  return clauses;
}

/** True when the assignment (values[v] = 1: variable v + 1 true) satisfies every clause. */
function satisfiesAll(clauses: number[][], values: number[]): boolean {
  return clauses.every((clause) => clause.some((lit) => (lit > 0 ? values[lit - 1] === 1 : values[-lit - 1] === 0)));
}

if (!HAVE_SATLIB) console.warn(`walk SATLIB replay checks skipped: ${SATLIB_DIR} not found`);

describe.skipIf(!HAVE_SATLIB)("the walk's recorded flips to solution on SATLIB files (Hoos & Stützle, SAT 2000)", () => {
  // SATLIB states every uf20-91 and uf50-218 file satisfiable and every uuf50-218 file unsatisfiable.
  const files = (folder: string, count: number): Array<[string, string]> =>
    readdirSync(join(SATLIB_DIR, folder)).filter((f) => f.endsWith(".cnf")).sort().slice(0, count)
      .map((name) => [name, readFileSync(join(SATLIB_DIR, folder, name), "utf8")]);

  it("uf20-91, 3n flips a trial: every trial replays to its recorded count; solved trials end on a model, censored ones never", () => {
    let solvedTrials = 0;
    let censoredTrials = 0;
    for (const [name, text] of files("uf20-91", 5)) {
      const cnf = parseDimacs(text, name);
      const clauses = plainClauses(text);
      expect(clauses.length).toBe(91);
      const cap = 3 * cnf.variables;
      const r = walkTrials(cnf, { trials: 200, maxFlips: cap, seed: name, stop: null });
      const steps = stepsToSolution(r.runLengths);
      expect(r.work).toBe(r.runLengths.flips.reduce((a, b) => a + b, 0));
      expect(r.successes).toBe(steps.filter((s) => s >= 0).length);
      for (let t = 0; t < 200; t++) {
        const flips = r.runLengths.flips[t];
        // The plain transcription, replaying trial t alone with the same seed and cap.
        const replay = referenceWalk(cnf, 1, name, cap, cap, t).perTrial[0];
        expect(replay.flips, `${name} trial ${t}`).toBe(flips);
        expect(satisfiesAll(clauses, replay.values), `${name} trial ${t}`).toBe(steps[t] >= 0);
        // The fast loop alone on trial t, and one flip short of the recorded count: not yet solved.
        expect(walkTrials(cnf, { trials: 1, firstTrial: t, maxFlips: cap, seed: name, stop: null }).runLengths.flips[0]).toBe(flips);
        if (steps[t] >= 0) {
          solvedTrials++;
          if (flips > 0) expect(walkTrials(cnf, { trials: 1, firstTrial: t, maxFlips: flips - 1, seed: name, stop: null }).successes).toBe(0);
        } else {
          censoredTrials++;
          expect(flips).toBe(cap);
        }
      }
    }
    // Both kinds occur, or one of the checks above would be vacuous.
    expect(solvedTrials).toBeGreaterThan(20);
    expect(censoredTrials).toBeGreaterThan(20);
  });

  it("uf50-218, the restarting walk (3n flips a start, cap 2·10^5): replays agree and solved trials end on a model", () => {
    let solvedTrials = 0;
    for (const [name, text] of files("uf50-218", 3)) {
      const cnf = parseDimacs(text, name);
      const clauses = plainClauses(text);
      const cap = 200_000;
      const r = walkTrials(cnf, { trials: 4, maxFlips: cap, restartFlips: 3 * cnf.variables, seed: name, stop: null });
      const { perTrial } = referenceWalk(cnf, 4, name, cap, 3 * cnf.variables);
      expect([...r.runLengths.flips], name).toEqual(perTrial.map((p) => p.flips));
      perTrial.forEach((p, t) => {
        expect(satisfiesAll(clauses, p.values), `${name} trial ${t}`).toBe(r.runLengths.solved[t] === 1);
        if (r.runLengths.solved[t] === 0) expect(p.flips).toBe(cap);
      });
      solvedTrials += r.successes;
    }
    expect(solvedTrials).toBeGreaterThan(6);
  });

  it("uuf50-218: no trial is ever reported solved; every one runs to its cap", () => {
    for (const [name, text] of files("uuf50-218", 5)) {
      const cnf = parseDimacs(text, name);
      for (const [cap, restartFlips] of [[150, undefined], [3000, 150]] as const) {
        const r = walkTrials(cnf, { trials: 50, maxFlips: cap, restartFlips, seed: name, stop: null });
        expect(r.successes, name).toBe(0);
        expect(stepsToSolution(r.runLengths), name).toEqual(new Array(50).fill(-1));
        expect([...r.runLengths.flips], name).toEqual(new Array(50).fill(cap));
      }
    }
  });
});

describe("trialRng", () => {
  /** MurmurHash3's fmix32 in BigInt arithmetic (the finaliser as published with MurmurHash3, A. Appleby). */
  const fmix32 = (x: bigint): bigint => {
    const M = 0xffffffffn;
    x ^= x >> 16n;
    x = (x * 0x85ebca6bn) & M;
    x ^= x >> 13n;
    x = (x * 0xc2b2ae35n) & M;
    return x ^ (x >> 16n);
  };
  /** The TSDoc definition of trialRng transcribed independently (BigInt, hex seed string). */
  const reference = (seed: string, t: number): Rng => {
    const hex = createHash("sha256").update(JSON.stringify([seed, "trial"])).digest("hex");
    const gamma = [0x6a09e667n, 0xbb67ae85n, 0x3c6ef373n, 0xa54ff53bn];
    const tHi = BigInt(Math.floor(t / 2 ** 32));
    const step = (BigInt(t % 2 ** 32) + 1n) % 2n ** 32n;
    const words = gamma.map((g, i) => {
      const k = BigInt("0x" + hex.slice(8 * i, 8 * i + 8));
      return fmix32(((k ^ fmix32(tHi)) + step * g) % 2n ** 32n);
    });
    return new Rng(words.map((w) => w.toString(16).padStart(8, "0")).join(""));
  };

  it("is the documented SplitMix-style derivation from (cell seed, t), for small and large t", () => {
    for (const [seed, t] of [["cell", 0], ["cell", 17], ["other cell", 17], ["cell", 2 ** 32 - 1], ["cell", 2 ** 32 + 5], ["cell", 2 ** 45 + 3]] as const) {
      const mine = trialRng(seed, t);
      const viaKey = trialRng(trialKey(seed), t);
      const ref = reference(seed, t);
      for (let i = 0; i < 8; i++) {
        const x = ref.nextU32();
        expect(mine.nextU32()).toBe(x);
        expect(viaKey.nextU32()).toBe(x);
      }
    }
  });

  it("gives adjacent trials unrelated streams: first outputs and their XOR are balanced bit by bit", () => {
    // For N independent uniform words each bit is Binomial(N, 1/2): mean N/2, standard deviation √N/2; we
    // allow 5 standard deviations (common practice for a deterministic check; false alarm ≈ 6e−7 a bit).
    const N = 20000;
    const key = trialKey("adjacent");
    const first = Array.from({ length: N + 1 }, (_, t) => trialRng(key, t).nextU32());
    for (let b = 0; b < 32; b++) {
      let ones = 0;
      let xorOnes = 0;
      for (let t = 0; t < N; t++) {
        ones += (first[t] >>> b) & 1;
        xorOnes += ((first[t] ^ first[t + 1]) >>> b) & 1;
      }
      expect(Math.abs(ones - N / 2), `bit ${b}`).toBeLessThan((5 * Math.sqrt(N)) / 2);
      expect(Math.abs(xorOnes - N / 2), `xor bit ${b}`).toBeLessThan((5 * Math.sqrt(N)) / 2);
    }
    expect(new Set(first).size).toBeGreaterThan(N - 5); // 32-bit birthday collisions: expected N²/2^33 ≈ 0.05
  });
});
