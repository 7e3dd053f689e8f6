/**
 * Quantiles over instances when some cells were stopped by a budget (right-censoring: a censored value x means
 * "at least x").
 *
 * Rule. Every order statistic is monotone in the unknown true values of the censored cells, so the type-7
 * q-quantile (quantiles.ts) lies between
 *   lower = the quantile with each censored value at its bound x (the smallest it can be), and
 *   upper = the quantile with each censored value at +∞ (the largest it can be).
 * The quantile is *defined* iff lower = upper, i.e. the order statistics it reads are certain whatever the
 * censored cells would have taken. When the censored bounds lie above those order statistics (the usual case:
 * a cell is stopped at the budget, past every finished cell) this is exactly "sort with censored values at +∞
 * and require the needed order statistics to be finite": the median of N values needs fewer than N/2 censored,
 * the q-quantile needs at most N − 1 − ⌈(N − 1)q⌉ censored. Otherwise the quantile is reported as null with a
 * flag, and `lower` is still a valid lower bound.
 *
 * Bootstrap interval under censoring: the lower end is the (1 − level)/2 percentile of the resamples' `lower`
 * values, the upper end the (1 + level)/2 percentile of their `upper` values (null when that is +∞). Without
 * censoring both coincide with the ordinary percentile bootstrap (bootstrap.ts).
 */
import { Rng } from "../random.js";
import { DEFAULT_BOOTSTRAP_SEED, DEFAULT_LEVEL, DEFAULT_RESAMPLES, seedFor } from "./bootstrap.js";
import { quantileName, quantileOfSorted } from "./quantiles.js";

/** One quantile under censoring. */
export interface CensoredQuantile {
  /** The quantile when defined, else null. */
  readonly value: number | null;
  /** Smallest value consistent with the data (censored cells at their bounds). */
  readonly lower: number;
  /** Largest value consistent with the data (censored cells at +∞); may be +∞. */
  readonly upper: number;
  /** Number of values and how many of them are censored. */
  readonly count: number;
  readonly censored: number;
  /** Empty when defined; otherwise why not (e.g. "median censored: 6 of 10 censored, at least 3.1e9"). */
  readonly flag: string;
}

/** A censored quantile with its bootstrap interval. */
export interface CensoredQuantileInterval extends CensoredQuantile {
  /** Interval ends; null when undefined (point undefined, or the upper end reaches a censored +∞). */
  readonly low: number | null;
  readonly high: number | null;
}

/**
 * Precomputed sort orders of one sample (one size, one method, one measure) for fast resampling:
 * a resample is a vector of multiplicities over the N instances, so it is read in sorted order in O(N)
 * without sorting again.
 */
export class CensoredSample {
  /** Number of instances. */
  readonly count: number;
  /** Number of censored instances. */
  readonly censoredCount: number;
  private readonly values: Float64Array;
  private readonly isCensored: Uint8Array;
  /** Indices sorted by value with censored values at their bounds. */
  private readonly orderLower: Int32Array;
  /** Indices sorted by value with censored values at +∞. */
  private readonly orderUpper: Int32Array;
  private readonly counts: Int32Array;
  private readonly sortedLower: Float64Array;
  private readonly sortedUpper: Float64Array;

  /**
   * @param values - per-instance values (lower bounds for censored ones); NaN is not allowed.
   * @param censored - per-instance censoring flags, or null when nothing is censored.
   */
  constructor(values: ArrayLike<number>, censored: ArrayLike<boolean> | null) {
    const count = values.length;
    this.count = count;
    this.values = Float64Array.from(values);
    this.isCensored = new Uint8Array(count);
    let c = 0;
    for (let i = 0; i < count; i++) {
      if (Number.isNaN(this.values[i]!)) throw new RangeError("CensoredSample: NaN value");
      if (censored !== null && censored[i]) {
        this.isCensored[i] = 1;
        c++;
      }
    }
    this.censoredCount = c;
    const lowerKey = (i: number): number => this.values[i]!;
    const upperKey = (i: number): number => (this.isCensored[i] ? Infinity : this.values[i]!);
    this.orderLower = sortedIndices(count, lowerKey);
    this.orderUpper = sortedIndices(count, upperKey);
    this.counts = new Int32Array(count);
    this.sortedLower = new Float64Array(count);
    this.sortedUpper = new Float64Array(count);
  }

  /**
   * Quantiles of the observed sample.
   * @param qs - fractions in [0, 1].
   * @param lower - receives the lower value per q (length ≥ qs.length).
   * @param upper - receives the upper value per q.
   */
  estimate(qs: ReadonlyArray<number>, lower: Float64Array, upper: Float64Array): void {
    this.counts.fill(1);
    this.fromCounts(qs, lower, upper);
  }

  /**
   * Draws one bootstrap resample (N instances with replacement) and writes its quantiles.
   * @param rng - the bootstrap generator (N calls to `below`).
   */
  draw(rng: Rng, qs: ReadonlyArray<number>, lower: Float64Array, upper: Float64Array): void {
    const counts = this.counts;
    const n = this.count;
    counts.fill(0);
    for (let i = 0; i < n; i++) counts[rng.below(n)]!++;
    this.fromCounts(qs, lower, upper);
  }

