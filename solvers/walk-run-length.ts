/**
 * Run-length distribution of Schöning's walk with its restarts (U. Schöning, "A probabilistic algorithm for
 * k-SAT based on limited local search and restart", Algorithmica 32 (2002) 615–623): one RLD trial is the
 * restarting algorithm itself — a uniformly random assignment, at most `restartFlips` (default 3n) flips of a
 * uniformly chosen variable of a uniformly chosen violated clause, then a fresh random assignment, and so on —
 * until no clause is violated or `cap` flips in all are done. It records the total flips to solution per trial,
 * censored at the cap, so it can be set beside breakwalk's RLD (./breakwalk.ts) flip for flip.
 *
 * The step is the one of walkCompiled (./walk.ts), which keeps its own draw order and counts; this variant
 * draws from trialRng(seed, t) for RLD trial t, every restart continuing on the same generator.
 */
import type { Cnf } from "../harness/model/cnf.js";
import { stopRequested, type StopFlag, type TrialsResult } from "./types.js";
import { compileCnf, type CompiledCnf } from "./compile-cnf.js";
import { trialKey, trialRng } from "./trial-seeds.js";
import type { RunLengths } from "../harness/types.js";

/** Options of {@link walkRunLengths}. */
export interface WalkRunLengthOptions {
  /** RLD trials, an integer ≥ 0. */
  readonly trials: number;
  /** Total flips per RLD trial at most (restarts included), an integer ≥ 0. */
  readonly cap: number;
  /** Flips before a restart, an integer ≥ 1. Default 3n. */
  readonly restartFlips?: number;
  readonly firstTrial?: number;
  readonly seed: string;
  readonly stop: StopFlag;
}

/** Counts (work = all flips) plus the RLD. */
export interface WalkRunLengthResult extends TrialsResult {
  readonly runLengths: RunLengths;
}

const POLL_INTERVAL = 4096;

/** {@link walkRunLengthsCompiled} on a formula. */
export function walkRunLengths(cnf: Cnf, options: WalkRunLengthOptions): WalkRunLengthResult {
  return walkRunLengthsCompiled(compileCnf(cnf), options);
}

/**
 * RLD trials of the restarting walk. Draws of a restart, in order: ⌈n/32⌉ `nextU32` for the start (bit b of call
 * i giving variable 32·i + b), then per flip `below(U)` for the violated-list entry and `below(length)` for the
 * literal (the list kept as in walkCompiled).
 */
export function walkRunLengthsCompiled(f: CompiledCnf, options: WalkRunLengthOptions): WalkRunLengthResult {
  const n = f.variables;
  const m = f.clauses;
  const { trials, cap } = options;
  const restartFlips = options.restartFlips ?? 3 * n;
  const firstTrial = options.firstTrial ?? 0;
  for (const [name, v] of [["trials", trials], ["cap", cap], ["firstTrial", firstTrial]] as const) {
    if (!Number.isSafeInteger(v) || v < 0) throw new RangeError(`${name} must be an integer ≥ 0, got ${v}`);
  }
  if (!Number.isSafeInteger(restartFlips) || restartFlips < 1) throw new RangeError(`restartFlips must be an integer ≥ 1, got ${restartFlips}`);
  const { clauseStart, clauseLiterals, occurrenceStart, occurrences } = f;
  const empty = f.emptyClauses;
  const value = new Uint8Array(n);
  const trueCount = new Int32Array(m);
  const violated = new Int32Array(m + 2);
  const position = new Int32Array(m);
  const key = trialKey(options.seed);
  const stop = options.stop;
  const runFlips = new Float64Array(trials);
  const runSolved = new Uint8Array(trials);

  let done = 0;
  let successes = 0;
  let work = 0;
  let best = Infinity;
  let censored = false;
  let sincePoll = POLL_INTERVAL;

  trialLoop: for (let t = firstTrial; t < firstTrial + trials; t++) {
    if (++sincePoll >= POLL_INTERVAL) {
      sincePoll = 0;
      if (stopRequested(stop)) {
        censored = true;
        break;
      }
    }
    const rng = trialRng(key, t);
    let total = 0;
    let unsat = 1;
    let trialBest = Infinity;
    while (true) {
      // A restart: random start, counts and the violated list from scratch.
      for (let v = 0; v < n; v += 32) {
        const bits = rng.nextU32();
        const top = Math.min(32, n - v);
        for (let b = 0; b < top; b++) value[v + b] = (bits >>> b) & 1;
      }
      unsat = 0;
      for (let c = 0; c < m; c++) {
        let count = 0;
        for (let i = clauseStart[c]; i < clauseStart[c + 1]; i++) {
          const code = clauseLiterals[i];
          count += (value[code >> 1] ^ code ^ 1) & 1;
        }
        trueCount[c] = count;
        if (count === 0) {
          violated[++unsat] = c;
          position[c] = unsat;
        }
      }
      if (unsat < trialBest) trialBest = unsat;
      const limit = Math.min(total + restartFlips, cap);
      while (unsat > 0 && total < limit) {
        if (++sincePoll >= POLL_INTERVAL) {
          sincePoll = 0;
          if (stopRequested(stop)) {
            censored = true;
            break trialLoop;
          }
        }
        const c = violated[rng.below(unsat) + 1];
        const from = clauseStart[c];
        const v = clauseLiterals[from + rng.below(clauseStart[c + 1] - from)] >> 1;
        const now = value[v] ^ 1;
        value[v] = now;
        const up = 2 * v + now;
        for (let i = occurrenceStart[up], end = occurrenceStart[up + 1]; i < end; i++) {
          const d = occurrences[i];
          if (trueCount[d]++ === 0) {
            const last = violated[unsat--];
            const p = position[d];
            violated[p] = last;
            position[last] = p;
          }
        }
        const down = up ^ 1;
        for (let i = occurrenceStart[down], end = occurrenceStart[down + 1]; i < end; i++) {
          const d = occurrences[i];
          if (--trueCount[d] === 0) {
            violated[++unsat] = d;
            position[d] = unsat;
          }
        }
        total++;
        if (unsat < trialBest) trialBest = unsat;
      }
      if (unsat === 0 || total >= cap) break;
    }
    const solved = unsat === 0 && empty === 0;
    runFlips[done] = total;
    runSolved[done] = solved ? 1 : 0;
    done++;
    work += total;
    if (solved) successes++;
    if (trialBest + empty < best) best = trialBest + empty;
  }
  return { trials: done, successes, work, best, censored, runLengths: { flips: runFlips.slice(0, done), solved: runSolved.slice(0, done), cap } };
}
