/**
 * comparison.csv: each classical solver against each quantum predictor of a family, on two bases, one row each:
 * - work: classical elementary operations to solution (assignments evaluated, flips, spin-update attempts)
 *   against quantum oracle queries (one query evaluates the cost function once); for an amplified solver,
 *   classical steps of the solver against the steps inside the amplified runs (the same elementary step);
 * - time: measured classical seconds (divided by the stated parallelism S) against predicted quantum seconds
 *   (queries × Toffolis per query × Toffoli time, the cost model), with the crossover n*.
 * A ratio always compares like with like; never a time against a query count (issue 13).
 *
 * A verdict is stated only under DESIGN.md §4: the classical fit exists above the fixed-cost floor, neither side
 * looks polynomial, and the row is the rated one (the strongest classical solver on the row's basis, or for
 * amplified-X the solver X it amplifies). Whatever qualified a number is a code in `flags` ({@link FOOTNOTES}),
 * printed as a footnote mark in every table format.
 */
import { findCrossover, type CrossoverStatus, DEFAULT_CROSSOVER_RANGE } from "../stats/crossover.js";
import type { FitRow, MeasureBasis } from "./fits.js";
import { PREDICTORS } from "../predict/registry.js";

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
  /** Inclusive n range searched for the crossover; default [1, 1000]. */
  readonly crossoverRange?: readonly [number, number];
}

/** Codes of the caveats a comparison row can carry, with the footnote each one prints. */
export const FOOTNOTES = {
  extrapolated: "crossover beyond the largest measured n: an extrapolation of the fitted lines",
  underestimated: "largest sizes censored: an exponent is likely underestimated",
  "upper-bound": "optimal run length at the grid edge: exponent is an upper bound",
  "lower-bound": "optimal run length at the grid edge: exponent is a lower bound",
  "bound": "optimal run length at the grid edge: exponent is a bound of unknown direction",
  "not-scanned": "one run length only: the TTS-optimal run length was not scanned",
  "few-sizes": "fewer than 3 sizes in a fit",
  floor: "sizes below the fixed-cost floor left out of the time fit",
  "below-floor": "not enough sizes above the fixed-cost floor: no time verdict",
  polynomial: "scaling looks polynomial (AIC): no exponential verdict",
  grover: "quantum exponent interval below Grover's 1/2",
} as const;

/** A caveat code. */
export type FlagCode = keyof typeof FOOTNOTES;

/** One row of comparison.csv. */
export interface ComparisonRow {
  family: string;
  /** "work" or "time": what both sides of this row measure. */
  basis: MeasureBasis;
  solver: string;
  predictor: string;
  quantile: number;
  /** The classical measure (fits.csv) and the quantum one ("queries", "expected_work", or "seconds" predicted). */
  classical_measure: string;
  quantum_measure: string;
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
  /** Sizes of the classical fit. */
  n_from: number | null;
  n_to: number | null;
  /** True when this row is the rated one for its predictor and basis (see the module comment). */
  rated: boolean;
  /** True when this row's solver has the lowest classical exponent of the family on this basis. */
  strongest_classical: boolean;
  /** The verdict (rule {@link SPEEDUP_RULE}), or why there is none. */
  speedup_label: string;
  /** True when the quantum exponent's interval lies inside (0, 0.5 − {@link GROVER_MARGIN}). */
  better_than_grover: boolean;
  parallelism: number;
  /** Time rows: predicted crossover size n* (real-valued), the time there in seconds, and the status. */
  crossover_n: number | null;
  crossover_seconds: number | null;
  crossover: CrossoverStatus | "undetermined" | "";
  /** True when n* lies beyond the largest measured size. */
  extrapolated: boolean;
  /** Caveat codes ({@link FOOTNOTES}), ";"-separated. */
  flags: string;
  note: string;
}

/** Column order of comparison.csv. */
export const COMPARISON_COLUMNS: ReadonlyArray<keyof ComparisonRow> = [
  "family", "basis", "solver", "predictor", "quantile", "classical_measure", "quantum_measure", "exponent_classical",
  "exponent_classical_low", "exponent_classical_high", "exponent_quantum", "exponent_quantum_low",
  "exponent_quantum_high", "exponent_ratio", "exponent_ratio_low", "exponent_ratio_high", "n_from", "n_to", "rated",
  "strongest_classical", "speedup_label", "better_than_grover", "parallelism", "crossover_n", "crossover_seconds",
  "crossover", "extrapolated", "flags", "note",
];

