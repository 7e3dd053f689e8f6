/**
 * The fixed-cost floor rule (issue 13): a measured time says nothing about scaling while it is dominated by the
 * solver's fixed per-cell cost (set-up, call overhead), which is flat in n. Each cell records that cost as
 * `floor_ns`: the same call with zero-length work (no trials; one configuration for exhaustive search), timed
 * warm right after the real call.
 *
 * Rule: a size enters a time fit only when the median over instances of the cell's wall time is at least
 * `factor` × the median floor of that size's cells (default factor 10, `--floor-factor`). The cell's own wall
 * time is tested, not a per-trial TTS derived from it: a cell of many trials whose total is far above its floor
 * gives a per-trial time that is set-up free even when each trial is short. With fewer than
 * {@link MIN_SIZES_ABOVE_FLOOR} sizes left the time fit (and every verdict on time) is withheld.
 */

/** Default factor between a size's median wall time and its fixed-cost floor. */
export const DEFAULT_FLOOR_FACTOR = 10;

/** Sizes a time fit needs above the floor. */
export const MIN_SIZES_ABOVE_FLOOR = 3;

/** One size of one solver: the median cell wall time and the median floor over its instances (ns). */
export interface FloorPoint {
  readonly n: number;
  /** Median over instances of the cell wall time, ns; null when undefined (censored). */
  readonly medianWall: number | null;
  /** Median over instances of floor_ns; null when not measured. */
  readonly floor: number | null;
}

/** What the rule kept and why. */
export interface FloorDecision {
  /** Sizes whose median wall time is at least factor × floor (or whose floor is unknown: see `unmeasured`). */
  readonly kept: number[];
  /** Sizes below the floor, with their numbers. */
  readonly excluded: Array<{ n: number; medianWall: number | null; floor: number }>;
  /** Sizes with no floor measurement (older journals): kept, and named. */
  readonly unmeasured: number[];
  /** True when fewer than {@link MIN_SIZES_ABOVE_FLOOR} sizes are kept. */
  readonly tooFew: boolean;
  /**
   * Smallest n from which sizes would pass, from a least-squares line of log₂(median/floor) over the measured
   * sizes (an extrapolation; null when that ratio does not grow with n or there are fewer than 2 points).
   */
  readonly neededFrom: number | null;
  /** Empty, or the sentence for the row. */
  readonly flag: string;
}

/** The rule in one sentence, for manifests, captions and the study page. */
export function floorRule(factor: number): string {
  return (
    `time fits use only sizes whose median cell wall time is at least ${factor} x the solver's fixed per-cell cost ` +
    `(a zero-length run timed per cell, median over instances); with fewer than ${MIN_SIZES_ABOVE_FLOOR} such sizes there is no time verdict`
  );
}

/**
 * Applies the floor rule to one solver's sizes.
 * @param points - one entry per size, any order.
 * @param factor - required ratio of median wall time to floor (> 0).
 */
export function applyFloor(points: ReadonlyArray<FloorPoint>, factor: number = DEFAULT_FLOOR_FACTOR): FloorDecision {
  if (!(factor > 0) || !Number.isFinite(factor)) throw new RangeError(`floor factor must be a finite number > 0, got ${factor}`);
  const sorted = [...points].sort((a, b) => a.n - b.n);
  const kept: number[] = [];
  const excluded: FloorDecision["excluded"] = [];
  const unmeasured: number[] = [];
  const ratios: Array<[number, number]> = [];
  for (const p of sorted) {
    if (p.floor === null || !(p.floor > 0)) {
      unmeasured.push(p.n);
      kept.push(p.n);
      continue;
    }
    // An undefined (censored) median is at least its bound, which is already far above any set-up cost.
    const pass = p.medianWall === null || p.medianWall >= factor * p.floor;
    if (p.medianWall !== null && p.medianWall > 0) ratios.push([p.n, Math.log2(p.medianWall / p.floor)]);
    if (pass) kept.push(p.n);
    else excluded.push({ n: p.n, medianWall: p.medianWall, floor: p.floor });
  }
  const tooFew = kept.length < MIN_SIZES_ABOVE_FLOOR;
  const neededFrom = tooFew ? extrapolateNeeded(ratios, Math.log2(factor)) : null;
  const flags: string[] = [];
  if (tooFew) {
    flags.push(
      `not enough sizes above the fixed-cost floor (${neededFrom === null ? "n beyond the measured range needed: time barely grows above the floor" : `n >= ${neededFrom} needed`}, ` +
        `${kept.length} of ${MIN_SIZES_ABOVE_FLOOR} sizes at ${factor} x floor)`,
    );
  } else if (excluded.length > 0) {
    flags.push(`below ${factor} x the fixed-cost floor, left out: n = ${excluded.map((e) => e.n).join(", ")}`);
  }
  if (unmeasured.length > 0) flags.push(`fixed-cost floor not measured at n = ${unmeasured.join(", ")}`);
  return { kept, excluded, unmeasured, tooFew, neededFrom, flag: flags.join("; ") };
}

/**
 * The smallest n at which the median wall time reaches factor × floor: where the least-squares line through
 * (n, log₂ median/floor) reaches log₂ factor, rounded up; null when that ratio does not grow with n (then no
 * size would do) or fewer than 2 sizes have both numbers. A single noisy size above the floor (a cold first
 * cell) does not count: the trend decides.
 */
function extrapolateNeeded(ratios: ReadonlyArray<readonly [number, number]>, target: number): number | null {
  if (ratios.length < 2) return null;
  const m = ratios.length;
  const mx = ratios.reduce((s, r) => s + r[0], 0) / m;
  const my = ratios.reduce((s, r) => s + r[1], 0) / m;
  let sxy = 0;
  let sxx = 0;
  for (const [x, y] of ratios) {
    sxy += (x - mx) * (y - my);
    sxx += (x - mx) ** 2;
  }
  const slope = sxx > 0 ? sxy / sxx : 0;
  // Less than a doubling of the ratio over 100 sizes: "growth" indistinguishable from none.
  if (!(slope > 0.01)) return null;
  return Math.ceil(mx + (target - my) / slope);
}
