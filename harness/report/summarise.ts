/**
 * From journal rows to the paper's numbers: per-size quantiles (sizes.csv), scaling fits (fits.csv) and the
 * classical-versus-quantum comparison (comparison.csv). Pure functions: no files, no console.
 *
 * Conventions shared by the three steps:
 * - Rows with status "error" are left out and counted (`errors`). Rows with status "censored" are lower bounds
 *   ("at least"); so is a time-to-solution of a row with no success (p = 0), whose bound is the row's value, its
 *   `*_low` column, or 0 when neither is finite. Quantiles follow the censoring rule of stats/censoring.ts.
 * - Several rows for the same (instance, method, run length): the last one counts (a resumed journal may repeat).
 * - Randomised solvers with several run lengths: at each size the run length whose median TTS (`tts_ns` by
 *   default) over instances is smallest is the size's optimal one (ties: the shorter run); fits use only those
 *   (Rønnow et al., Science 345, 420 (2014): a fixed run length distorts the apparent scaling). The choice is made
 *   on the point estimate and not re-made inside the bootstrap.
 * - Bootstrap: `resamples` (default 2000) resamples of instances; the seed of each interval is
 *   deriveSeed(seed, "sizes" | "fit", family, method kind, method, [run length,] measure, [n]) with the seed
 *   option (default "speedbound-bootstrap"), so an interval does not depend on what else is in the report.
 */
import type { PredictionRow, RunRow } from "../types.js";
import { deriveSeed } from "../random.js";
import { DEFAULT_BOOTSTRAP_SEED, DEFAULT_LEVEL, DEFAULT_RESAMPLES } from "../stats/bootstrap.js";
import { bootstrapCensoredQuantiles, censoredQuantile } from "../stats/censoring.js";
import { fitScaling as fitSeries, FIT_FROM_RULE, type SizeSample } from "../stats/fit.js";
import { findCrossover, type CrossoverStatus, DEFAULT_CROSSOVER_RANGE } from "../stats/crossover.js";
import { REPORTED_QUANTILES } from "../stats/quantiles.js";

/** Whether a row of the report describes a classical solver or a quantum predictor. */
export type MethodKind = "solver" | "predictor";

/** Cost measures of runs.csv rows, in column order. */
export const RUN_MEASURES = ["wall_ns", "work", "tts_ns", "tts_work"] as const;
/** Cost measures of predictions.csv rows. */
export const PREDICTION_MEASURES = ["queries", "steps"] as const;
/** A cost measure (a column of runs.csv or predictions.csv). */
export type Measure = (typeof RUN_MEASURES)[number] | (typeof PREDICTION_MEASURES)[number];

/** Unit of each measure, for axis titles and table headers. */
export const MEASURE_UNITS: Readonly<Record<Measure, string>> = {
  wall_ns: "wall time, ns",
  work: "elementary steps",
  tts_ns: "time to solution (99 %), ns",
  tts_work: "steps to solution (99 %)",
  queries: "oracle queries",
  steps: "classical steps inside amplified runs",
};

/** Options shared by {@link summariseSizes} and {@link fitScaling}. */
export interface SummaryOptions {
  /** Bootstrap resamples; default 2000. */
  readonly resamples?: number;
  /** Bootstrap seed string; default "speedbound-bootstrap". */
  readonly seed?: string;
  /** Confidence level of the intervals; default 0.95. */
  readonly level?: number;
  /** Measure whose median picks the per-size optimal run length; default "tts_ns". */
  readonly runLengthMeasure?: Measure;
}

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
  resamples: number;
  /** Empty, or what the reader must know (censored quantiles, missing values, no instances). */
  flag: string;
}

/** Column order of sizes.csv. */
export const SIZE_COLUMNS: ReadonlyArray<keyof SizeRow> = [
  "family", "n", "method_kind", "method", "run_length", "optimal_run_length", "measure", "instances", "censored",
  "errors", "median", "median_low", "median_high", "q75", "q75_low", "q75_high", "q90", "q90_low", "q90_high",
  "resamples", "flag",
];