/** How {@link compareMethods} words a verdict (for the README, the tables and the study page). */
export const SPEEDUP_RULE = [
  "Rows compare like with like: work (classical elementary operations against quantum queries, or an amplified solver's expected work",
  "against the classical solver's own work) or time (classical seconds / S against predicted quantum seconds).",
  "Each predictor is rated on each basis only against the classical solver with the lowest exponent on that basis",
  "(amplified-X only against X); other rows say 'not rated'.",
  "No verdict when: the time fit has fewer than 3 sizes above 10x (--floor-factor) the fixed-cost floor; either side",
  "looks polynomial by AIC ('scaling looks polynomial over n = ...'); a fit is missing.",
  "The exponent ratio r = a_c / a_q has the conservative interval [a_c,low / a_q,high, a_c,high / a_q,low]",
  "(interval arithmetic on two independent 95 % intervals: joint coverage at least 90 %).",
  "Labels: 'quantum slower' if r_high < 1; 'no significant speedup' if r_low <= 1; 'super-quadratic' if r_low > 2;",
  "'quadratic' if r_low <= 2 <= r_high and r_high - r_low <= 1; 'speedup, consistent with quadratic (wide interval)' if",
  "r_low <= 2 <= r_high and wider; 'sub-quadratic speedup' if 1 < r_low and r_high < 2; 'undetermined' without intervals;",
  "'classical not exponential' if a_c,high <= 0; 'undetermined (quantum exponent interval reaches 0)' if a_q,low <= 0.",
  "A quantum exponent interval inside (0, 0.49) is a footnote ('below Grover's 1/2'), never part of the label.",
  "A predictor whose measure is not an oracle count (adiabatic: the time scale 1/gap²) shows its exponent but is",
  "'not rated' on either basis: no classical measure is like it, and the cost model gives it no seconds.",
].join(" ");

/**
 * Margin below Grover's exponent 0.5 that a quantum exponent's upper bound must clear to be called "better than
 * Grover": exact Grover counts fitted over n = 10…30 give 0.4998 with a zero-width interval (the (π/4)·2^(n/2)
 * prefactor and the floor in k*), which is not an improvement.
 */
export const GROVER_MARGIN = 0.01;

/** Speedup wording for a ratio interval (see {@link SPEEDUP_RULE}); "better than Grover" is returned apart. */
export function speedupLabel(
  classical: { exponent: number | null; low: number | null; high: number | null },
  quantum: { exponent: number | null; low: number | null; high: number | null },
  groverLow: number = 0.5,
): { label: string; ratio: number | null; low: number | null; high: number | null; betterThanGrover: boolean } {
  const ratio =
    classical.exponent !== null && quantum.exponent !== null && quantum.exponent !== 0
      ? classical.exponent / quantum.exponent
      : null;
  // Small sizes bend every query count (e.g. the (log2 N)^2 term of minimum finding), so the bar is Grover's own
  // exponent fitted on the same sizes when the study has it (its lower bound), never above 0.5.
  const bar = Math.min(0.5, groverLow) - GROVER_MARGIN;
  const betterThanGrover =
    quantum.high !== null && quantum.low !== null && quantum.low > 0 && quantum.high < bar && classical.low !== null && classical.low > 0;
  if (classical.low === null || classical.high === null || quantum.low === null || quantum.high === null) {
    return { label: "undetermined", ratio, low: null, high: null, betterThanGrover };
  }
  if (classical.high <= 0) return { label: "classical not exponential", ratio, low: null, high: null, betterThanGrover };
  if (quantum.low <= 0) return { label: "undetermined (quantum exponent interval reaches 0)", ratio, low: null, high: null, betterThanGrover };
  // Interval division by a positive interval.
  const low = classical.low / (classical.low >= 0 ? quantum.high : quantum.low);
  const high = classical.high / quantum.low;
  let label: string;
  if (high < 1) label = "quantum slower";
  else if (low <= 1) label = "no significant speedup";
  else if (low > 2) label = "super-quadratic";
  else if (high >= 2) label = high - low <= 1 ? "quadratic" : "speedup, consistent with quadratic (wide interval)";
  else label = "sub-quadratic speedup";
  return { label, ratio, low, high, betterThanGrover };
}

const LOG2_NS = Math.log2(1e9);

/** Classical measures per basis, in order of preference: to-solution first. */
const CLASSICAL_MEASURES: Readonly<Record<MeasureBasis, ReadonlyArray<string>>> = {
  work: ["tts_work", "work"],
  time: ["tts_ns", "cpu_ns"],
  scale: [],
};

