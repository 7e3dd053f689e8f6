/**
 * The three figures of a family (issue 13: figures on a common footing, no mixed units on one axis):
 * - work-FAMILY.svg: log₂ median work, classical elementary operations to solution (assignments evaluated, flips,
 *   spin-update attempts) and quantum oracle queries (amplified solvers: steps inside the amplified runs), with
 *   the fitted lines over the sizes each fit used;
 * - time-FAMILY.svg: classical seconds to solution divided by the stated parallelism S against predicted quantum
 *   seconds under the cost model, fitted lines extended (faint) to the crossover n*, which is marked;
 * - instances-FAMILY.svg: per-instance classical TTS against the per-instance predicted quantum seconds at the
 *   largest size with both, one series per predictor, Spearman's rank correlation in the legend.
 * Censored medians are open markers at their lower bound ("at least"), never dropped; defined medians are filled.
 * Every method keeps its style (style.ts) in every figure; the x axis says what n counts.
 */
import { sampleRankCorrelation } from "simple-statistics";
import type { SizeRow } from "../sizes.js";
import type { FitRow } from "../fits.js";
import { amplifiedSource, ownMeasure, type ComparisonRow } from "../comparison.js";
import type { Measure } from "../observations.js";
import type { Tables } from "../tables.js";
import { styleOf } from "./style.js";
import { renderSvg } from "./render.js";

/** What the figures need besides the tables. */
export interface FigureContext {
  readonly family: string;
  /** What n counts: "variables" (CNF) or "spins". */
  readonly nCounts: "variables" | "spins";
  /** Classical parallelism S. */
  readonly parallelism: number;
  /** Cost model: predicted seconds per query of a predictor at size n. */
  readonly secondsPerQuery: (family: string, predictor: string, n: number) => number;
  /** Settings line for captions. */
  readonly settings: string;
}

/** One drawn series: a method in one measure. */
interface Series {
  readonly label: string;
  readonly method: string;
  readonly kind: "solver" | "predictor";
  readonly measure: Measure;
}

type Datum = Record<string, number | string | boolean | null>;

/** Classical work measures in order of preference; the same rule as comparison.csv. */
const WORK_SOLVER: ReadonlyArray<Measure> = ["tts_work", "work"];
const TIME_SOLVER: ReadonlyArray<Measure> = ["tts_ns", "cpu_ns"];

function pickSeries(rows: ReadonlyArray<SizeRow>, solverMeasures: ReadonlyArray<Measure>, predictorMeasure: (m: string) => Measure, unit: (m: Measure) => string): Series[] {
  const methods = [...new Set(rows.map((r) => `${r.method_kind}\u0000${r.method}`))].sort((a, b) =>
    a.startsWith("solver") === b.startsWith("solver") ? a.localeCompare(b) : a.startsWith("solver") ? -1 : 1,
  );
  const out: Series[] = [];
  for (const key of methods) {
    const [kind, method] = key.split("\u0000") as ["solver" | "predictor", string];
    const prefs = kind === "solver" ? solverMeasures : [predictorMeasure(method)];
    const measure = prefs.find((m) => rows.some((r) => r.method_kind === kind && r.method === method && r.measure === m && (r.median !== null || r.median_at_least !== null)));
    if (measure === undefined) continue;
    out.push({ label: `${method} (${unit(measure)})`, method, kind, measure });
  }
  return out;
}

/** Points of a series: defined medians (filled) and censored ones at their lower bound (open). */
function seriesPoints(rows: ReadonlyArray<SizeRow>, s: Series, transform: (value: number, n: number) => number): Datum[] {
  const out: Datum[] = [];
  for (const r of rows) {
    if (r.method_kind !== s.kind || r.method !== s.method || r.measure !== s.measure) continue;
    const censored = r.median === null;
    const v = censored ? r.median_at_least : r.median;
    if (v === null || !(v > 0)) continue;
    const lo = r.median_low;
    const hi = r.median_high;
    out.push({
      series: s.label,
      n: r.n,
      y: Math.log2(transform(v, r.n)),
      ylo: !censored && lo !== null && lo > 0 ? Math.log2(transform(lo, r.n)) : null,
      yhi: !censored && hi !== null && hi > 0 ? Math.log2(transform(hi, r.n)) : null,
      censored,
    });
  }
  return out;
}

