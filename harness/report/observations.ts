/**
 * Journal rows as observations: per (family, method kind, method, run length, n, measure) the per-instance values,
 * with censoring, error rows and fixed-cost floors; and the per-size choice of the optimal run length. Shared by
 * sizes.ts, fits.ts and the figures. Pure functions: no files, no console.
 *
 * Conventions:
 * - Rows with status "error" are left out and counted (`errors`). Rows with status "censored" are lower bounds
 *   ("at least"); so is a time-to-solution of a row with no success (p = 0), whose bound is the row's value, its
 *   `*_low` column, or 0 when neither is finite. Quantiles follow the censoring rule of stats/censoring.ts.
 * - Several rows for the same (instance, method, run length): the last one counts (a resumed journal may repeat).
 * - Randomised solvers with several run lengths: at each size the run length whose median steps to solution
 *   (`tts_work` by default) over instances is smallest is the size's optimal one (ties: the shorter run); fits
 *   use only those (Rønnow et al., Science 345, 420 (2014): a fixed run length distorts the apparent scaling).
 *   The choice is made from work, which is deterministic for a given seed, so a work exponent cannot move
 *   between two runs of one study because of timing noise (issue 13); it is made on the point estimate and not
 *   re-made inside the bootstrap.
 * - Randomised solvers whose rows carry per-trial steps to solution (`steps_to_solution`): the TTS is derived per
 *   instance at a fine grid of cut-offs from 1 flip to the cap (report/run-length-grid.ts, 24 per decade), the
 *   per-size cut-off is the one with the smallest median TTS in flips, and the TTS measures (tts_work, tts_ns) are
 *   fitted at that cut-off; the edge rule sees that fine grid. With several caps at one size the largest cap's
 *   distributions are used. Rows without distributions are treated as above.
 */
import type { PredictionRow, RunRow } from "../types.js";
import { PREDICTORS } from "../predict/registry.js";
import { censoredQuantile } from "../stats/censoring.js";
import type { SizeRunLengths } from "../stats/run-length-edge.js";
import { chooseCutoffOnGrid, distributionOfRow, RLD_GRID_PER_DECADE, type InstanceDistribution } from "./run-length-grid.js";

/** Whether a row of the report describes a classical solver or a quantum predictor. */
export type MethodKind = "solver" | "predictor";

/**
 * Cost measures of runs.csv rows, in column order. Time is CPU time (cpu_ns: exhaustive's summed over its parallel
 * slices), so a scaling fit does not depend on --workers; runs.csv wall_ns (elapsed) is reported, not fitted.
 */
export const RUN_MEASURES = ["cpu_ns", "work", "tts_ns", "tts_work"] as const;
/** Cost measures of predictions.csv rows. */
export const PREDICTION_MEASURES = ["queries", "expected_work", "runtime_scale"] as const;
/** A cost measure (a column of runs.csv or predictions.csv). */
export type Measure = (typeof RUN_MEASURES)[number] | (typeof PREDICTION_MEASURES)[number];

/** Unit of each measure, for axis titles and table headers. */
export const MEASURE_UNITS: Readonly<Record<Measure, string>> = {
  cpu_ns: "CPU time, ns",
  work: "elementary operations",
  tts_ns: "time to solution (99 %), ns",
  tts_work: "elementary operations to solution (99 %)",
  queries: "oracle queries",
  expected_work: "elementary operations inside amplified runs",
  runtime_scale: "adiabatic time scale 1/gap² (not an oracle count)",
};

/** Options shared by {@link summariseSizes} and {@link fitScaling}. */
export interface SummaryOptions {
  /** Bootstrap resamples; default 2000. */
  readonly resamples?: number;
  /** Bootstrap seed string; default "speedbound-bootstrap". */
  readonly seed?: string;
  /** Confidence level of the intervals; default 0.95. */
  readonly level?: number;
  /** Measure whose median picks the per-size optimal run length; default "tts_work" (deterministic per seed). */
  readonly runLengthMeasure?: Measure;
}


// ---------------------------------------------------------------------------------------------------------
// Collecting observations

export interface Observation {
  value: number;
  censored: boolean;
}

export interface Group {
  family: string;
  kind: MethodKind;
  method: string;
  runLength: number | null;
  n: number;
  measure: Measure;
  obs: Map<number, Observation>;
  missing: Set<number>;
  /** For a TTS group derived from run-length distributions: the cap (run length) of the cell it comes from. */
  derivedFrom?: number;
}

export interface Collected {
  groups: Map<string, Group>;
  /** Error rows per (family, kind, method, run length, n). */
  errors: Map<string, Set<number>>;
  /** Measures seen per (family, kind, method). */
  measures: Map<string, Set<Measure>>;
  /** Fixed per-cell cost (floor_ns) per cell key (family, kind, method, run length, n), per instance. */
  floors: Map<string, Map<number, number>>;
  /** Per cell key: per instance its run-length distribution, for rows that carry `steps_to_solution`. */
  distributions: Map<string, Map<number, InstanceDistribution>>;
}