/** One row of fits.csv. */
export interface FitRow {
  family: string;
  method_kind: MethodKind;
  method: string;
  measure: Measure;
  /** Quantile over instances that was fitted (0.5 = median). */
  quantile: number;
  /** a in cost ≈ 2^(a·n + c), bits per variable, with its bootstrap interval. */
  exponent: number | null;
  exponent_low: number | null;
  exponent_high: number | null;
  /** λ = 2^a and its interval. */
  base: number | null;
  base_low: number | null;
  base_high: number | null;
  /** c (log₂ of the measure's unit). */
  intercept: number | null;
  r2: number | null;
  n_from: number | null;
  n_to: number | null;
  points: number;
  /** How the run length was chosen per size ("" for a single run length). */
  run_length_rule: string;
  resamples: number;
  flag: string;
}

/** Column order of fits.csv. */
export const FIT_COLUMNS: ReadonlyArray<keyof FitRow> = [
  "family", "method_kind", "method", "measure", "quantile", "exponent", "exponent_low", "exponent_high", "base",
  "base_low", "base_high", "intercept", "r2", "n_from", "n_to", "points", "run_length_rule", "resamples", "flag",
];

/** Options of {@link fitScaling}. */
export interface FitScalingOptions extends SummaryOptions {
  /** Smallest n in the fits (`--fit-from`); default: the rule of stats/fit.ts ({@link FIT_FROM_RULE}). */
  readonly fitFrom?: number | null;
  /** Largest n in the fits; default all. */
  readonly fitTo?: number | null;
  /** Quantiles to fit; default 0.5, 0.75, 0.9. */
  readonly quantiles?: ReadonlyArray<number>;
}

// ---------------------------------------------------------------------------------------------------------
// Collecting observations

interface Observation {
  value: number;
  censored: boolean;
}

interface Group {
  family: string;
  kind: MethodKind;
  method: string;
  runLength: number | null;
  n: number;
  measure: Measure;
  obs: Map<number, Observation>;
  missing: Set<number>;
}

interface Collected {
  groups: Map<string, Group>;
  /** Error rows per (family, kind, method, run length, n). */
  errors: Map<string, Set<number>>;
  /** Measures seen per (family, kind, method). */
  measures: Map<string, Set<Measure>>;
}

const sep = "\u0000";
const cellKey = (family: string, kind: MethodKind, method: string, runLength: number | null, n: number): string =>
  [family, kind, method, runLength ?? "", n].join(sep);
const seriesKey = (family: string, kind: MethodKind, method: string): string => [family, kind, method].join(sep);

function lowColumn(measure: Measure): string | null {
  return measure === "tts_ns" ? "tts_ns_low" : measure === "tts_work" ? "tts_work_low" : measure === "queries" ? "queries_low" : null;
}

