/**
 * Run-length distributions (RLDs) of randomised local search, and what follows from one without rerunning:
 * the success probability and the time to solution at any cut-off, and the cut-off that minimises it.
 *
 * An RLD is the list, over independent trials of one solver on one instance, of the work (flips) each trial
 * needed to reach a solution, censored at the trial's cap when it did not (H. H. Hoos and T. Stützle,
 * "Evaluating Las Vegas algorithms: pitfalls and remedies", UAI 1998, introduced RLDs for exactly this use).
 * Restarting a trial at cut-off c makes each restart succeed with p(c) = P(X ≤ c), so
 * TTS_0.99(c) = c · ln(0.01)/ln(1 − p(c)) (Rønnow et al., "Defining and detecting quantum speedup",
 * Science 345 (2014) 420), counting each restart at its full length c (at least 1 flip, so that a start that
 * is already a solution still costs something).
 *
 * Pure: no clock, file or console.
 */
import { ttsTrials, TTS_TARGET } from "./tts.js";
import type { RunLengths } from "../types.js";

export type { RunLengths } from "../types.js";

/** An RLD summary at one cut-off. */
export interface CutoffPoint {
  /** Cut-off (flips per restart). */
  readonly cutoff: number;
  /** Fraction of trials solved within the cut-off. */
  readonly p: number;
  /** TTS_0.99 in flips: max(cutoff, 1)·ln(0.01)/ln(1 − p); +Infinity when p = 0. */
  readonly tts: number;
}

/** Fraction of trials solved within `cutoff` flips (0 ≤ cutoff ≤ cap; beyond the cap nothing is known). */
export function successAt(rld: RunLengths, cutoff: number): number {
  checkCutoff(rld, cutoff);
  const trials = rld.flips.length;
  if (trials === 0) return NaN;
  let hits = 0;
  for (let t = 0; t < trials; t++) if (rld.solved[t] === 1 && rld.flips[t] <= cutoff) hits++;
  return hits / trials;
}

/** TTS (in flips) of restarts at `cutoff`: max(cutoff, 1) × ln(1 − target)/ln(1 − p(cutoff)); +Infinity if p = 0. */
export function ttsAt(rld: RunLengths, cutoff: number, target = TTS_TARGET): number {
  const p = successAt(rld, cutoff);
  return Math.max(cutoff, 1) * ttsTrials(p, target);
}

/**
 * The cut-off minimising TTS on one RLD. TTS(c) increases with c between two solved run lengths (p is constant
 * there), so the minimum lies at one of the solved run lengths; ties go to the smallest cut-off.
 * @returns the best point, or null when no trial was solved (then every cut-off up to the cap has p = 0).
 */
export function bestCutoff(rld: RunLengths, target = TTS_TARGET): CutoffPoint | null {
  const candidates = solvedLengths([rld]);
  let best: CutoffPoint | null = null;
  for (const c of candidates) {
    const p = successAt(rld, c);
    const tts = Math.max(c, 1) * ttsTrials(p, target);
    if (best === null || tts < best.tts) best = { cutoff: c, p, tts };
  }
  return best;
}

/**
 * The cut-off minimising TTS for a whole size, from the RLDs of its instances:
 * - "pooled": all trials of all instances as one RLD (the cost of a restart strategy on a random instance);
 * - "median": the cut-off minimising the median over instances of the per-instance TTS (the statistic the
 *   scaling fits use); an instance with p = 0 at a cut-off counts as +Infinity there.
 * Candidates are the solved run lengths of any instance, capped by the smallest cap (no instance is known
 * beyond its own cap). Ties go to the smallest cut-off.
 * @returns the cut-off, and the pooled success probability or median TTS there; null when nothing was solved.
 */
export function bestCutoffForSize(
  rlds: ReadonlyArray<RunLengths>,
  mode: "pooled" | "median",
  target = TTS_TARGET,
): { cutoff: number; tts: number; p: number } | null {
  if (rlds.length === 0) return null;
  const cap = Math.min(...rlds.map((r) => r.cap));
  const candidates = solvedLengths(rlds).filter((c) => c <= cap);
  let best: { cutoff: number; tts: number; p: number } | null = null;
  for (const c of candidates) {
    let tts: number;
    let p: number;
    if (mode === "pooled") {
      let hits = 0;
      let trials = 0;
      for (const r of rlds) {
        trials += r.flips.length;
        for (let t = 0; t < r.flips.length; t++) if (r.solved[t] === 1 && r.flips[t] <= c) hits++;
      }
      p = trials === 0 ? 0 : hits / trials;
      tts = Math.max(c, 1) * ttsTrials(p, target);
    } else {
      const each = rlds.map((r) => ttsAt(r, c, target)).sort((a, b) => a - b);
      const h = each.length;
      tts = h % 2 === 1 ? each[(h - 1) / 2] : (each[h / 2 - 1] + each[h / 2]) / 2;
      p = NaN;
    }
    if (!Number.isFinite(tts)) continue;
    if (best === null || tts < best.tts) best = { cutoff: c, tts, p };
  }
  return best;
}

/** Median flips to solution, censored trials counted at +Infinity (so the median exists while ≥ half are solved). */
export function medianFlips(rld: RunLengths): number {
  const n = rld.flips.length;
  if (n === 0) return NaN;
  const v = Array.from(rld.flips, (f, t) => (rld.solved[t] === 1 ? f : Infinity)).sort((a, b) => a - b);
  return n % 2 === 1 ? v[(n - 1) / 2] : (v[n / 2 - 1] + v[n / 2]) / 2;
}

/**
 * The RLD of a cell from its per-trial steps to solution as solvers report them (TrialsOutcome.stepsToSolution,
 * solvers/types.ts: −1 for a trial not solved within `cap`).
 */
export function runLengthsFromSteps(steps: ReadonlyArray<number>, cap: number): RunLengths {
  const flips = new Float64Array(steps.length);
  const solved = new Uint8Array(steps.length);
  for (let t = 0; t < steps.length; t++) {
    solved[t] = steps[t] >= 0 ? 1 : 0;
    flips[t] = steps[t] >= 0 ? steps[t] : cap;
  }
  return { flips, solved, cap };
}

/** Concatenates RLDs (for trials split over calls); the cap is the smallest. */
export function concatRunLengths(parts: ReadonlyArray<RunLengths>): RunLengths {
  const total = parts.reduce((s, r) => s + r.flips.length, 0);
  const flips = new Float64Array(total);
  const solved = new Uint8Array(total);
  let at = 0;
  for (const r of parts) {
    flips.set(r.flips, at);
    solved.set(r.solved, at);
    at += r.flips.length;
  }
  return { flips, solved, cap: parts.length === 0 ? 0 : Math.min(...parts.map((r) => r.cap)) };
}

function solvedLengths(rlds: ReadonlyArray<RunLengths>): number[] {
  const set = new Set<number>();
  for (const r of rlds) for (let t = 0; t < r.flips.length; t++) if (r.solved[t] === 1) set.add(r.flips[t]);
  return [...set].sort((a, b) => a - b);
}

function checkCutoff(rld: RunLengths, cutoff: number): void {
  if (!(cutoff >= 0) || cutoff > rld.cap) throw new RangeError(`cut-off must lie in [0, ${rld.cap}] (the cap), got ${cutoff}`);
}