function scales(series: ReadonlyArray<Series>): { domain: string[]; colours: string[]; shapes: string[]; dashes: number[][] } {
  return {
    domain: series.map((s) => s.label),
    colours: series.map((s) => styleOf(s.method).colour),
    shapes: series.map((s) => styleOf(s.method).shape),
    dashes: series.map((s) => [...styleOf(s.method).dash]),
  };
}

/** The layered vega-lite spec shared by the work and time figures. */
function scalingSpec(args: {
  title: string;
  caption: string[];
  yTitle: string;
  nTitle: string;
  series: ReadonlyArray<Series>;
  points: ReadonlyArray<Datum>;
  lines: ReadonlyArray<Datum>;
  extra?: unknown[];
}): unknown {
  const sc = scales(args.series);
  const fitted = new Set(args.lines.map((l) => String(l["fit"])));
  const legend = { orient: "right", labelFontSize: 12, titleFontSize: 12, labelLimit: 400, titleLimit: 400, symbolStrokeWidth: 2 };
  const x = { field: "n", type: "quantitative", title: args.nTitle, scale: { zero: false, nice: false, padding: 12 }, axis: { format: "d", tickMinStep: 1 } };
  const colour = { field: "series", type: "nominal", scale: { domain: sc.domain, range: sc.colours }, legend: { ...legend, title: "median (filled), censored (open)", symbolSize: 90 } };
  const shape = { field: "series", type: "nominal", scale: { domain: sc.domain, range: sc.shapes }, legend: { ...legend, title: "median (filled), censored (open)", symbolSize: 90 } };
  // A field of its own keeps the dash legend apart from the merged colour-and-shape legend; its symbols take the
  // series colour through the shared colour scale (vega's compiled name "color").
  const dash = {
    field: "fit",
    type: "nominal",
    scale: { domain: sc.domain.filter((d) => fitted.has(d)), range: sc.dashes.filter((_, i) => fitted.has(sc.domain[i]!)) },
    legend: {
      ...legend,
      title: "fitted line",
      symbolType: "stroke",
      symbolSize: 600,
      encode: { symbols: { update: { stroke: { scale: "color", field: "value" }, strokeWidth: { value: 2 } } } },
    },
  };
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    title: { text: args.title, subtitle: args.caption.flatMap((c) => wrap(c, 120)), fontSize: 15, subtitleFontSize: 11, anchor: "start" },
    width: 560,
    height: 380,
    background: "white",
    config: { font: "Helvetica, Arial, sans-serif", axis: { labelFontSize: 12, titleFontSize: 13, grid: true, gridColor: "#e6e6e6" }, view: { stroke: "#888" } },
    layer: [
      {
        data: { values: args.lines },
        mark: { type: "line", strokeWidth: 2, clip: true },
        encoding: {
          x,
          y: { field: "y", type: "quantitative", title: args.yTitle, scale: { zero: false } },
          color: colour,
          strokeDash: dash,
          detail: { field: "segment", type: "nominal" },
          opacity: { field: "opacity", type: "quantitative", scale: null, legend: null },
        },
      },
      {
        data: { values: args.points.filter((p) => p["ylo"] !== null && p["yhi"] !== null) },
        mark: { type: "rule", strokeWidth: 1.2 },
        encoding: { x, y: { field: "ylo", type: "quantitative" }, y2: { field: "yhi" }, color: colour },
      },
      {
        data: { values: args.points.filter((p) => p["censored"] === false) },
        mark: { type: "point", filled: true, size: 70, strokeWidth: 1.6, opacity: 1 },
        encoding: { x, y: { field: "y", type: "quantitative" }, color: colour, shape },
      },
      {
        data: { values: args.points.filter((p) => p["censored"] === true) },
        mark: { type: "point", filled: false, size: 90, strokeWidth: 1.8, opacity: 1 },
        encoding: { x, y: { field: "y", type: "quantitative" }, color: colour, shape },
      },
      ...(args.extra ?? []),
    ],
    resolve: { scale: { color: "shared", shape: "shared", strokeDash: "shared" } },
  };
}