export const sep = "\u0000";
export const cellKey = (family: string, kind: MethodKind, method: string, runLength: number | null, n: number): string =>
  [family, kind, method, runLength ?? "", n].join(sep);
export const seriesKey = (family: string, kind: MethodKind, method: string): string => [family, kind, method].join(sep);

function lowColumn(measure: Measure): string | null {
  return measure === "tts_ns" ? "tts_ns_low" : measure === "tts_work" ? "tts_work_low" : measure === "queries" ? "queries_low" : measure === "expected_work" ? "expected_work_low" : null;
}

export function collect(runs: ReadonlyArray<RunRow>, predictions: ReadonlyArray<PredictionRow>): Collected {
  const groups = new Map<string, Group>();
  const errors = new Map<string, Set<number>>();
  const measures = new Map<string, Set<Measure>>();
  const floors = new Map<string, Map<number, number>>();
  const distributions = new Map<string, Map<number, InstanceDistribution>>();
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
    if ((measure === "tts_ns" || measure === "tts_work") && (row["successes"] === 0 || row["trial_success_p"] === 0)) censored = true;
    // Likewise an amplified trial that never succeeded (p = 0): its cost is unbounded, at least its low end; the
    // instance counts as censored instead of dropping out of the median (which would bias it low) and the run
    // length stays on the scanned grid (the run-length edge rule needs it).
    if ((measure === "queries" || measure === "expected_work") && row["trial_success_p"] === 0 && !Number.isFinite(value)) censored = true;
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
    if (row.status === "error" || row.status === "wrong") { // a wrong external answer is never a success
      addError(row.family, "solver", row.solver, row.run_length, row.n, row.instance);
      distributions.get(cellKey(row.family, "solver", row.solver, row.run_length, row.n))?.delete(row.instance);
      continue;
    }
    const ck = cellKey(row.family, "solver", row.solver, row.run_length, row.n);
    if (typeof row.floor_ns === "number" && Number.isFinite(row.floor_ns)) {
      if (!floors.has(ck)) floors.set(ck, new Map());
      floors.get(ck)!.set(row.instance, row.floor_ns);
    }
    const dist = distributionOfRow(row);
    if (!distributions.has(ck)) distributions.set(ck, new Map());
    if (dist !== null) distributions.get(ck)!.set(row.instance, dist);
    else distributions.get(ck)!.delete(row.instance); // the last row of an instance counts
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
  return { groups, errors, measures, floors, distributions };
}

/**
 * The "run length" of a prediction row: the classical run length an amplified solver amplifies, or the cell
 * parameter of a predictor with worker-side numerics (b for the spectral method, one row per b in a scan, as the
 * predictor registry declares it); null for predictors with a single setting or a parameter that is a numerical
 * setting (the adiabatic grid).
 */
export function predictionRunLength(row: PredictionRow): number | null {
  if (typeof row.run_length === "number") return row.run_length;
  const cell = PREDICTORS.find((p) => p.name === row.predictor)?.cell;
  const param = cell?.scanned === false ? undefined : cell?.param;
  const value = param === undefined ? undefined : (row as Record<string, unknown>)[param];
  return typeof value === "number" ? value : null;
}

export function sampleOf(group: Group): { values: number[]; censored: boolean[] } {
  const instances = [...group.obs.keys()].sort((a, b) => a - b);
  return {
    values: instances.map((i) => group.obs.get(i)!.value),
    censored: instances.map((i) => group.obs.get(i)!.censored),
  };
}

/** What {@link optimalRunLengths} decides. */
export interface OptimalRunLengths {
  /** Cell keys (family, kind, method, run length, n) the fits use. */
  optimal: Set<string>;
  /** The rule's flag per cell key when the choice is uncertain. */
  flags: Map<string, string>;
  /** Per series key: the per-size grid the edge rule sees (scanned run lengths, or the fine cut-off grid). */
  candidates: Map<string, SizeRunLengths[]>;
  /** TTS groups (tts_work, tts_ns) derived from run-length distributions at each size's chosen cut-off. */
  derived: Group[];
  /** Cell keys whose own TTS groups are replaced by {@link derived} ones (their other measures stay optimal). */
  superseded: Set<string>;
  /** Series keys for which at least one size was chosen on the fine grid. */
  fineGrid: Set<string>;
  /** Per series key: the scanned run lengths only (the grid of the measures taken at the cap: cpu_ns, work). */
  scanned: Map<string, SizeRunLengths[]>;
}

/**
 * Per (family, solver, n): the optimal run length, from the scanned run lengths or, where the rows carry
 * run-length distributions, from a fine grid of cut-offs (see the module comment).
 */