  private fromCounts(qs: ReadonlyArray<number>, lower: Float64Array, upper: Float64Array): void {
    const n = this.count;
    const counts = this.counts;
    let k = 0;
    for (let j = 0; j < n; j++) {
      const i = this.orderLower[j]!;
      const v = this.values[i]!;
      for (let m = counts[i]!; m > 0; m--) this.sortedLower[k++] = v;
    }
    if (this.censoredCount === 0) {
      // Both orders coincide: the upper values are the lower ones.
      for (let t = 0; t < qs.length; t++) upper[t] = lower[t] = quantileOfSorted(this.sortedLower, qs[t]!);
      return;
    }
    k = 0;
    for (let j = 0; j < n; j++) {
      const i = this.orderUpper[j]!;
      const v = this.isCensored[i] ? Infinity : this.values[i]!;
      for (let m = counts[i]!; m > 0; m--) this.sortedUpper[k++] = v;
    }
    for (let t = 0; t < qs.length; t++) {
      lower[t] = quantileOfSorted(this.sortedLower, qs[t]!);
      upper[t] = quantileOfSorted(this.sortedUpper, qs[t]!);
    }
  }
}

/**
 * The q-quantile of a right-censored sample, or null with a flag when censoring leaves it undetermined.
 * @param values - per-instance values (for censored ones, the lower bound).
 * @param censored - per-instance flags (true = "at least the value").
 * @param q - fraction in [0, 1].
 */
export function censoredQuantile(
  values: ArrayLike<number>,
  censored: ArrayLike<boolean> | null,
  q: number,
): CensoredQuantile {
  if (values.length === 0) return { value: null, lower: NaN, upper: NaN, count: 0, censored: 0, flag: "no instances" };
  const sample = new CensoredSample(values, censored);
  const lower = new Float64Array(1);
  const upper = new Float64Array(1);
  sample.estimate([q], lower, upper);
  return describe(q, lower[0]!, upper[0]!, sample.count, sample.censoredCount);
}

/** Options of {@link bootstrapCensoredQuantiles}. */
export interface CensoredBootstrapOptions {
  /** Resamples; default 2000. */
  readonly resamples?: number;
  /** Seed string; default {@link DEFAULT_BOOTSTRAP_SEED}. */
  readonly seed?: string;
  /** Confidence level; default 0.95. */
  readonly level?: number;
}

/**
 * Several quantiles of a right-censored sample with percentile-bootstrap intervals, all from the same resamples.
 * @param values - per-instance values (lower bounds for censored ones).
 * @param censored - per-instance flags, or null.
 * @param qs - fractions in [0, 1].
 */
export function bootstrapCensoredQuantiles(
  values: ArrayLike<number>,
  censored: ArrayLike<boolean> | null,
  qs: ReadonlyArray<number>,
  options: CensoredBootstrapOptions = {},
): CensoredQuantileInterval[] {
  const resamples = options.resamples ?? DEFAULT_RESAMPLES;
  const level = options.level ?? DEFAULT_LEVEL;
  const seed = options.seed ?? DEFAULT_BOOTSTRAP_SEED;
  if (values.length === 0) {
    return qs.map(() => ({ value: null, lower: NaN, upper: NaN, count: 0, censored: 0, flag: "no instances", low: null, high: null }));
  }
  const sample = new CensoredSample(values, censored);
  const qn = qs.length;
  const lower = new Float64Array(qn);
  const upper = new Float64Array(qn);
  sample.estimate(qs, lower, upper);
  const points = qs.map((q, t) => describe(q, lower[t]!, upper[t]!, sample.count, sample.censoredCount));
  // Replicates stored column-wise per quantile.
  const repLower = new Float64Array(qn * resamples);
  const repUpper = new Float64Array(qn * resamples);
  const rng = new Rng(seedFor(seed));
  const l = new Float64Array(qn);
  const u = new Float64Array(qn);
  for (let r = 0; r < resamples; r++) {
    sample.draw(rng, qs, l, u);
    for (let t = 0; t < qn; t++) {
      repLower[t * resamples + r] = l[t]!;
      repUpper[t * resamples + r] = u[t]!;
    }
  }
  const alpha = (1 - level) / 2;
  return points.map((p, t) => {
    if (p.value === null) return { ...p, low: null, high: null };
    const lo = repLower.subarray(t * resamples, (t + 1) * resamples).sort();
    const hi = repUpper.subarray(t * resamples, (t + 1) * resamples).sort();
    const high = quantileOfSorted(hi, 1 - alpha);
    return { ...p, low: quantileOfSorted(lo, alpha), high: Number.isFinite(high) ? high : null };
  });
}

function describe(q: number, lower: number, upper: number, count: number, censored: number): CensoredQuantile {
  if (lower === upper) return { value: lower, lower, upper, count, censored, flag: "" };
  const name = quantileName(q);
  return {
    value: null,
    lower,
    upper,
    count,
    censored,
    flag: `${name} censored: ${censored} of ${count} censored, at least ${formatBound(lower)}`,
  };
}

function formatBound(x: number): string {
  return Number.isFinite(x) ? x.toPrecision(4) : String(x);
}

function sortedIndices(count: number, key: (i: number) => number): Int32Array {
  const idx = Array.from({ length: count }, (_, i) => i);
  // Ties broken by index so the order (and so the bootstrap stream's use) is deterministic.
  idx.sort((a, b) => key(a) - key(b) || a - b);
  return Int32Array.from(idx);
}