const WORK_UNIT = (m: Measure): string =>
  m === "tts_work" ? "work to solution" : m === "work" ? "work" : m === "queries" ? "oracle queries" : m === "runtime_scale" ? "time scale 1/gap², not operations" : "work in amplified runs";

/** work-FAMILY.svg (see the module comment). */
export async function workFigureSvg(sizes: ReadonlyArray<SizeRow>, fits: ReadonlyArray<FitRow>, ctx: FigureContext): Promise<string> {
  const rows = sizes.filter((r) => r.family === ctx.family && r.optimal_run_length);
  // A predictor with its own measure (adiabatic 1/gap²) is drawn in it and its label says it is not an operation count.
  const series = pickSeries(rows, WORK_SOLVER, (m) => (ownMeasure(m)?.column as Measure | undefined) ?? (amplifiedSource(m) !== null ? "expected_work" : "queries"), WORK_UNIT);
  const points = series.flatMap((s) => seriesPoints(rows, s, (v) => v));
  const lines: Datum[] = [];
  for (const s of series) {
    const f = fits.find((x) => x.family === ctx.family && x.method === s.method && x.method_kind === s.kind && x.measure === s.measure && x.quantile === 0.5);
    if (f === undefined || f.exponent === null || f.intercept === null || f.n_from === null || f.n_to === null) continue;
    for (const n of [f.n_from, f.n_to]) lines.push({ series: s.label, fit: s.label, segment: `${s.label} fit`, n, y: f.exponent * n + f.intercept, opacity: 1 });
  }
  return renderSvg(
    scalingSpec({
      title: `${ctx.family}: work, classical operations against quantum queries (median over instances)`,
      caption: [
        "Classical: assignments evaluated (exhaustive), flips (walk), spin-update attempts (anneal), to a 99 % solution; quantum: oracle queries,",
        "amplified solvers in the elementary operations (expected_work) of their reversible trial runs. Bars: 95 % bootstrap intervals. Open markers: median censored, drawn at its lower bound.",
      ],
      yTitle: "log2 median operations",
      nTitle: `n (${ctx.nCounts})`,
      series,
      points,
      lines,
    }),
  );
}

