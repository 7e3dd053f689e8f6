/**
 * sizes.csv: per family, size, method, run length and cost measure, the median, 75 % and 90 % quantiles over
 * instances with percentile-bootstrap intervals (censoring rule of stats/censoring.ts). Bootstrap seeds:
 * deriveSeed(seed, "sizes", family, method kind, method, run length, measure, n) with the seed option (default
 * "speedbound-bootstrap"), so an interval does not depend on what else is in the report.
 */
import type { PredictionRow, RunRow } from "../types.js";
import { deriveSeed } from "../random.js";
import { DEFAULT_BOOTSTRAP_SEED, DEFAULT_LEVEL, DEFAULT_RESAMPLES } from "../stats/bootstrap.js";
import { bootstrapCensoredQuantiles, censoredQuantile } from "../stats/censoring.js";
import { REPORTED_QUANTILES } from "../stats/quantiles.js";
import {
  FINE_GRID_RULE, PREDICTION_MEASURES, RUN_MEASURES, cellKey, collect, optimalRunLengths, sampleOf, sep, seriesKey,
  type Measure, type MethodKind, type SummaryOptions,
} from "./observations.js";

/** One row of sizes.csv. */
export interface SizeRow {
  family: string;
  n: number;
  method_kind: MethodKind;
  method: string;
  run_length: number | null;
  /** True for the run length the fits use at this size (always true for a single run length). */
  optimal_run_length: boolean;
  measure: Measure;
  /** Instances with a value (censored included), censored instances, error rows left out. */
  instances: number;
  censored: number;
  errors: number;
  median: number | null;
  median_low: number | null;
  median_high: number | null;
  q75: number | null;
  q75_low: number | null;
  q75_high: number | null;
  q90: number | null;
  q90_low: number | null;
  q90_high: number | null;
  /** When the median is undefined by censoring: the smallest value it can have (drawn as an open marker). */
  median_at_least: number | null;
  /** Median over instances of the cell's fixed cost floor_ns (solvers), empty when not measured. */
  floor_ns: number | null;
  resamples: number;
  /** Empty, or what the reader must know (censored quantiles, missing values, no instances). */
  flag: string;
}

/** Column order of sizes.csv. */
export const SIZE_COLUMNS: ReadonlyArray<keyof SizeRow> = [
  "family", "n", "method_kind", "method", "run_length", "optimal_run_length", "measure", "instances", "censored",
  "errors", "median", "median_low", "median_high", "q75", "q75_low", "q75_high", "q90", "q90_low", "q90_high",
  "median_at_least", "floor_ns", "resamples", "flag",
];



/**
 * Per family, size, method, run length and cost measure: instances, censored, errors, and the median, 75 % and
 * 90 % quantiles over instances with percentile-bootstrap 95 % intervals (see the module comment).
 * @param runs - runs.csv rows.
 * @param predictions - predictions.csv rows.
 * @returns rows sorted by family, method kind, method, measure, run length, n.
 */
