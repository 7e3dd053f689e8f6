/**
 * fits.csv: scaling fits per family, method and measure, for each quantile over instances, with the verdict
 * checks of DESIGN.md §4 attached to each row: the fixed-cost floor (time measures of solvers), the
 * exponential-versus-polynomial model check, and the run-length edge rule.
 */
import type { PredictionRow, RunRow } from "../types.js";
import { deriveSeed } from "../random.js";
import { DEFAULT_BOOTSTRAP_SEED, DEFAULT_LEVEL, DEFAULT_RESAMPLES } from "../stats/bootstrap.js";
import { censoredQuantile } from "../stats/censoring.js";
import { fitScaling as fitSeries, FIT_FROM_RULE, type SizeSample } from "../stats/fit.js";
import { REPORTED_QUANTILES } from "../stats/quantiles.js";
import { applyFloor, DEFAULT_FLOOR_FACTOR } from "../stats/floor.js";
import { compareGrowthModels } from "../stats/growth-model.js";
import { runLengthEdges } from "../stats/run-length-edge.js";
import { medianFloor } from "./sizes.js";
import {
  FINE_GRID_RULE, PREDICTION_MEASURES, RUN_MEASURES, cellKey, collect, optimalRunLengths, sampleOf, sep, seriesKey,
  type Group, type Measure, type MethodKind, type SummaryOptions,
} from "./observations.js";

/**
 * Whether a measure counts work (elementary operations, queries), time (measured nanoseconds), or is a scale of
 * neither kind (the adiabatic time scale 1/gap², in units of ħ/energy: no classical measure is like it).
 */
export type MeasureBasis = "work" | "time" | "scale";

/** The basis of a measure: cpu_ns and tts_ns are time, runtime_scale a scale, everything else work. */
export function basisOf(measure: Measure): MeasureBasis {
  if (measure === "runtime_scale") return "scale";
  return measure === "cpu_ns" || measure === "tts_ns" ? "time" : "work";
}

/** One row of fits.csv. */
export interface FitRow {
  family: string;
  method_kind: MethodKind;
  method: string;
  measure: Measure;
  /** "work" (elementary operations, queries), "time" (ns) or "scale" (1/gap²): the bases stand side by side in this table. */
  basis: MeasureBasis;
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
  /** d in cost ≈ n^d over the same points, and the AIC of both models (stats/growth-model.ts). */
  poly_degree: number | null;
  aic_exponential: number | null;
  aic_polynomial: number | null;
  /** "exponential", "polynomial" (as good or better by AIC) or "undetermined" (fewer than 3 points). */
  growth_model: string;
  /** Time measures of solvers: the factor of the fixed-cost floor rule; empty otherwise. */
  floor_factor: number | null;
  /** Sizes left out of this fit because their median wall time was below floor_factor × floor. */
  below_floor: string;
  /** "estimate", "upper bound", "lower bound", "bound (direction unknown)", "not scanned" (one run length), or "" (no run length). */
  exponent_status: string;
  /** How the run length was chosen per size ("" for a single run length). */
  run_length_rule: string;
  resamples: number;
  flag: string;
}

/** Column order of fits.csv. */
export const FIT_COLUMNS: ReadonlyArray<keyof FitRow> = [
  "family", "method_kind", "method", "measure", "basis", "quantile", "exponent", "exponent_low", "exponent_high",
  "base", "base_low", "base_high", "intercept", "r2", "n_from", "n_to", "points", "poly_degree", "aic_exponential",
  "aic_polynomial", "growth_model", "floor_factor", "below_floor", "exponent_status", "run_length_rule", "resamples",
  "flag",
];

/** Options of {@link fitStudy}. */
export interface FitStudyOptions extends SummaryOptions {
  /** Smallest n in the fits (`--fit-from`); default: the rule of stats/fit.ts ({@link FIT_FROM_RULE}). */
  readonly fitFrom?: number | null;
  /** Largest n in the fits; default all. */
  readonly fitTo?: number | null;
  /** Quantiles to fit; default 0.5, 0.75, 0.9. */
  readonly quantiles?: ReadonlyArray<number>;
  /** Fixed-cost floor factor for time fits of solvers (`--floor-factor`); default 10. */
  readonly floorFactor?: number;
}