/** time-FAMILY.svg (see the module comment). */
export async function timeFigureSvg(
  sizes: ReadonlyArray<SizeRow>,
  fits: ReadonlyArray<FitRow>,
  comparison: ReadonlyArray<ComparisonRow>,
  ctx: FigureContext,
): Promise<string> {
  const rows = sizes.filter((r) => r.family === ctx.family && r.optimal_run_length);
  const unit = (m: Measure): string => (m === "tts_ns" ? "s to solution / S" : m === "cpu_ns" ? "CPU s / S" : "predicted s");
  const series = pickSeries(rows, TIME_SOLVER, () => "queries", unit);
  const toSeconds = (s: Series) => (v: number, n: number): number =>
    s.kind === "solver" ? (v * 1e-9) / ctx.parallelism : v * ctx.secondsPerQuery(ctx.family, s.method, n);
  const points = series.flatMap((s) => seriesPoints(rows, s, toSeconds(s)));
  // Crossovers of the rated time rows; the x range reaches the largest one so the extrapolation is visible.
  const crossings = comparison.filter((c) => c.family === ctx.family && c.basis === "time" && c.rated && c.crossover_n !== null && c.crossover_seconds !== null);
  const measuredMax = Math.max(...rows.map((r) => r.n));
  const xMax = Math.max(measuredMax, ...crossings.map((c) => Math.ceil(c.crossover_n!)));
  const lines: Datum[] = [];
  for (const s of series) {
    const f = fits.find((x) => x.family === ctx.family && x.method === s.method && x.method_kind === s.kind && x.measure === s.measure && x.quantile === 0.5);
    if (f === undefined || f.exponent === null || f.intercept === null || f.n_from === null || f.n_to === null) continue;
    const yAt = (n: number): number => {
      const log2 = f.exponent! * n + f.intercept!;
      return s.kind === "solver" ? log2 - Math.log2(1e9) - Math.log2(ctx.parallelism) : log2 + Math.log2(ctx.secondsPerQuery(ctx.family, s.method, n));
    };
    const steps = 24;
    const segment = (from: number, to: number, name: string, opacity: number): void => {
      for (let i = 0; i <= steps; i++) {
        const n = from + ((to - from) * i) / steps;
        lines.push({ series: s.label, fit: s.label, segment: `${s.label} ${name}`, n, y: yAt(n), opacity });
      }
    };
    segment(f.n_from, f.n_to, "fit", 1);
    if (xMax > f.n_to) segment(f.n_to, xMax, "extrapolated", 0.35);
  }
  const marks: Datum[] = crossings.map((c) => ({
    n: c.crossover_n!,
    y: Math.log2(c.crossover_seconds!),
    text: `n* = ${c.crossover_n!.toFixed(1)}${c.extrapolated ? " (extrapolated)" : ""}: ${c.solver} vs ${c.predictor}`,
  }));
  const extra = marks.length === 0 ? [] : [
    { data: { values: marks }, mark: { type: "rule", strokeDash: [3, 3], color: "#333" }, encoding: { x: { field: "n", type: "quantitative" } } },
    {
      data: { values: marks },
      mark: { type: "text", align: "right", dx: -4, dy: -8, fontSize: 11, color: "#000" },
      encoding: { x: { field: "n", type: "quantitative" }, y: { field: "y", type: "quantitative" }, text: { field: "text" } },
    },
  ];
  return renderSvg(
    scalingSpec({
      title: `${ctx.family}: time, measured classical seconds against predicted quantum seconds (median)`,
      caption: [
        `Classical: measured time to a 99 % solution (or wall time), divided by the classical parallelism S = ${ctx.parallelism}. Quantum: predicted queries x Toffolis per query x Toffoli time.`,
        `Faint lines: fitted lines extrapolated beyond the measured n <= ${measuredMax}; n* marks a crossover of a rated row. Assumptions: ${ctx.settings}.`,
      ],
      yTitle: "log2 median seconds",
      nTitle: `n (${ctx.nCounts})`,
      series,
      points,
      lines,
      extra,
    }),
  );
}

/**
 * instances-FAMILY.svg: at the largest size where the compared classical solver and a predictor both have
 * per-instance values, classical TTS (s) against predicted quantum seconds per instance; the legend gives
 * Spearman's rank correlation ρ per predictor (simple-statistics' sampleRankCorrelation).
 */