export function optimalRunLengths(c: Collected, preferred: Measure): OptimalRunLengths {
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
  const candidates = new Map<string, SizeRunLengths[]>();
  for (const [sizeKey, list] of bySize) {
    const [family, kind, method, n] = sizeKey.split(sep) as [string, MethodKind, string, string];
    const sk = seriesKey(family, kind, method);
    if (!candidates.has(sk)) candidates.set(sk, []);
    const points: Array<{ runLength: number; tts: number | null }> = [];
    candidates.get(sk)!.push({ n: Number(n), points });
    if (list.length === 1) {
      optimal.add(list[0]!.key);
      if (list[0]!.runLength !== null) points.push({ runLength: list[0]!.runLength, tts: null });
      continue;
    }
    const seriesMeasures = c.measures.get(seriesKey(family, kind, method)) ?? new Set<Measure>();
    // Amplified solvers: the run length that needs the fewest classical steps in all (longer runs always need
    // fewer amplified runs); the spectral b: the fewest queries.
    const preference = kind === "predictor" ? ["expected_work", "queries"] : [preferred, "tts_work", "tts_ns", "work", "cpu_ns"];
    const measure = preference.find((m) => seriesMeasures.has(m as Measure)) as Measure | undefined;
    let best: { key: string; value: number; defined: boolean; runLength: number } | null = null;
    for (const { runLength, key } of list) {
      const group = measure === undefined ? undefined : c.groups.get(key + sep + measure);
      if (group === undefined || group.obs.size === 0) {
        // Scanned but without a value (every instance missing or an error): still a point of the grid.
        if (runLength !== null) points.push({ runLength, tts: null });
        continue;
      }
      const s = sampleOf(group);
      const med = censoredQuantile(s.values, s.censored, 0.5);
      const defined = med.value !== null;
      const value = defined ? med.value! : med.lower;
      const rl = runLength ?? -Infinity;
      if (runLength !== null) points.push({ runLength, tts: defined ? value : null });
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
  const scanned = new Map([...candidates].map(([k, list]) => [k, list.map((g) => ({ n: g.n, points: [...g.points] }))]));
  const derived: Group[] = [];
  const superseded = new Set<string>();
  const fineGrid = new Set<string>();
  for (const [sizeKey, list] of bySize) {
    const [family, kind, method, nText] = sizeKey.split(sep) as [string, MethodKind, string, string];
    if (kind !== "solver") continue;
    const n = Number(nText);
    // The cell with the largest cap whose every instance with a TTS carries a distribution.
    let source: { key: string; cap: number; dists: Map<number, InstanceDistribution> } | null = null;
    for (const { runLength, key } of list) {
      const dists = c.distributions.get(key);
      const tts = c.groups.get(key + sep + "tts_work");
      if (runLength === null || dists === undefined || dists.size === 0 || tts === undefined || tts.obs.size === 0) continue;
      if (![...tts.obs.keys()].every((i) => dists.has(i))) continue;
      if (source === null || runLength > source.cap) source = { key, cap: runLength, dists };
    }
    if (source === null) continue;
    const instances = new Map([...source.dists].filter(([i]) => c.groups.get(source!.key + sep + "tts_work")!.obs.has(i)));
    const choice = chooseCutoffOnGrid(instances);
    if (choice.cutoff === null) continue; // nothing solved within the cap: keep the rows' own TTS lower bounds
    const sk = seriesKey(family, kind, method);
    const sizeGrid = candidates.get(sk)?.find((g) => g.n === n);
    if (sizeGrid !== undefined) (sizeGrid.points as Array<{ runLength: number; tts: number | null }>).splice(0, Infinity, ...choice.points);
    for (const { key } of list) {
      optimal.delete(key);
      flags.delete(key);
    }
    optimal.add(source.key);
    superseded.add(source.key);
    fineGrid.add(sk);
    const seriesMeasures = c.measures.get(sk) ?? new Set<Measure>();
    for (const measure of ["tts_work", "tts_ns"] as const) {
      if (!seriesMeasures.has(measure)) continue;
      const obs = new Map<number, Observation>();
      const missing = new Set<number>();
      for (const [i, v] of choice.atChoice) {
        const value = measure === "tts_work" ? v.work : v.ns;
        if (Number.isFinite(value)) obs.set(i, { value, censored: v.censored });
        else missing.add(i);
      }
      derived.push({ family, kind, method, runLength: choice.cutoff, n, measure, obs, missing, derivedFrom: source.cap });
    }
  }
  return { optimal, flags, candidates, derived, superseded, fineGrid, scanned };
}

/** How the fine-grid rule is worded in fits.csv and sizes.csv. */
export const FINE_GRID_RULE = `per-size optimal cut-off from the run-length distributions (${RLD_GRID_PER_DECADE} per decade from 1 flip to the cap; smallest median tts_work)`;
