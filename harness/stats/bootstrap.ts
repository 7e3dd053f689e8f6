/**
 * Seeded percentile bootstrap over instances (Efron & Tibshirani, "An Introduction to the Bootstrap", 1993, ch. 13).
 *
 * A resample draws N instances with replacement from the N observed ones with the project's {@link Rng}
 * (xoshiro128**, unbiased bounded integers), so the same seed gives the same interval on every machine. The
 * interval is the type-7 quantile of the replicates at (1 − level)/2 and (1 + level)/2 (quantiles.ts).
 */
import { Rng, deriveSeed } from "../random.js";
import { quantileOfSorted } from "./quantiles.js";

/** Default number of bootstrap resamples (the `--resamples` default). */
export const DEFAULT_RESAMPLES = 2000;
/** Default bootstrap seed; consumers derive one seed per statistic from it with {@link deriveSeed}. */
export const DEFAULT_BOOTSTRAP_SEED = "speedbound-bootstrap";
/** Default confidence level of bootstrap intervals. */
export const DEFAULT_LEVEL = 0.95;

/** A percentile-bootstrap result. */
export interface BootstrapResult {
  /** The statistic on the observed sample. */
  readonly estimate: number;
  /** Lower and upper interval ends (type-7 quantiles of the valid replicates); NaN when no replicate was valid. */
  readonly low: number;
  readonly high: number;
  /** Confidence level of [low, high]. */
  readonly level: number;
  /** Resamples drawn. */
  readonly resamples: number;
  /** Replicates that were NaN (excluded from the interval). */
  readonly invalid: number;
  /** The seed used (as given). */
  readonly seed: string;
}

/**
 * Draws bootstrap replicates of a statistic.
 * @param values - the observed sample (instances).
 * @param statistic - computed on each resample. It receives a buffer reused between calls: read it, do not keep it.
 * @param resamples - number of resamples; default {@link DEFAULT_RESAMPLES}.
 * @param seed - seed string; default {@link DEFAULT_BOOTSTRAP_SEED}.
 * @returns the replicates in draw order.
 */
export function bootstrapReplicates<T>(
  values: ReadonlyArray<T>,
  statistic: (sample: ReadonlyArray<T>) => number,
  resamples: number = DEFAULT_RESAMPLES,
  seed: string = DEFAULT_BOOTSTRAP_SEED,
): Float64Array {
  const count = values.length;
  const out = new Float64Array(resamples);
  if (count === 0) return out.fill(NaN);
  const rng = new Rng(seedFor(seed));
  const buffer: T[] = values.slice();
  for (let r = 0; r < resamples; r++) {
    for (let i = 0; i < count; i++) buffer[i] = values[rng.below(count)]!;
    out[r] = statistic(buffer);
  }
  return out;
}

/**
 * Percentile bootstrap interval of a statistic over instances.
 * @param values - the observed sample (instances).
 * @param statistic - the statistic; may return ±∞ (kept) or NaN (counted as invalid and excluded).
 * @param resamples - default {@link DEFAULT_RESAMPLES} (2000).
 * @param seed - default {@link DEFAULT_BOOTSTRAP_SEED}.
 * @param level - confidence level, default 0.95.
 */
export function bootstrap<T>(
  values: ReadonlyArray<T>,
  statistic: (sample: ReadonlyArray<T>) => number,
  resamples: number = DEFAULT_RESAMPLES,
  seed: string = DEFAULT_BOOTSTRAP_SEED,
  level: number = DEFAULT_LEVEL,
): BootstrapResult {
  const estimate = values.length > 0 ? statistic(values) : NaN;
  const replicates = bootstrapReplicates(values, statistic, resamples, seed);
  const { low, high, invalid } = percentileInterval(replicates, level);
  return { estimate, low, high, level, resamples, invalid, seed };
}

/**
 * Percentile interval of replicates: type-7 quantiles at (1 − level)/2 and (1 + level)/2 of the non-NaN ones.
 * @returns NaN ends when every replicate is NaN; `invalid` counts the NaN replicates.
 */
export function percentileInterval(
  replicates: ArrayLike<number>,
  level: number = DEFAULT_LEVEL,
): { low: number; high: number; invalid: number } {
  const valid = Float64Array.from(replicates).filter((x) => !Number.isNaN(x));
  const invalid = replicates.length - valid.length;
  if (valid.length === 0) return { low: NaN, high: NaN, invalid };
  valid.sort();
  const alpha = (1 - level) / 2;
  return { low: quantileOfSorted(valid, alpha), high: quantileOfSorted(valid, 1 - alpha), invalid };
}

/** The generator seed for a bootstrap seed string: 32-hex seeds are used as they are, anything else is hashed. */
export function seedFor(seed: string): string {
  return /^[0-9a-f]{32}$/.test(seed) ? seed : deriveSeed("bootstrap", seed);
}