export async function instancesFigureSvg(tables: Tables, sizes: ReadonlyArray<SizeRow>, ctx: FigureContext): Promise<string> {
  const rows = sizes.filter((r) => r.family === ctx.family && r.optimal_run_length && r.method_kind === "solver" && r.measure === "tts_ns" && (r.median !== null || r.median_at_least !== null));
  // The classical solver: the one with the smallest median TTS at its largest size (a per-size choice that needs no fit).
  const largest = rows.reduce((m, r) => Math.max(m, r.n), -Infinity);
  const atLargest = rows.filter((r) => r.n === largest).sort((a, b) => (a.median ?? a.median_at_least ?? Infinity) - (b.median ?? b.median_at_least ?? Infinity));
  const solverRow = atLargest[0];
  const data: Datum[] = [];
  const series: Series[] = [];
  let caption = "no classical solver with a time to solution at any size";
  if (solverRow !== undefined) {
    const n = solverRow.n;
    const classical = new Map<number, { v: number; censored: boolean }>();
    for (const r of tables.runs) {
      if (r.family !== ctx.family || r.solver !== solverRow.method || r.n !== n || r.run_length !== solverRow.run_length) continue;
      if (r.status === "error" || r.status === "wrong" || r.status === "skipped") continue;
      const censored = r.status === "censored" || r.successes === 0;
      const v = censored ? (r.tts_ns_low ?? r.cpu_ns) : r.tts_ns;
      if (v !== null && v > 0) classical.set(r.instance, { v: (v * 1e-9) / ctx.parallelism, censored });
    }
    const predictors = [...new Set(tables.predictions.filter((p) => p.n === n && p.family === ctx.family).map((p) => p.predictor))].sort();
    const labels: string[] = [];
    for (const predictor of predictors) {
      // Predictors with run lengths (amplified solvers, the spectral b): the size's optimal one only.
      const chosen = sizes.find((r) => r.method_kind === "predictor" && r.method === predictor && r.n === n && r.optimal_run_length && r.run_length !== null);
      const xs: number[] = [];
      const ys: number[] = [];
      const pts: Datum[] = [];
      for (const p of tables.predictions) {
        if (p.predictor !== predictor || p.n !== n || p.status !== "ok" || p.queries === null || !(p.queries > 0)) continue;
        // A scan's rows (the spectral b): only the one marked best; amplified solvers: the optimal run length.
        if (p.b_best === false) continue;
        if (chosen !== undefined && amplifiedSource(predictor) !== null && p.run_length !== chosen.run_length) continue;
        const c = classical.get(p.instance);
        if (c === undefined) continue;
        const q = p.queries * ctx.secondsPerQuery(ctx.family, predictor, n);
        xs.push(c.v);
        ys.push(q);
        pts.push({ x: Math.log2(c.v), y: Math.log2(q), censored: c.censored, instance: p.instance });
      }
      if (pts.length === 0) continue;
      const rho = xs.length >= 3 && new Set(ys).size > 1 && new Set(xs).size > 1 ? sampleRankCorrelation(xs, ys) : NaN;
      const label = `${predictor} (Spearman rho = ${Number.isFinite(rho) ? rho.toFixed(2) : "undefined: constant"}, ${pts.length} instances)`;
      labels.push(label);
      series.push({ label, method: predictor, kind: "predictor", measure: "queries" });
      for (const p of pts) data.push({ ...p, series: label });
    }
    caption = `n = ${n} ${ctx.nCounts}; classical: ${solverRow.method} time to a 99 % solution (run length ${solverRow.run_length ?? "–"}) / S = ${ctx.parallelism}; ` +
      `quantum: predicted seconds under the cost model. Open markers: classical value censored (at least). Do both sides agree on which instances are hard?`;
  }
  const sc = scales(series);
  const legend = { orient: "bottom", direction: "vertical", labelFontSize: 12, titleFontSize: 12, labelLimit: 600, titleLimit: 600 };
  const colour = { field: "series", type: "nominal", scale: { domain: sc.domain, range: sc.colours }, legend: { ...legend, title: "predictor" } };
  const shape = { field: "series", type: "nominal", scale: { domain: sc.domain, range: sc.shapes }, legend: { ...legend, title: "predictor" } };
  const x = { field: "x", type: "quantitative", title: "log2 classical seconds to solution, per instance", scale: { zero: false } };
  const y = { field: "y", type: "quantitative", title: "log2 predicted quantum seconds, per instance", scale: { zero: false } };
  return renderSvg({
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    title: { text: `${ctx.family}: per-instance hardness, classical against quantum prediction`, subtitle: wrap(caption, 130), fontSize: 15, subtitleFontSize: 11, anchor: "start" },
    width: 520,
    height: 380,
    background: "white",
    config: { font: "Helvetica, Arial, sans-serif", axis: { labelFontSize: 12, titleFontSize: 13, grid: true, gridColor: "#e6e6e6" }, view: { stroke: "#888" } },
    layer: [
      { data: { values: data.filter((d) => d["censored"] === false) }, mark: { type: "point", filled: true, size: 60, opacity: 0.9 }, encoding: { x, y, color: colour, shape } },
      { data: { values: data.filter((d) => d["censored"] === true) }, mark: { type: "point", filled: false, size: 80, strokeWidth: 1.6 }, encoding: { x, y, color: colour, shape } },
    ],
    resolve: { scale: { color: "shared", shape: "shared" } },
  });
}

/** Splits text into lines of at most `width` characters at spaces (for subtitles). */
function wrap(text: string, width: number): string[] {
  const out: string[] = [];
  let line = "";
  for (const word of text.split(" ")) {
    if (line.length + word.length + 1 > width && line !== "") {
      out.push(line);
      line = word;
    } else line = line === "" ? word : `${line} ${word}`;
  }
  if (line !== "") out.push(line);
  return out;
}