/**
 * Scaling fits log₂ Q_q(n) = a·n + c per family, method and measure, for each quantile q (default median, 75 %,
 * 90 %), on the per-size optimal run length, with stratified bootstrap intervals (stats/fit.ts), and the checks
 * each row carries:
 * 1. time measures of solvers: only sizes above the fixed-cost floor (stats/floor.ts); fewer than 3 → no fit;
 * 2. the exponential model against a polynomial one on the same points (stats/growth-model.ts);
 * 3. methods with run lengths: the run-length edge rule on the per-size optima (stats/run-length-edge.ts).
 * @param runs - runs.csv rows.
 * @param predictions - predictions.csv rows.
 */
export function fitStudy(
  runs: ReadonlyArray<RunRow>,
  predictions: ReadonlyArray<PredictionRow>,
  options: FitStudyOptions = {},
): FitRow[] {
  const resamples = options.resamples ?? DEFAULT_RESAMPLES;
  const seed = options.seed ?? DEFAULT_BOOTSTRAP_SEED;
  const level = options.level ?? DEFAULT_LEVEL;
  const quantiles = options.quantiles ?? REPORTED_QUANTILES;
  const runLengthMeasure = options.runLengthMeasure ?? "tts_work";
  const floorFactor = options.floorFactor ?? DEFAULT_FLOOR_FACTOR;
  const c = collect(runs, predictions);
  const { optimal, candidates, derived, superseded, fineGrid, scanned } = optimalRunLengths(c, runLengthMeasure);
  // Series → its optimal groups, one per size.
  const series = new Map<string, { family: string; kind: MethodKind; method: string; measure: Measure; groups: Group[]; runLengths: Map<number, Set<number | null>> }>();
  const isTts = (m: Measure): boolean => m === "tts_work" || m === "tts_ns";
  for (const g of [...c.groups.values(), ...derived]) {
    const key = seriesKey(g.family, g.kind, g.method) + sep + g.measure;
    const ck = cellKey(g.family, g.kind, g.method, g.runLength, g.n);
    if (g.derivedFrom !== undefined) {
      // A TTS at the size's fine-grid cut-off (from run-length distributions).
      if (!series.has(key)) series.set(key, { family: g.family, kind: g.kind, method: g.method, measure: g.measure, groups: [], runLengths: new Map() });
      if (g.obs.size > 0) series.get(key)!.groups.push(g);
      continue;
    }
    if (!series.has(key)) series.set(key, { family: g.family, kind: g.kind, method: g.method, measure: g.measure, groups: [], runLengths: new Map() });
    const s = series.get(key)!;
    if (!s.runLengths.has(g.n)) s.runLengths.set(g.n, new Set());
    s.runLengths.get(g.n)!.add(g.runLength);
    if (optimal.has(ck) && !(superseded.has(ck) && isTts(g.measure)) && g.obs.size > 0) s.groups.push(g);
  }
  const rows: FitRow[] = [];
  for (const s of series.values()) {
    const basis = basisOf(s.measure);
    let groups = s.groups;
    // 1. The fixed-cost floor: sizes whose cells are mostly set-up say nothing about scaling.
    let floorFlag = "";
    let belowFloor = "";
    let tooFew = false;
    const floorApplies = s.kind === "solver" && basis === "time";
    if (floorApplies) {
      const points = groups.map((g) => {
        // A fine-grid TTS group is timed by the cell it was derived from.
        const ck = cellKey(g.family, g.kind, g.method, g.derivedFrom ?? g.runLength, g.n);
        const wall = c.groups.get(ck + sep + "cpu_ns"); // floor_ns is CPU time too (summed over slices)
        const sample = wall === undefined ? null : sampleOf(wall);
        const medianWall = sample === null ? null : censoredQuantile(sample.values, sample.censored, 0.5).value;
        return { n: g.n, medianWall, floor: medianFloor(c.floors.get(ck)) };
      });
      const decision = applyFloor(points, floorFactor);
      floorFlag = decision.flag;
      belowFloor = decision.excluded.map((e) => e.n).join(", ");
      tooFew = decision.tooFew;
      const kept = new Set(decision.kept);
      groups = groups.filter((g) => kept.has(g.n));
    }
    const samples: SizeSample[] = groups.map((g) => {
      const sample = sampleOf(g);
      return { n: g.n, values: sample.values, censored: sample.censored };
    });
    const fits = fitSeries(samples, quantiles, {
      fitFrom: options.fitFrom ?? null,
      fitTo: options.fitTo ?? null,
      resamples: tooFew ? 0 : resamples,
      level,
      seed: deriveSeed(seed, "fit", s.family, s.kind, s.method, s.measure),
    });
    const several = [...s.runLengths.values()].some((set) => set.size > 1);
    const hasRunLength = [...s.runLengths.values()].some((set) => [...set].some((rl) => rl !== null));
    // The fine cut-off grid concerns the TTS measures only; cpu_ns and work are the cost of the runs at their cap.
    const fine = fineGrid.has(seriesKey(s.family, s.kind, s.method)) && isTts(s.measure);
    const edgeGrid = fineGrid.has(seriesKey(s.family, s.kind, s.method)) && !fine ? scanned : candidates;
    const rule = fine ? FINE_GRID_RULE : several ? `per-size optimal run length (smallest median ${runLengthMeasure})` : "";
    for (const f of fits) {
      const flags: string[] = [];
      if (floorFlag !== "") flags.push(floorFlag);
      // 2. Exponential or polynomial, on the fit's own points.
      const growth = tooFew ? compareGrowthModels([]) : compareGrowthModels(f.used);
      if (growth.preferred === "polynomial") {
        flags.push(`scaling looks polynomial over n = ${f.n_from}…${f.n_to} (AIC ${fmt(growth.aicPolynomial)} vs ${fmt(growth.aicExponential)} exponential; degree ${fmt(growth.polyDegree)})`);
      }
      // 3. Run-length edges, over the sizes this fit used.
      let status = "";
      if (hasRunLength) {
        const edge = runLengthEdges(edgeGrid.get(seriesKey(s.family, s.kind, s.method)) ?? [], f.used.map((u) => u.n));
        status = edge.status;
        if (edge.flag !== "") flags.push(edge.flag);
      }
      if (f.flag !== "") flags.push(f.flag);
      const withheld = tooFew;
      rows.push({
        family: s.family,
        method_kind: s.kind,
        method: s.method,
        measure: s.measure,
        basis,
        quantile: f.quantile,
        exponent: withheld ? null : f.exponent,
        exponent_low: withheld ? null : f.exponent_low,
        exponent_high: withheld ? null : f.exponent_high,
        base: withheld ? null : f.base,
        base_low: withheld ? null : f.base_low,
        base_high: withheld ? null : f.base_high,
        intercept: withheld ? null : f.intercept,
        r2: withheld ? null : f.r2,
        n_from: f.n_from,
        n_to: f.n_to,
        points: f.points,
        poly_degree: growth.polyDegree,
        aic_exponential: growth.aicExponential,
        aic_polynomial: growth.aicPolynomial,
        growth_model: growth.preferred,
        floor_factor: floorApplies ? floorFactor : null,
        below_floor: belowFloor,
        exponent_status: status,
        run_length_rule: rule,
        resamples: tooFew ? 0 : resamples,
        flag: flags.join("; "),
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

/** The rule {@link fitStudy} uses for `--fit-from` by default (for the manifest and README). */
export const DEFAULT_FIT_FROM_RULE = FIT_FROM_RULE;

function fmt(x: number | null): string {
  return x === null || !Number.isFinite(x) ? "–" : x.toFixed(2);
}