function collect(runs: ReadonlyArray<RunRow>, predictions: ReadonlyArray<PredictionRow>): Collected {
  const groups = new Map<string, Group>();
  const errors = new Map<string, Set<number>>();
  const measures = new Map<string, Set<Measure>>();
  const add = (
    family: string,
    kind: MethodKind,
    method: string,
    runLength: number | null,
    n: number,
    instance: number,
    measure: Measure,
    row: Readonly<Record<string, unknown>>,
    rowCensored: boolean,
  ): void => {
    const key = cellKey(family, kind, method, runLength, n) + sep + measure;
    const raw = row[measure];
    let value = typeof raw === "number" ? raw : NaN;
    let censored = rowCensored;
    // A TTS from a row without success is a lower bound (p = 0 gives an infinite or bound-only TTS).
    if ((measure === "tts_ns" || measure === "tts_work") && (row["successes"] === 0 || row["p"] === 0)) censored = true;
    if (!Number.isFinite(value) && (censored || value === Infinity)) {
      censored = true;
      const lowName = lowColumn(measure);
      const low = lowName === null ? NaN : row[lowName];
      value = typeof low === "number" && Number.isFinite(low) ? low : 0;
    } else if (!Number.isFinite(value)) {
      value = NaN;
    }
    let group = groups.get(key);
    if (group === undefined) {
      group = { family, kind, method, runLength, n, measure, obs: new Map(), missing: new Set() };
      groups.set(key, group);
    }
    if (Number.isNaN(value)) {
      group.obs.delete(instance);
      group.missing.add(instance);
      return;
    }
    group.missing.delete(instance);
    group.obs.set(instance, { value, censored });
    errors.get(cellKey(family, kind, method, runLength, n))?.delete(instance);
    const sk = seriesKey(family, kind, method);
    if (!measures.has(sk)) measures.set(sk, new Set());
    measures.get(sk)!.add(measure);
  };
  const addError = (family: string, kind: MethodKind, method: string, runLength: number | null, n: number, instance: number): void => {
    const key = cellKey(family, kind, method, runLength, n);
    if (!errors.has(key)) errors.set(key, new Set());
    errors.get(key)!.add(instance);
    // The last row of an instance counts: an error after a value replaces it.
    for (const m of kind === "solver" ? RUN_MEASURES : PREDICTION_MEASURES) {
      const group = groups.get(key + sep + m);
      group?.obs.delete(instance);
      group?.missing.delete(instance);
    }
  };
  for (const row of runs) {
    if (row.status === "skipped") continue; // not applicable to this instance: no observation at all
    if (row.status === "error" || row.status === "wrong") {
      addError(row.family, "solver", row.solver, row.run_length, row.n, row.instance);
      continue;
    }
    for (const m of RUN_MEASURES) {
      add(row.family, "solver", row.solver, row.run_length, row.n, row.instance, m, row as unknown as Record<string, unknown>, row.status === "censored");
    }
  }
  for (const row of predictions) {
    if (row.status === "skipped") continue;
    if (row.status === "error") {
      addError(row.family, "predictor", row.predictor, predictionRunLength(row), row.n, row.instance);
      continue;
    }
    for (const m of PREDICTION_MEASURES) {
      add(row.family, "predictor", row.predictor, predictionRunLength(row), row.n, row.instance, m, row, row.status === "censored");
    }
  }
  // A measure that is missing in every row of a method (e.g. TTS of exhaustive search) is not a measure of it.
  for (const [key, group] of groups) {
    if (!measures.get(seriesKey(group.family, group.kind, group.method))?.has(group.measure)) groups.delete(key);
  }
  return { groups, errors, measures };
}

/**
 * The "run length" of a prediction row: the classical run length an amplified solver amplifies, or b for the
 * spectral method (one row per b in a scan); null for predictors with a single setting.
 */
function predictionRunLength(row: PredictionRow): number | null {
  if (typeof row.run_length === "number") return row.run_length;
  if (row.predictor === "spectral" && typeof row.b === "number") return row.b;
  return null;
}

function sampleOf(group: Group): { values: number[]; censored: boolean[] } {
  const instances = [...group.obs.keys()].sort((a, b) => a - b);
  return {
    values: instances.map((i) => group.obs.get(i)!.value),
    censored: instances.map((i) => group.obs.get(i)!.censored),
  };
}

/**
 * Per (family, solver, n): the optimal run length. Returns a set of cell keys (family, kind, method, run length, n)
 * that are optimal, and the rule's flag per key when the choice is uncertain.
 */