export function summariseSizes(
  runs: ReadonlyArray<RunRow>,
  predictions: ReadonlyArray<PredictionRow>,
  options: SummaryOptions = {},
): SizeRow[] {
  const resamples = options.resamples ?? DEFAULT_RESAMPLES;
  const seed = options.seed ?? DEFAULT_BOOTSTRAP_SEED;
  const level = options.level ?? DEFAULT_LEVEL;
  const c = collect(runs, predictions);
  const { optimal, flags: optimalFlags, derived, superseded } = optimalRunLengths(c, options.runLengthMeasure ?? "tts_ns");
  const rows: SizeRow[] = [];
  const emitted = new Set<string>();
  for (const g of [...c.groups.values(), ...derived]) {
    const ck = cellKey(g.family, g.kind, g.method, g.runLength, g.n);
    const isDerived = g.derivedFrom !== undefined;
    // A cell whose TTS is replaced by the fine-grid one: its own TTS rows are not the ones fitted.
    const isOptimal = isDerived || (optimal.has(ck) && !(superseded.has(ck) && (g.measure === "tts_work" || g.measure === "tts_ns")));
    if (!isDerived) emitted.add(ck);
    const s = sampleOf(g);
    const qs = bootstrapCensoredQuantiles(s.values, s.censored, REPORTED_QUANTILES, {
      resamples,
      level,
      seed: deriveSeed(seed, "sizes", g.family, g.kind, g.method, g.runLength ?? "", g.measure, g.n),
    });
    const flags: string[] = [];
    if (g.obs.size === 0) flags.push("no instances");
    else for (const q of qs) if (q.flag !== "") flags.push(q.flag);
    if (g.missing.size > 0) flags.push(`${g.missing.size} rows without ${g.measure}`);
    const of = optimalFlags.get(ck);
    if (of !== undefined && !isDerived) flags.push(of);
    if (isDerived) flags.push(`${FINE_GRID_RULE}: TTS at cut-off ${g.runLength} of cap ${g.derivedFrom}`);
    rows.push({
      family: g.family,
      n: g.n,
      method_kind: g.kind,
      method: g.method,
      run_length: g.runLength,
      optimal_run_length: isOptimal,
      measure: g.measure,
      instances: g.obs.size,
      censored: s.censored.filter(Boolean).length,
      errors: isDerived ? 0 : c.errors.get(ck)?.size ?? 0,
      median: qs[0]!.value,
      median_low: qs[0]!.low,
      median_high: qs[0]!.high,
      q75: qs[1]!.value,
      q75_low: qs[1]!.low,
      q75_high: qs[1]!.high,
      q90: qs[2]!.value,
      q90_low: qs[2]!.low,
      q90_high: qs[2]!.high,
      median_at_least: qs[0]!.value === null && qs[0]!.lower > 0 && Number.isFinite(qs[0]!.lower) ? qs[0]!.lower : null,
      floor_ns: medianFloor(c.floors.get(isDerived ? cellKey(g.family, g.kind, g.method, g.derivedFrom!, g.n) : ck)),
      resamples,
      flag: flags.join("; "),
    });
  }
  // Cells where every row was an error still get a row per measure of their method, so the errors show.
  for (const [ck, set] of c.errors) {
    if (emitted.has(ck)) continue;
    const [family, kind, method, rl, n] = ck.split(sep) as [string, MethodKind, string, string, string];
    const ms = c.measures.get(seriesKey(family, kind, method)) ?? new Set<Measure>([kind === "solver" ? "cpu_ns" : "queries"]);
    for (const measure of ms) {
      rows.push({
        family, n: Number(n), method_kind: kind, method, run_length: rl === "" ? null : Number(rl),
        optimal_run_length: optimal.has(ck), measure, instances: 0, censored: 0, errors: set.size,
        median: null, median_low: null, median_high: null, q75: null, q75_low: null, q75_high: null,
        q90: null, q90_low: null, q90_high: null, median_at_least: null, floor_ns: null, resamples, flag: "no instances (all rows errors)",
      });
    }
  }
  const measureOrder = (m: Measure): number => [...RUN_MEASURES, ...PREDICTION_MEASURES].indexOf(m);
  return rows.sort(
    (a, b) =>
      a.family.localeCompare(b.family) ||
      (a.method_kind === b.method_kind ? 0 : a.method_kind === "solver" ? -1 : 1) ||
      a.method.localeCompare(b.method) ||
      measureOrder(a.measure) - measureOrder(b.measure) ||
      (a.run_length ?? -1) - (b.run_length ?? -1) ||
      a.n - b.n,
  );
}


/** Median over instances of a cell's floor_ns values; null when none was recorded. */
export function medianFloor(floors: ReadonlyMap<number, number> | undefined): number | null {
  if (floors === undefined || floors.size === 0) return null;
  const values = [...floors.values()];
  return censoredQuantile(values, values.map(() => false), 0.5).value;
}
