/**
 * Quantile helpers over instances, on top of simple-statistics.
 *
 * Definition used everywhere in speedbound: Hyndman & Fan type 7 ("Sample quantiles in statistical packages",
 * The American Statistician 50 (1996) 361–365), the default of R's `quantile` and numpy's `percentile`: for sorted
 * values x_0 ≤ … ≤ x_{N−1} and h = (N − 1)·q, Q(q) = x_⌊h⌋ + (h − ⌊h⌋)·(x_⌈h⌉ − x_⌊h⌋). It is what
 * simple-statistics' `quantileSorted` computes. The only addition here is a defined answer when the order
 * statistics it needs are +∞ (censored values placed at +∞, see censoring.ts).
 */
import { quantileSorted } from "simple-statistics";

/** Human-readable statement of the quantile definition, for manifests and README files. */
export const QUANTILE_DEFINITION =
  "Hyndman-Fan type 7: h = (N-1)q, linear interpolation between the order statistics floor(h) and ceil(h) (R and numpy default)";

/** The quantiles reported for every size (median, 75 %, 90 %), as fractions. */
export const REPORTED_QUANTILES = [0.5, 0.75, 0.9] as const;

/**
 * 0-based indices of the order statistics the type-7 q-quantile of N values reads.
 * @returns [lo, hi] with lo = ⌊(N−1)q⌋ and hi = ⌈(N−1)q⌉ (equal when (N−1)q is an integer or q ∈ {0, 1}).
 */
export function quantileIndices(count: number, q: number): [number, number] {
  if (q <= 0) return [0, 0];
  if (q >= 1) return [count - 1, count - 1];
  const h = (count - 1) * q;
  const lo = Math.floor(h);
  return [lo, h === lo ? lo : lo + 1];
}

/**
 * Type-7 quantile of values already sorted ascending; +∞ entries allowed.
 * Returns +∞ when an order statistic the quantile needs is +∞ (simple-statistics would give NaN for ∞ − ∞).
 * @param sorted - ascending values (a plain array or a typed array), at least one.
 * @param q - fraction in [0, 1].
 */
export function quantileOfSorted(sorted: ArrayLike<number>, q: number): number {
  const [lo, hi] = quantileIndices(sorted.length, q);
  if (sorted[lo] === Infinity || sorted[hi] === Infinity) return Infinity;
  return quantileSorted(sorted as number[], q);
}

/**
 * Type-7 quantile of unsorted values (sorts a copy).
 * @param values - at least one finite or +∞ value.
 * @param q - fraction in [0, 1].
 */
export function quantileOf(values: ArrayLike<number>, q: number): number {
  return quantileOfSorted(sortedCopy(values), q);
}

/** Several type-7 quantiles of unsorted values with one sort. */
export function quantilesOf(values: ArrayLike<number>, qs: ReadonlyArray<number>): number[] {
  const sorted = sortedCopy(values);
  return qs.map((q) => quantileOfSorted(sorted, q));
}

/** Ascending copy as a Float64Array (numeric sort; +∞ last). */
export function sortedCopy(values: ArrayLike<number>): Float64Array {
  const out = Float64Array.from(values as ArrayLike<number>);
  out.sort();
  return out;
}

/** Column-name stem of a reported quantile: 0.5 → "median", 0.75 → "q75", 0.9 → "q90". */
export function quantileName(q: number): string {
  if (q === 0.5) return "median";
  return `q${Math.round(q * 100)}`;
}
