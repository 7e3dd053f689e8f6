/**
 * The optimal run length from run-length distributions (issue 13 item 4): a randomised solver whose run rows carry
 * per-trial steps to solution (`steps_to_solution`, −1 = not solved within the cap) is not limited to the one run
 * length it ran at. Per instance its TTS at any cut-off c ≤ cap follows without rerunning:
 * TTS_0.99(c) = max(c, 1) · ln(0.01)/ln(1 − p(c)) flips, p(c) the fraction of trials solved within c flips
 * (Rønnow et al., "Defining and detecting quantum speedup", Science 345, 420 (2014); stats/run-length.ts), and in
 * ns by scaling with that cell's measured ns per flip (cpu_ns / work). The report scans a fine geometric grid of
 * cut-offs from 1 flip to the cap, {@link RLD_GRID_PER_DECADE} points per decade (rounded to whole flips,
 * duplicates dropped, the cap itself the last point), and chooses per size the cut-off whose median over instances
 * of the TTS in flips is smallest (ties: the shorter cut-off): the annealer's rule, from work. The run-length edge
 * rule then sees that grid: an optimum at the cap (or at 1 flip) is an edge and makes the exponent a bound.
 *
 * Pure: no files, no console.
 */
import { runLengthsFromSteps, ttsAt } from "../stats/run-length.js";
import type { RunLengths } from "../stats/run-length.js";
import type { RunLengthPoint } from "../stats/run-length-edge.js";

/** Cut-offs per decade of the fine grid. */
export const RLD_GRID_PER_DECADE = 24;

/** One instance's distribution at a cell and the cell's measured cost per flip. */
export interface InstanceDistribution {
  readonly rld: RunLengths;
  /** cpu_ns / work of the cell (NaN when work is 0). */
  readonly nsPerFlip: number;
}

/**
 * Cut-offs 1 … cap on a geometric grid: round(10^(k/perDecade)) for k = 0, 1, … while below the cap, then the cap.
 * @param cap - the trials' cap (flips), at least 1.
 */
export function fineCutoffGrid(cap: number, perDecade = RLD_GRID_PER_DECADE): number[] {
  if (!(cap >= 1)) throw new RangeError(`cap must be at least 1 flip, got ${cap}`);
  const out: number[] = [];
  for (let k = 0; ; k++) {
    const c = Math.round(10 ** (k / perDecade));
    if (c >= cap) break;
    if (out.length === 0 || c > out[out.length - 1]!) out.push(c);
  }
  out.push(cap);
  return out;
}

/** Median of values where +Infinity stands for "unbounded" (p = 0); null when the median is unbounded. */
function medianOrNull(values: number[]): number | null {
  const v = [...values].sort((a, b) => a - b);
  const h = v.length;
  if (h === 0) return null;
  const m = h % 2 === 1 ? v[(h - 1) / 2]! : (v[h / 2 - 1]! + v[h / 2]!) / 2;
  return Number.isFinite(m) ? m : null;
}

/** The outcome for one size. */
export interface GridChoice {
  /** The chosen cut-off (flips), or null when no cut-off has a finite median TTS. */
  readonly cutoff: number | null;
  /** Every grid point with its median TTS in flips (null when unbounded), for the edge rule. */
  readonly points: RunLengthPoint[];
  /** Per instance at the chosen cut-off: TTS in flips and ns; `censored` when p = 0 there (value: the lower bound max(c, 1) flips). */
  readonly atChoice: Map<number, { work: number; ns: number; censored: boolean }>;
}

/**
 * Scans the fine grid of one size.
 * @param instances - per instance its distribution (all at one cap).
 */
export function chooseCutoffOnGrid(instances: ReadonlyMap<number, InstanceDistribution>, perDecade = RLD_GRID_PER_DECADE): GridChoice {
  const list = [...instances.entries()].sort((a, b) => a[0] - b[0]);
  const cap = Math.min(...list.map(([, d]) => d.rld.cap));
  const grid = fineCutoffGrid(cap, perDecade);
  const points: RunLengthPoint[] = [];
  let best: { cutoff: number; tts: number } | null = null;
  for (const c of grid) {
    const med = medianOrNull(list.map(([, d]) => ttsAt(d.rld, c)));
    points.push({ runLength: c, tts: med });
    if (med !== null && (best === null || med < best.tts)) best = { cutoff: c, tts: med };
  }
  const atChoice = new Map<number, { work: number; ns: number; censored: boolean }>();
  if (best !== null) {
    for (const [i, d] of list) {
      const t = ttsAt(d.rld, best.cutoff);
      const censored = !Number.isFinite(t);
      const work = censored ? Math.max(best.cutoff, 1) : t;
      atChoice.set(i, { work, ns: work * d.nsPerFlip, censored });
    }
  }
  return { cutoff: best?.cutoff ?? null, points, atChoice };
}

/** The distribution of a run row, or null when it carries none. */
export function distributionOfRow(row: {
  readonly run_length: number | null;
  readonly cpu_ns: number;
  readonly work: number;
  readonly steps_to_solution?: ReadonlyArray<number>;
}): InstanceDistribution | null {
  const steps = row.steps_to_solution;
  if (!Array.isArray(steps) || steps.length === 0 || row.run_length === null || !(row.run_length >= 1)) return null;
  return { rld: runLengthsFromSteps(steps, row.run_length), nsPerFlip: row.work > 0 ? row.cpu_ns / row.work : NaN };
}