function optimalRunLengths(c: Collected, preferred: Measure): { optimal: Set<string>; flags: Map<string, string> } {
  const cells = new Map<string, { family: string; kind: MethodKind; method: string; runLength: number | null; n: number }>();
  for (const g of c.groups.values()) {
    cells.set(cellKey(g.family, g.kind, g.method, g.runLength, g.n), g);
  }
  for (const key of c.errors.keys()) {
    const [family, kind, method, rl, n] = key.split(sep) as [string, MethodKind, string, string, string];
    if (!cells.has(key)) cells.set(key, { family, kind, method, runLength: rl === "" ? null : Number(rl), n: Number(n) });
  }
  const bySize = new Map<string, Array<{ runLength: number | null; key: string }>>();
  for (const [key, cell] of cells) {
    const sizeKey = [cell.family, cell.kind, cell.method, cell.n].join(sep);
    if (!bySize.has(sizeKey)) bySize.set(sizeKey, []);
    bySize.get(sizeKey)!.push({ runLength: cell.runLength, key });
  }
  const optimal = new Set<string>();
  const flags = new Map<string, string>();
  for (const [sizeKey, list] of bySize) {
    if (list.length === 1) {
      optimal.add(list[0]!.key);
      continue;
    }
    const [family, kind, method] = sizeKey.split(sep) as [string, MethodKind, string];
    const seriesMeasures = c.measures.get(seriesKey(family, kind, method)) ?? new Set<Measure>();
    // Amplified solvers: the run length that needs the fewest classical steps in all (longer runs always need
    // fewer amplified runs); the spectral b: the fewest queries.
    const candidates = kind === "predictor" ? ["steps", "queries"] : [preferred, "tts_ns", "tts_work", "wall_ns"];
    const measure = candidates.find((m) => seriesMeasures.has(m as Measure)) as Measure | undefined;
    let best: { key: string; value: number; defined: boolean; runLength: number } | null = null;
    for (const { runLength, key } of list) {
      const group = measure === undefined ? undefined : c.groups.get(key + sep + measure);
      if (group === undefined || group.obs.size === 0) continue;
      const s = sampleOf(group);
      const med = censoredQuantile(s.values, s.censored, 0.5);
      const defined = med.value !== null;
      const value = defined ? med.value! : med.lower;
      const rl = runLength ?? -Infinity;
      const better =
        best === null ||
        (defined && !best.defined) ||
        (defined === best.defined && (value < best.value || (value === best.value && rl < best.runLength)));
      if (better) best = { key, value, defined, runLength: rl };
    }
    if (best === null) continue;
    optimal.add(best.key);
    if (!best.defined) flags.set(best.key, `no run length has a defined median ${measure}; chose the smallest lower bound`);
  }
  return { optimal, flags };
}

