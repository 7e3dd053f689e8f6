/**
 * Per-trial success probability and time to solution for randomised solvers.
 *
 * TTS_q = t_trial · ln(1 − q)/ln(1 − p): the expected cost of repeating independent trials of success
 * probability p until at least one succeeds with probability q (default 0.99), as defined in Rønnow et al.,
 * "Defining and detecting quantum speedup", Science 345 (2014) 420. Its interval is carried over from
 * Wilson's score interval of p (E. B. Wilson, "Probable inference, the law of succession, and statistical
 * inference", J. Am. Stat. Assoc. 22 (1927) 209): since TTS falls as p rises, TTS(p_high) is the low end and
 * TTS(p_low) the high end.
 */

/** Two-sided 95% normal quantile Φ⁻¹(0.975). */
export const Z95 = 1.959964;

/** Default success target of the time to solution. */
export const TTS_TARGET = 0.99;

/**
 * Wilson score interval for a binomial proportion: the p with |p̂ − p| ≤ z·√(p(1−p)/N), i.e.
 * (p̂ + z²/2N ± z·√(p̂(1−p̂)/N + z²/4N²)) / (1 + z²/N).
 * @param successes - integer in [0, trials].
 * @param trials - integer ≥ 0; with 0 trials nothing is known: p = NaN, interval [0, 1].
 * @param z - normal quantile, default {@link Z95} (two-sided 95%; 1.644854 gives a one-sided 95% bound).
 * @returns p = p̂ = successes/trials and the interval, clamped to [0, 1].
 */
export function wilsonInterval(successes: number, trials: number, z = Z95): { low: number; high: number; p: number } {
  checkCounts(successes, trials);
  if (!(z >= 0) || !Number.isFinite(z)) throw new RangeError(`z must be finite and ≥ 0, got ${z}`);
  if (trials === 0) return { low: 0, high: 1, p: NaN };
  const p = successes / trials;
  const z2n = (z * z) / trials;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z * Math.sqrt((p * (1 - p)) / trials + z2n / (4 * trials))) / (1 + z2n);
  // At the ends the closed form gives exactly 0 or 1 up to rounding; pin them.
  const low = successes === 0 ? 0 : Math.max(0, centre - half);
  const high = successes === trials ? 1 : Math.min(1, centre + half);
  return { low, high, p };
}

/**
 * Trials needed to succeed at least once with probability `target`: ln(1 − target)/ln(1 − p), a real number
 * (not rounded up). p ≥ target → 1 (one trial already suffices); p = 0 → +Infinity.
 * @param p - per-trial success probability in [0, 1].
 * @param target - in (0, 1), default {@link TTS_TARGET}.
 */
export function ttsTrials(p: number, target = TTS_TARGET): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`p must be in [0, 1], got ${p}`);
  if (!(target > 0 && target < 1)) throw new RangeError(`target must be in (0, 1), got ${target}`);
  if (p >= target) return 1;
  if (p === 0) return Infinity;
  // log1p keeps small p accurate (ln(1 − p) ≈ −p loses digits when formed as Math.log(1 − p)).
  return Math.log1p(-target) / Math.log1p(-p);
}

/**
 * Time to solution with its interval, in the unit of `costPerTrial` (ns, flips, sweeps…).
 *
 * Missing values are `null` (never Infinity or NaN, so they serialise as empty CSV cells and JSON null):
 * - successes = 0: p = 0 gives no point estimate: `tts` = null, `tts_high` = null (unbounded), and
 *   `tts_low` = cost × ttsTrials(p_high) is a lower bound; `lower_bound_only` = true.
 * - trials = 0: p = null, p_low = 0, p_high = 1, `tts_low` = cost × 1, the rest null; `lower_bound_only` = true.
 * - p ≥ target: one trial, `tts` = cost.
 */
export interface TtsSummary {
  /** Measured per-trial success probability successes/trials (null without trials). */
  readonly p: number | null;
  /** Wilson 95% interval of p. */
  readonly p_low: number;
  readonly p_high: number;
  /** TTS at the measured p; null when p = 0 or there are no trials. */
  readonly tts: number | null;
  /** TTS at p_high (the low end of the interval). */
  readonly tts_low: number | null;
  /** TTS at p_low (the high end); null when p_low = 0 (unbounded). */
  readonly tts_high: number | null;
  /** True when no trial succeeded: only `tts_low`, a lower bound, is known. */
  readonly lower_bound_only: boolean;
}

/**
 * Time to solution from success counts.
 * @param successes - successful trials, integer in [0, trials].
 * @param trials - finished trials, integer ≥ 0.
 * @param costPerTrial - mean cost of one trial (ns, or elementary steps), finite, ≥ 0.
 * @param target - success target, default {@link TTS_TARGET}.
 */
export function ttsFromCounts(successes: number, trials: number, costPerTrial: number, target = TTS_TARGET): TtsSummary {
  if (!(costPerTrial >= 0) || !Number.isFinite(costPerTrial)) {
    throw new RangeError(`costPerTrial must be finite and ≥ 0, got ${costPerTrial}`);
  }
  const w = wilsonInterval(successes, trials);
  const scaled = (p: number): number | null => {
    const r = ttsTrials(p, target);
    return Number.isFinite(r) ? costPerTrial * r : null;
  };
  return {
    p: trials === 0 ? null : w.p,
    p_low: w.low,
    p_high: w.high,
    tts: trials === 0 ? null : scaled(w.p),
    tts_low: scaled(w.high),
    tts_high: scaled(w.low),
    lower_bound_only: successes === 0,
  };
}

function checkCounts(successes: number, trials: number): void {
  if (!Number.isSafeInteger(trials) || trials < 0) throw new RangeError(`trials must be an integer ≥ 0, got ${trials}`);
  if (!Number.isSafeInteger(successes) || successes < 0 || successes > trials) {
    throw new RangeError(`successes must be an integer in [0, ${trials}], got ${successes}`);
  }
}
