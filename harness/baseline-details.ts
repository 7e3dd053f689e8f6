/**
 * The runs.csv columns of the issue-12 baselines, computed from their results in the worker:
 * - breakwalk: a summary of its run-length distribution (solvers/run-length.ts);
 * - tempering: the exchange acceptance rate of each neighbouring pair of temperatures (the standard diagnostic of
 *   a replica ladder: a pair that never swaps cuts the ladder in two) and the ladder's ends.
 * Lists are written as `;`-separated numbers in one column, hot end first.
 */
import type { BreakwalkResult } from "../solvers/breakwalk.js";
import { bestCutoff, medianFlips } from "../solvers/run-length.js";
import type { TemperingResult } from "../solvers/tempering.js";

/** runs.csv columns of a breakwalk cell. */
export function rldDetails(r: BreakwalkResult): Record<string, number | string | null> {
  const best = bestCutoff(r.runLengths);
  const median = medianFlips(r.runLengths);
  return {
    breakwalk_rule: r.rule.rule === "poly" ? `poly cb=${r.rule.cb} eps=${r.rule.eps}` : `exp cb=${r.rule.cb}`,
    rld_median_flips: Number.isFinite(median) ? median : null,
    rld_best_cutoff: best?.cutoff ?? null,
    rld_best_p: best?.p ?? null,
    rld_best_tts_flips: best?.tts ?? null,
  };
}

/** runs.csv columns of a tempering cell. */
export function temperingDetails(r: TemperingResult): Record<string, number | string | null> {
  const rates = Array.from(r.exchangeAttempts, (a, i) => (a > 0 ? r.exchangeAccepts[i] / a : NaN));
  return {
    replicas: r.betas.length,
    exchange_acceptance: rates.map((x) => (Number.isFinite(x) ? x.toFixed(4) : "")).join(";"),
    exchange_acceptance_min: rates.length > 0 && rates.every(Number.isFinite) ? Math.min(...rates) : null,
  };
}