// ---------------------------------------------------------------------------------------------------------
// sizes.csv

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
  const { optimal, flags: optimalFlags } = optimalRunLengths(c, options.runLengthMeasure ?? "tts_ns");
  const rows: SizeRow[] = [];
  const emitted = new Set<string>();
  for (const g of c.groups.values()) {
    const ck = cellKey(g.family, g.kind, g.method, g.runLength, g.n);
    emitted.add(ck);
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
    if (of !== undefined) flags.push(of);
    rows.push({
      family: g.family,
      n: g.n,
      method_kind: g.kind,
      method: g.method,
      run_length: g.runLength,
      optimal_run_length: optimal.has(ck),
      measure: g.measure,
      instances: g.obs.size,
      censored: s.censored.filter(Boolean).length,
      errors: c.errors.get(ck)?.size ?? 0,
      median: qs[0]!.value,
      median_low: qs[0]!.low,
      median_high: qs[0]!.high,
      q75: qs[1]!.value,
      q75_low: qs[1]!.low,
      q75_high: qs[1]!.high,
      q90: qs[2]!.value,
      q90_low: qs[2]!.low,
      q90_high: qs[2]!.high,
      resamples,
      flag: flags.join("; "),
    });
  }
  // Cells where every row was an error still get a row per measure of their method, so the errors show.
  for (const [ck, set] of c.errors) {
    if (emitted.has(ck)) continue;
    const [family, kind, method, rl, n] = ck.split(sep) as [string, MethodKind, string, string, string];
    const ms = c.measures.get(seriesKey(family, kind, method)) ?? new Set<Measure>([kind === "solver" ? "wall_ns" : "queries"]);
    for (const measure of ms) {
      rows.push({
        family, n: Number(n), method_kind: kind, method, run_length: rl === "" ? null : Number(rl),
        optimal_run_length: optimal.has(ck), measure, instances: 0, censored: 0, errors: set.size,
        median: null, median_low: null, median_high: null, q75: null, q75_low: null, q75_high: null,
        q90: null, q90_low: null, q90_high: null, resamples, flag: "no instances (all rows errors)",
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

// ---------------------------------------------------------------------------------------------------------
// fits.csv

/**
 * Scaling fits log₂ Q_q(n) = a·n + c per family, method and measure, for each quantile q (default median, 75 %,
 * 90 %), on the per-size optimal run length, with stratified bootstrap intervals (stats/fit.ts).
 * @param runs - runs.csv rows.
 * @param predictions - predictions.csv rows.
 */
export function fitScaling(
  runs: ReadonlyArray<RunRow>,
  predictions: ReadonlyArray<PredictionRow>,
  options: FitScalingOptions = {},
): FitRow[] {
  const resamples = options.resamples ?? DEFAULT_RESAMPLES;
  const seed = options.seed ?? DEFAULT_BOOTSTRAP_SEED;
  const level = options.level ?? DEFAULT_LEVEL;
  const quantiles = options.quantiles ?? REPORTED_QUANTILES;
  const runLengthMeasure = options.runLengthMeasure ?? "tts_ns";
  const c = collect(runs, predictions);
  const { optimal } = optimalRunLengths(c, runLengthMeasure);
  // Series → its optimal groups, one per size.
  const series = new Map<string, { family: string; kind: MethodKind; method: string; measure: Measure; groups: Group[]; runLengths: Map<number, Set<number | null>> }>();
  for (const g of c.groups.values()) {
    const key = seriesKey(g.family, g.kind, g.method) + sep + g.measure;
    if (!series.has(key)) series.set(key, { family: g.family, kind: g.kind, method: g.method, measure: g.measure, groups: [], runLengths: new Map() });
    const s = series.get(key)!;
    if (!s.runLengths.has(g.n)) s.runLengths.set(g.n, new Set());
    s.runLengths.get(g.n)!.add(g.runLength);
    if (optimal.has(cellKey(g.family, g.kind, g.method, g.runLength, g.n)) && g.obs.size > 0) s.groups.push(g);
  }
  const rows: FitRow[] = [];
  for (const s of series.values()) {
    const samples: SizeSample[] = s.groups.map((g) => {
      const sample = sampleOf(g);
      return { n: g.n, values: sample.values, censored: sample.censored };
    });
    const fits = fitSeries(samples, quantiles, {
      fitFrom: options.fitFrom ?? null,
      fitTo: options.fitTo ?? null,
      resamples,
      level,
      seed: deriveSeed(seed, "fit", s.family, s.kind, s.method, s.measure),
    });
    const several = [...s.runLengths.values()].some((set) => set.size > 1);
    const rule = several ? `per-size optimal run length (smallest median ${runLengthMeasure})` : "";
    for (const f of fits) {
      rows.push({
        family: s.family,
        method_kind: s.kind,
        method: s.method,
        measure: s.measure,
        quantile: f.quantile,
        exponent: f.exponent,
        exponent_low: f.exponent_low,
        exponent_high: f.exponent_high,
        base: f.base,
        base_low: f.base_low,
        base_high: f.base_high,
        intercept: f.intercept,
        r2: f.r2,
        n_from: f.n_from,
        n_to: f.n_to,
        points: f.points,
        run_length_rule: rule,
        resamples,
        flag: f.flag,
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
      a.quantile - b.quantile,
  );
}

/** The rule {@link fitScaling} uses for `--fit-from` by default (for the manifest and README). */
export const DEFAULT_FIT_FROM_RULE = FIT_FROM_RULE;

// ---------------------------------------------------------------------------------------------------------
// comparison.csv

/**
 * Quantum seconds per query for a family, predictor and size (Toffolis per query × seconds per Toffoli), as
 * provided by the cost model (harness/predict/cost-model.ts).
 */
export type QuantumSecondsPerQuery = (family: string, predictor: string, n: number) => number;

/** Options of {@link compareMethods}. */
export interface CompareOptions {
  /** Quantile whose fits are compared; default 0.5 (median). */
  readonly quantile?: number;
  /** Classical parallelism S: classical seconds are divided by it; default 1. */
  readonly parallelism?: number;
  /** Classical time measures in order of preference (the first with a fit is used); default tts_ns, wall_ns. */
  readonly classicalMeasures?: ReadonlyArray<"tts_ns" | "wall_ns">;
  /** Inclusive n range searched for the crossover; default [1, 1000]. */
  readonly crossoverRange?: readonly [number, number];
}

/** One row of comparison.csv. */
export interface ComparisonRow {
  family: string;
  solver: string;
  predictor: string;
  quantile: number;
  /** The classical measure compared (time, ns, converted to seconds for the crossover). */
  classical_measure: string;
  exponent_classical: number | null;
  exponent_classical_low: number | null;
  exponent_classical_high: number | null;
  exponent_quantum: number | null;
  exponent_quantum_low: number | null;
  exponent_quantum_high: number | null;
  /** a_classical / a_quantum (2 = quadratic speedup) and its conservative interval. */
  exponent_ratio: number | null;
  exponent_ratio_low: number | null;
  exponent_ratio_high: number | null;
  /** True when this row's solver is the family's strongest (lowest classical exponent). */
  strongest_classical: boolean;
  /** Wording by {@link SPEEDUP_RULE}. */
  speedup_label: string;
  /** True when the quantum exponent's interval lies inside (0, 0.5 − {@link GROVER_MARGIN}) (below Grover's exponent). */
  better_than_grover: boolean;
  parallelism: number;
  /** Predicted crossover size n* (real-valued), the wall time there in seconds, and the status. */
  crossover_n: number | null;
  crossover_seconds: number | null;
  crossover: CrossoverStatus | "undetermined";
  note: string;
}

/** Column order of comparison.csv. */
export const COMPARISON_COLUMNS: ReadonlyArray<keyof ComparisonRow> = [
  "family", "solver", "predictor", "quantile", "classical_measure", "exponent_classical", "exponent_classical_low",
  "exponent_classical_high", "exponent_quantum", "exponent_quantum_low", "exponent_quantum_high", "exponent_ratio",
  "exponent_ratio_low", "exponent_ratio_high", "strongest_classical", "speedup_label", "better_than_grover",
  "parallelism", "crossover_n", "crossover_seconds", "crossover", "note",
];

/**
 * How {@link compareMethods} words a speedup (for the README and the table notes).
 */
export const SPEEDUP_RULE = [
  "Each predictor is rated only against the strongest classical solver of the family: the one with the lowest",
  "fitted exponent of classical time (rows against weaker solvers carry no rating).",
  "The exponent ratio r = a_classical / a_quantum has the conservative interval [a_c,low / a_q,high, a_c,high / a_q,low]",
  "(interval arithmetic on two independent 95 % intervals: joint coverage at least 90 %).",
  "Labels: 'quantum slower' if r_high < 1; 'no significant speedup' if r_low <= 1; 'super-quadratic' if r_low > 2;",
  "'quadratic' if r_low <= 2 <= r_high and r_high - r_low <= 1; 'speedup, consistent with quadratic (wide interval)' if",
  "r_low <= 2 <= r_high and wider; 'sub-quadratic speedup' if 1 < r_low and r_high < 2; 'undetermined' without intervals;",
  "'classical not exponential' if a_c,high <= 0; 'undetermined (quantum exponent interval reaches 0)' if a_q,low <= 0.",
  "'; better than Grover' is added when a_c,low > 0, 0 < a_q,low and a_q,high < min(0.5, lower bound of the grover predictor's",
  "exponent fitted on the same sizes, when the study has it) - 0.01 (GROVER_MARGIN).",
].join(" ");

/**
 * Margin below Grover's exponent 0.5 that a quantum exponent's upper bound must clear to be called "better than
 * Grover": exact Grover counts fitted over n = 10…30 give 0.4998 with a zero-width interval (the (π/4)·2^(n/2)
 * prefactor and the floor in k*), which is not an improvement.
 */
export const GROVER_MARGIN = 0.01;

/** Speedup wording for a ratio interval (see {@link SPEEDUP_RULE}). */
export function speedupLabel(
  classical: { exponent: number | null; low: number | null; high: number | null },
  quantum: { exponent: number | null; low: number | null; high: number | null },
  groverLow: number = 0.5,
): { label: string; ratio: number | null; low: number | null; high: number | null; betterThanGrover: boolean } {
  const ratio =
    classical.exponent !== null && quantum.exponent !== null && quantum.exponent !== 0
      ? classical.exponent / quantum.exponent
      : null;
  // A flat quantum cost (every trial succeeds at small n, so the exponent interval reaches 0) shows no scaling
  // at all: it is never "better than Grover".
  // Small sizes bend every query count (e.g. the (log2 N)^2 term of minimum finding), so the bar is Grover's own
  // exponent fitted on the same sizes when the study has it (its lower bound), never above 0.5.
  const bar = Math.min(0.5, groverLow) - GROVER_MARGIN;
  // The claim also needs an exponentially growing classical cost to be set against (a_c,low > 0).
  const betterThanGrover =
    quantum.high !== null && quantum.low !== null && quantum.low > 0 && quantum.high < bar && classical.low !== null && classical.low > 0;
  const withGrover = (label: string): string => (betterThanGrover ? `${label}; better than Grover` : label);
  if (classical.low === null || classical.high === null || quantum.low === null || quantum.high === null) {
    return { label: withGrover("undetermined"), ratio, low: null, high: null, betterThanGrover };
  }
  if (classical.high <= 0) return { label: withGrover("classical not exponential"), ratio, low: null, high: null, betterThanGrover };
  if (quantum.low <= 0) {
    return { label: withGrover("undetermined (quantum exponent interval reaches 0)"), ratio, low: null, high: null, betterThanGrover };
  }
  // Interval division by a positive interval.
  const low = classical.low / (classical.low >= 0 ? quantum.high : quantum.low);
  const high = classical.high / quantum.low;
  let label: string;
  if (high < 1) label = "quantum slower";
  else if (low <= 1) label = "no significant speedup";
  else if (low > 2) label = "super-quadratic";
  else if (high >= 2) label = high - low <= 1 ? "quadratic" : "speedup, consistent with quadratic (wide interval)";
  else label = "sub-quadratic speedup";
  return { label: withGrover(label), ratio, low, high, betterThanGrover };
}

const LOG2_NS = Math.log2(1e9);

/**
 * Each classical solver against each quantum predictor of a family: exponents, their ratio, a speedup label
 * (rule {@link SPEEDUP_RULE}) and the crossover size under the cost model.
 *
 * Classical time: the fit of the first available measure of `classicalMeasures` (TTS, else wall time) in seconds,
 * divided by the parallelism S. Quantum time: fitted queries × `quantumSecondsPerQuery(family, predictor, n)`.
 * The crossover (stats/crossover.ts) uses the fitted point estimates, extrapolated beyond the measured sizes.
 * @param fits - fits.csv rows (from {@link fitScaling}).
 * @param quantumSecondsPerQuery - seconds per query from the cost model.
 */
export function compareMethods(
  fits: ReadonlyArray<FitRow>,
  quantumSecondsPerQuery: QuantumSecondsPerQuery,
  options: CompareOptions = {},
): ComparisonRow[] {
  const quantile = options.quantile ?? 0.5;
  const parallelism = options.parallelism ?? 1;
  const classicalMeasures = options.classicalMeasures ?? ["tts_ns", "wall_ns"];
  const range = options.crossoverRange ?? DEFAULT_CROSSOVER_RANGE;
  const atQ = fits.filter((f) => f.quantile === quantile);
  const families = [...new Set(atQ.map((f) => f.family))].sort();
  const rows: ComparisonRow[] = [];
  for (const family of families) {
    const own = atQ.filter((f) => f.family === family);
    const solvers = [...new Set(own.filter((f) => f.method_kind === "solver").map((f) => f.method))].sort();
    const predictors = [...new Set(own.filter((f) => f.method_kind === "predictor").map((f) => f.method))].sort();
    const classical = new Map<string, FitRow | null>();
    for (const solver of solvers) {
      const fit =
        classicalMeasures
          .map((m) => own.find((f) => f.method_kind === "solver" && f.method === solver && f.measure === m && f.exponent !== null))
          .find((f) => f !== undefined) ?? null;
      classical.set(solver, fit);
    }
    const ranked = [...classical.entries()]
      .filter((e): e is [string, FitRow] => e[1] !== null)
      .sort((a, b) => a[1].exponent! - b[1].exponent! || (a[1].exponent_high ?? Infinity) - (b[1].exponent_high ?? Infinity));
    const strongest = ranked.length > 0 ? ranked[0]! : null;
    const overlapping = strongest === null
      ? []
      : ranked.slice(1).filter(([, f]) => strongest[1].exponent_high !== null && f.exponent_low !== null && f.exponent_low <= strongest[1].exponent_high).map(([s]) => s);
    for (const solver of solvers) {
      const cf = classical.get(solver) ?? null;
      for (const predictor of predictors) {
        const qf = own.find((f) => f.method_kind === "predictor" && f.method === predictor && f.measure === "queries") ?? null;
        const notes: string[] = [];
        const isStrongest = strongest !== null && strongest[0] === solver;
        const grover = own.find((f) => f.method_kind === "predictor" && f.method === "grover" && f.measure === "queries");
        const sp = speedupLabel(
          { exponent: cf?.exponent ?? null, low: cf?.exponent_low ?? null, high: cf?.exponent_high ?? null },
          { exponent: qf?.exponent ?? null, low: qf?.exponent_low ?? null, high: qf?.exponent_high ?? null },
          predictor === "grover" ? 0.5 : (grover?.exponent_low ?? 0.5),
        );
        let label = sp.label;
        if (isStrongest) {
          notes.push("strongest classical solver of the family (lowest exponent)");
          if (overlapping.length > 0) notes.push(`its exponent interval overlaps ${overlapping.join(", ")}`);
        } else if (cf !== null && strongest !== null) {
          label = `not rated (weaker than ${strongest[0]})`;
        }
        if (cf === null) notes.push(`no fit of ${classicalMeasures.join(" or ")} for ${solver}`);
        if (qf === null || qf.exponent === null) notes.push(`no fit of queries for ${predictor}`);
        let crossoverN: number | null = null;
        let crossoverSeconds: number | null = null;
        let status: ComparisonRow["crossover"] = "undetermined";
        if (cf !== null && qf !== null && qf.exponent !== null && qf.intercept !== null) {
          const x = findCrossover({
            classical: { slope: cf.exponent!, intercept: cf.intercept! - LOG2_NS },
            parallelism,
            quantum: { slope: qf.exponent, intercept: qf.intercept },
            secondsPerQuery: (n) => quantumSecondsPerQuery(family, predictor, n),
            range,
          });
          status = x.status;
          crossoverN = x.n;
          crossoverSeconds = x.seconds;
          if (x.note !== "") notes.push(x.note);
          const measuredTo = Math.max(cf.n_to ?? 0, qf.n_to ?? 0);
          if (x.n !== null && x.n > measuredTo) notes.push(`crossover extrapolated beyond the measured n <= ${measuredTo}`);
        }
        rows.push({
          family,
          solver,
          predictor,
          quantile,
          classical_measure: cf?.measure ?? "",
          exponent_classical: cf?.exponent ?? null,
          exponent_classical_low: cf?.exponent_low ?? null,
          exponent_classical_high: cf?.exponent_high ?? null,
          exponent_quantum: qf?.exponent ?? null,
          exponent_quantum_low: qf?.exponent_low ?? null,
          exponent_quantum_high: qf?.exponent_high ?? null,
          exponent_ratio: sp.ratio,
          exponent_ratio_low: sp.low,
          exponent_ratio_high: sp.high,
          strongest_classical: isStrongest,
          speedup_label: label,
          better_than_grover: sp.betterThanGrover,
          parallelism,
          crossover_n: crossoverN,
          crossover_seconds: crossoverSeconds,
          crossover: status,
          note: notes.join("; "),
        });
      }
    }
  }
  return rows;
}