/**
 * A predictor's own measure when it is not an oracle count (e.g. the adiabatic time scale 1/gap²), as the registry
 * declares it; null for query-counting predictors and names the registry does not know.
 */
export function ownMeasure(predictor: string): { readonly column: string; readonly meaning: string } | null {
  return PREDICTORS.find((p) => p.name === predictor)?.measure ?? null;
}

/**
 * The solver a predictor amplifies ("amplified-walk" → "walk"), as the predictor registry declares it; for a
 * name the registry does not know (a journal of another build), the `amplified-SOLVER` naming; else null.
 */
export function amplifiedSource(predictor: string): string | null {
  const registered = PREDICTORS.find((p) => p.name === predictor);
  if (registered !== undefined) return registered.amplifies ?? null;
  return predictor.startsWith("amplified-") ? predictor.slice("amplified-".length) : null;
}

/**
 * Each classical solver against each quantum predictor of a family, on the work and the time basis: exponents,
 * their ratio, a verdict (rule {@link SPEEDUP_RULE}), caveat flags and, on time rows, the crossover under the
 * cost model (stats/crossover.ts, fitted point estimates extrapolated beyond the measured sizes).
 * @param fits - fits.csv rows (from fitStudy).
 * @param quantumSecondsPerQuery - seconds per query from the cost model.
 */
export function compareMethods(
  fits: ReadonlyArray<FitRow>,
  quantumSecondsPerQuery: QuantumSecondsPerQuery,
  options: CompareOptions = {},
): ComparisonRow[] {
  const quantile = options.quantile ?? 0.5;
  const parallelism = options.parallelism ?? 1;
  const range = options.crossoverRange ?? DEFAULT_CROSSOVER_RANGE;
  const atQ = fits.filter((f) => f.quantile === quantile);
  const families = [...new Set(atQ.map((f) => f.family))].sort();
  const rows: ComparisonRow[] = [];
  for (const family of families) {
    const own = atQ.filter((f) => f.family === family);
    const solvers = [...new Set(own.filter((f) => f.method_kind === "solver").map((f) => f.method))].sort();
    const predictors = [...new Set(own.filter((f) => f.method_kind === "predictor").map((f) => f.method))].sort();
    const grover = own.find((f) => f.method_kind === "predictor" && f.method === "grover" && f.measure === "queries");
    for (const basis of ["work", "time"] as const) {
      const classical = new Map<string, FitRow | null>();
      for (const solver of solvers) {
        const fit = CLASSICAL_MEASURES[basis]
          .map((m) => own.find((f) => f.method_kind === "solver" && f.method === solver && f.measure === m))
          .find((f) => f !== undefined) ?? null;
        classical.set(solver, fit);
      }
      const ranked = [...classical.entries()]
        .filter((e): e is [string, FitRow] => e[1] !== null && e[1].exponent !== null)
        .sort((a, b) => a[1].exponent! - b[1].exponent! || (a[1].exponent_high ?? Infinity) - (b[1].exponent_high ?? Infinity));
      const strongest = ranked.length > 0 ? ranked[0]![0] : null;
      for (const predictor of predictors) {
        const source = amplifiedSource(predictor);
        const measureOwn = ownMeasure(predictor);
        // Work: an amplified solver in its own elementary operations (expected_work); a predictor with its own
        // measure in that measure (never rated: no classical measure is like it); every other predictor in oracle queries.
        const qMeasure = measureOwn !== null ? measureOwn.column : basis === "work" && source !== null ? "expected_work" : "queries";
        const qf = own.find((f) => f.method_kind === "predictor" && f.method === predictor && f.measure === qMeasure) ?? null;
        const ratedSolver = measureOwn !== null ? null : source !== null ? (solvers.includes(source) ? source : null) : strongest;
        for (const solver of solvers) {
          const cf = classical.get(solver) ?? null;
          rows.push(
            compareRow({
              family, basis, solver, predictor, quantile, parallelism, range, cf, qf, qMeasure, own: measureOwn,
              rated: ratedSolver !== null && solver === ratedSolver, ratedSolver, source, strongest: solver === strongest,
              groverLow: predictor === "grover" ? 0.5 : (grover?.exponent_low ?? 0.5),
              secondsPerQuery: (n) => quantumSecondsPerQuery(family, predictor, n),
            }),
          );
        }
      }
    }
  }
  return rows;
}

interface RowInput {
  family: string;
  basis: MeasureBasis;
  solver: string;
  predictor: string;
  quantile: number;
  parallelism: number;
  range: readonly [number, number];
  cf: FitRow | null;
  qf: FitRow | null;
  qMeasure: string;
  /** The predictor's own measure (not an oracle count), or null. */
  own: { readonly column: string; readonly meaning: string } | null;
  rated: boolean;
  ratedSolver: string | null;
  source: string | null;
  strongest: boolean;
  groverLow: number;
  secondsPerQuery: (n: number) => number;
}

/** Caveat codes a fit row carries into the comparison. */
function fitFlags(f: FitRow | null, flags: Set<FlagCode>): void {
  if (f === null) return;
  if (f.flag.includes("exponent likely underestimated")) flags.add("underestimated");
  if (f.exponent_status === "upper bound") flags.add("upper-bound");
  else if (f.exponent_status === "lower bound") flags.add("lower-bound");
  else if (f.exponent_status === "bound (direction unknown)") flags.add("bound");
  else if (f.exponent_status === "not scanned") flags.add("not-scanned");
  if (f.exponent !== null && f.points < 3) flags.add("few-sizes");
  if (f.below_floor !== "" && f.exponent !== null) flags.add("floor");
  if (f.exponent === null && f.flag.includes("fixed-cost floor")) flags.add("below-floor");
  if (f.growth_model === "polynomial") flags.add("polynomial");
}

function compareRow(x: RowInput): ComparisonRow {
  if (x.own !== null) return unratedRow(x, x.own);
  const { cf, qf } = x;
  const flags = new Set<FlagCode>();
  const notes: string[] = [];
  fitFlags(cf, flags);
  fitFlags(qf, flags);
  // Time basis: predicted quantum seconds = queries × seconds per query(n); its exponent is the query exponent
  // plus the slope of log₂ seconds-per-query over the fitted sizes (Toffolis per query grow polynomially in n).
  let qExp = qf?.exponent ?? null;
  let qLow = qf?.exponent_low ?? null;
  let qHigh = qf?.exponent_high ?? null;
  if (x.basis === "time" && qf !== null && qf.n_from !== null && qf.n_to !== null && qf.n_to > qf.n_from) {
    const shift = (Math.log2(x.secondsPerQuery(qf.n_to)) - Math.log2(x.secondsPerQuery(qf.n_from))) / (qf.n_to - qf.n_from);
    if (Number.isFinite(shift)) {
      qExp = qExp === null ? null : qExp + shift;
      qLow = qLow === null ? null : qLow + shift;
      qHigh = qHigh === null ? null : qHigh + shift;
    }
  }
  const sp = speedupLabel(
    { exponent: cf?.exponent ?? null, low: cf?.exponent_low ?? null, high: cf?.exponent_high ?? null },
    { exponent: qExp, low: qLow, high: qHigh },
    x.groverLow,
  );
  if (sp.betterThanGrover && x.basis === "work") flags.add("grover");
  // The verdict, in order of the rules that can withhold it.
  let label: string;
  const range = (f: FitRow): string => `n = ${f.n_from}…${f.n_to}`;
  if (cf === null) label = `undetermined (no ${CLASSICAL_MEASURES[x.basis].join(" or ")} for ${x.solver})`;
  else if (cf.exponent === null && cf.flag.includes("not enough sizes above the fixed-cost floor")) {
    label = /not enough sizes above the fixed-cost floor \([^)]*\)/.exec(cf.flag)?.[0] ?? "not enough sizes above the fixed-cost floor";
  } else if (cf.exponent === null) label = `undetermined (no fit of ${cf.measure} for ${x.solver})`;
  else if (qf === null || qExp === null) label = `undetermined (no fit of ${x.qMeasure} for ${x.predictor})`;
  else if (!x.rated) {
    label = x.source !== null
      ? `not rated (${x.predictor} is rated against ${x.source})`
      : `not rated (weaker than ${x.ratedSolver ?? "another solver"} on ${x.basis})`;
  } else if (cf.growth_model === "polynomial") label = `scaling looks polynomial over ${range(cf)} (${x.solver})`;
  else if (qf.growth_model === "polynomial") label = `quantum scaling looks polynomial over ${range(qf)} (${x.predictor})`;
  else label = sp.label;
  if (x.strongest) notes.push(`lowest classical ${x.basis} exponent of the family`);
  if (cf !== null && cf.flag !== "") notes.push(`${x.solver}: ${cf.flag}`);
  if (qf !== null && qf.flag !== "") notes.push(`${x.predictor}: ${qf.flag}`);
  // Crossover on the time basis only: the one place where seconds meet seconds.
  let crossoverN: number | null = null;
  let crossoverSeconds: number | null = null;
  let status: ComparisonRow["crossover"] = "";
  let extrapolated = false;
  if (x.basis === "time") {
    status = "undetermined";
    if (cf !== null && cf.exponent !== null && cf.intercept !== null && qf !== null && qf.exponent !== null && qf.intercept !== null) {
      const c = findCrossover({
        classical: { slope: cf.exponent, intercept: cf.intercept - LOG2_NS },
        parallelism: x.parallelism,
        quantum: { slope: qf.exponent, intercept: qf.intercept },
        secondsPerQuery: x.secondsPerQuery,
        range: x.range,
      });
      status = c.status;
      crossoverN = c.n;
      crossoverSeconds = c.seconds;
      if (c.note !== "") notes.push(c.note);
      const measuredTo = Math.max(cf.n_to ?? 0, qf.n_to ?? 0);
      if (c.n !== null && c.n > measuredTo) {
        extrapolated = true;
        flags.add("extrapolated");
        notes.push(`crossover extrapolated beyond the largest measured n = ${measuredTo}`);
      }
    }
  }
  return {
    family: x.family,
    basis: x.basis,
    solver: x.solver,
    predictor: x.predictor,
    quantile: x.quantile,
    classical_measure: cf?.measure ?? "",
    quantum_measure: x.basis === "time" ? "seconds (predicted)" : x.qMeasure,
    exponent_classical: cf?.exponent ?? null,
    exponent_classical_low: cf?.exponent_low ?? null,
    exponent_classical_high: cf?.exponent_high ?? null,
    exponent_quantum: qExp,
    exponent_quantum_low: qLow,
    exponent_quantum_high: qHigh,
    exponent_ratio: sp.ratio,
    exponent_ratio_low: sp.low,
    exponent_ratio_high: sp.high,
    n_from: cf?.n_from ?? null,
    n_to: cf?.n_to ?? null,
    rated: x.rated,
    strongest_classical: x.strongest,
    speedup_label: label,
    better_than_grover: sp.betterThanGrover,
    parallelism: x.parallelism,
    crossover_n: crossoverN,
    crossover_seconds: crossoverSeconds,
    crossover: status,
    extrapolated,
    flags: [...flags].join(";"),
    note: notes.join("; "),
  };
}

/**
 * The row of a predictor whose measure is not an oracle count (e.g. the adiabatic 1/gap²): both exponents are shown
 * for reference, but no ratio, verdict or crossover, since the classical side has no like measure on either basis.
 */
function unratedRow(x: RowInput, own: { readonly column: string; readonly meaning: string }): ComparisonRow {
  const { cf, qf } = x;
  const flags = new Set<FlagCode>();
  fitFlags(cf, flags);
  fitFlags(qf, flags);
  flags.delete("polynomial");
  const notes: string[] = [`${x.predictor} measures ${own.meaning}; no classical ${x.basis} measure is like it`];
  if (x.strongest) notes.push(`lowest classical ${x.basis} exponent of the family`);
  if (cf !== null && cf.flag !== "") notes.push(`${x.solver}: ${cf.flag}`);
  if (qf !== null && qf.flag !== "") notes.push(`${x.predictor}: ${qf.flag}`);
  return {
    family: x.family,
    basis: x.basis,
    solver: x.solver,
    predictor: x.predictor,
    quantile: x.quantile,
    classical_measure: cf?.measure ?? "",
    quantum_measure: `${own.column}: ${own.meaning}`,
    exponent_classical: cf?.exponent ?? null,
    exponent_classical_low: cf?.exponent_low ?? null,
    exponent_classical_high: cf?.exponent_high ?? null,
    exponent_quantum: qf?.exponent ?? null,
    exponent_quantum_low: qf?.exponent_low ?? null,
    exponent_quantum_high: qf?.exponent_high ?? null,
    exponent_ratio: null,
    exponent_ratio_low: null,
    exponent_ratio_high: null,
    n_from: cf?.n_from ?? null,
    n_to: cf?.n_to ?? null,
    rated: false,
    strongest_classical: x.strongest,
    speedup_label: `not rated on the ${x.basis} basis (${own.meaning}: no like classical measure)`,
    better_than_grover: false,
    parallelism: x.parallelism,
    crossover_n: null,
    crossover_seconds: null,
    crossover: "",
    extrapolated: false,
    flags: [...flags].join(";"),
    note: notes.join("; "),
  };
}
