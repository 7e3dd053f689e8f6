/**
 * scaling-FAMILY.svg: log₂ cost against n for every solver and predictor of a family, with the per-size quantile
 * and its bootstrap interval as points with bars, and the fitted lines over the sizes each fit used.
 *
 * Rendered on the server: a vega-lite specification compiled to vega and drawn by vega's `View.toSVG()` with the
 * "none" renderer (no canvas, no browser). Legible in black and white: each series has its own point shape and
 * its own dash pattern as well as its own colour, and the legend shows all three.
 */
import { compile, type TopLevelSpec } from "vega-lite";
import { parse, View } from "vega";
import type { FitRow, Measure, SizeRow } from "./summarise.js";
import { quantileName } from "../stats/quantiles.js";

/** Options of {@link scalingPlotSvg}. */
export interface PlotOptions {
  /** Quantile drawn: 0.5 (default), 0.75 or 0.9. */
  readonly quantile?: 0.5 | 0.75 | 0.9;
  /** Solver measures in order of preference (the first a solver has is drawn); default tts_ns, wall_ns. */
  readonly solverMeasures?: ReadonlyArray<Measure>;
  /** Predictor measure; default queries. */
  readonly predictorMeasure?: Measure;
  /** Plot area in pixels; default 560 × 380. */
  readonly width?: number;
  readonly height?: number;
  /** Receives vega-lite and vega warnings (never printed); default: dropped. */
  readonly onWarning?: (message: string) => void;
}

/** Point shapes, one per series, in series order (vega symbol names); beyond ten series styles repeat. */
const SHAPES = [
  "circle",
  "square",
  "triangle-up",
  "diamond",
  "cross",
  "triangle-down",
  "M-1,-1L1,1M-1,1L1,-1", // a saltire (×): vega's "wedge" and "arrow" are too thin to read at point size
  "triangle-right",
  "M0,-1L0.866,-0.5L0.866,0.5L0,1L-0.866,0.5L-0.866,-0.5Z", // hexagon
  "triangle-left",
];
/** Dash patterns, one per series: solid, dashed, dotted, dash-dot, long dash, … (pixels on, off). */
const DASHES: number[][] = [[1, 0], [8, 4], [2, 3], [10, 3, 2, 3], [14, 4], [4, 2], [10, 3, 2, 3, 2, 3], [2, 6], [16, 3, 4, 3], [6, 6]];
/** Colours: the Okabe–Ito palette without its yellow (too faint on white), then two dark extras. */
const COLOURS = ["#000000", "#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#882255", "#6A3D9A", "#999999"];

const SHORT: Readonly<Record<Measure, string>> = {
  wall_ns: "wall time, ns",
  work: "steps",
  tts_ns: "TTS, ns",
  tts_work: "steps to solution",
  queries: "queries",
  steps: "steps in amplified runs",
};

interface Series {
  label: string;
  kind: "solver" | "predictor";
  method: string;
  measure: Measure;
}

/**
 * The scaling plot of one family as an SVG document.
 * @param sizesRows - sizes.csv rows (only each method's optimal run length is drawn).
 * @param fitsRows - fits.csv rows (the fit of the same measure and quantile gives the line).
 * @param family - the family to draw.
 */
export async function scalingPlotSvg(
  sizesRows: ReadonlyArray<SizeRow>,
  fitsRows: ReadonlyArray<FitRow>,
  family: string,
  options: PlotOptions = {},
): Promise<string> {
  const q = options.quantile ?? 0.5;
  const stem = quantileName(q) as "median" | "q75" | "q90";
  const solverMeasures = options.solverMeasures ?? ["tts_ns", "wall_ns"];
  const predictorMeasure = options.predictorMeasure ?? "queries";
  const rows = sizesRows.filter((r) => r.family === family && r.optimal_run_length);

  // 1. One series per method: its preferred measure.
  const series: Series[] = [];
  const methods = [...new Set(rows.map((r) => `${r.method_kind}\u0000${r.method}`))].sort((a, b) =>
    a.startsWith("solver") === b.startsWith("solver") ? a.localeCompare(b) : a.startsWith("solver") ? -1 : 1,
  );
  for (const key of methods) {
    const [kind, method] = key.split("\u0000") as ["solver" | "predictor", string];
    const prefs = kind === "solver" ? solverMeasures : [predictorMeasure];
    const measure = prefs.find((m) => rows.some((r) => r.method_kind === kind && r.method === method && r.measure === m && r[stem] !== null));
    if (measure === undefined) continue;
    series.push({ label: `${method} (${SHORT[measure]})`, kind, method, measure });
  }

  // 2. Data: points with bars, and the fitted segments.
  const points: Array<Record<string, number | string | null>> = [];
  const lines: Array<Record<string, number | string>> = [];
  for (const s of series) {
    for (const r of rows) {
      if (r.method_kind !== s.kind || r.method !== s.method || r.measure !== s.measure) continue;
      const v = r[stem];
      if (v === null || !(v > 0)) continue;
      const lo = r[`${stem}_low`];
      const hi = r[`${stem}_high`];
      points.push({
        series: s.label,
        n: r.n,
        y: Math.log2(v),
        ylo: lo !== null && lo > 0 ? Math.log2(lo) : null,
        yhi: hi !== null && hi > 0 ? Math.log2(hi) : null,
      });
    }
    const fit = fitsRows.find(
      (f) => f.family === family && f.method_kind === s.kind && f.method === s.method && f.measure === s.measure && f.quantile === q,
    );
    if (fit !== undefined && fit.exponent !== null && fit.intercept !== null && fit.n_from !== null && fit.n_to !== null) {
      for (const n of [fit.n_from, fit.n_to]) lines.push({ series: s.label, fit: s.label, n, y: fit.exponent * n + fit.intercept });
    }
  }
  const domain = series.map((s) => s.label);
  const unitOf = (m: Measure): string => (m.endsWith("_ns") ? "ns" : m === "queries" ? "queries" : "steps");
  const measuresShown = (["solver", "predictor"] as const)
    .map((k) => {
      const units = [...new Set(series.filter((s) => s.kind === k).map((s) => unitOf(s.measure)))];
      return units.length === 0 ? "" : `${k === "solver" ? "solvers" : "predictors"}: ${units.join(", ")}`;
    })
    .filter((t) => t !== "")
    .join(" · ");
  const yTitle = [`log₂ ${stem === "median" ? "median" : `${Math.round(q * 100)} % quantile of`} cost`, measuresShown || "no data"];
  const legendBase = { orient: "right" as const, labelFontSize: 12, titleFontSize: 12, labelLimit: 400, titleLimit: 400, symbolStrokeWidth: 2 };
  const pointLegend = { ...legendBase, title: "measured, 95 % bars", symbolSize: 110 };
  // The line legend is drawn in each series' colour through the shared colour scale (vega's compiled name "color").
  const lineLegend = {
    ...legendBase,
    title: "fitted (sizes used)",
    symbolType: "stroke",
    symbolSize: 600,
    encode: { symbols: { update: { stroke: { scale: "color", field: "value" }, strokeWidth: { value: 2 } } } },
  };
  const scale = (range: unknown[]) => ({ domain, range: range.slice(0, Math.max(1, domain.length)) });
  const x = { field: "n", type: "quantitative" as const, title: "n (variables)", scale: { zero: false, nice: false, padding: 12 }, axis: { format: "d", tickMinStep: 1 } };
  const seriesColour = { field: "series", type: "nominal" as const, scale: scale(COLOURS), legend: pointLegend };

  const spec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    title: { text: `${family}: scaling of the ${stem === "median" ? "median" : `${Math.round(q * 100)} % quantile`} over instances`, fontSize: 15 },
    width: options.width ?? 560,
    height: options.height ?? 380,
    background: "white",
    config: {
      font: "Helvetica, Arial, sans-serif",
      axis: { labelFontSize: 12, titleFontSize: 13, grid: true, gridColor: "#e6e6e6" },
      view: { stroke: "#888" },
    },
    layer: [
      {
        data: { values: lines },
        mark: { type: "line", strokeWidth: 2, clip: true },
        encoding: {
          x,
          y: { field: "y", type: "quantitative", title: yTitle, scale: { zero: false } },
          color: seriesColour,
          // A field of its own keeps the dash legend apart from the merged colour-and-shape legend.
          strokeDash: { field: "fit", type: "nominal", scale: scale(DASHES), legend: lineLegend },
        },
      },
      {
        data: { values: points.filter((p) => p["ylo"] !== null && p["yhi"] !== null) },
        mark: { type: "rule", strokeWidth: 1.2 },
        encoding: {
          x,
          y: { field: "ylo", type: "quantitative" },
          y2: { field: "yhi" },
          color: seriesColour,
        },
      },
      {
        data: { values: points },
        mark: { type: "point", filled: false, size: 70, strokeWidth: 1.6, opacity: 1 },
        encoding: {
          x,
          y: { field: "y", type: "quantitative" },
          color: seriesColour,
          shape: { field: "series", type: "nominal", scale: scale(SHAPES), legend: pointLegend },
        },
      },
    ],
    resolve: { scale: { color: "shared", shape: "shared", strokeDash: "shared" } },
  } as unknown as TopLevelSpec;

  const logger = collectingLogger(options.onWarning ?? (() => undefined));
  const view = new View(parse(compile(spec, { logger }).spec), { renderer: "none", logger });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}

type Logger = NonNullable<NonNullable<Parameters<typeof compile>[1]>["logger"]>;

/** A vega logger that hands warnings and errors to a callback instead of the console (the report is pure). */
function collectingLogger(onWarning: (message: string) => void): Logger {
  let level = 2; // vega's Warn
  const logger: Logger = {
    level(value?: number) {
      if (value === undefined) return level;
      level = value;
      return logger;
    },
    error(...args: unknown[]) {
      onWarning(args.map(String).join(" "));
      return logger;
    },
    warn(...args: unknown[]) {
      onWarning(args.map(String).join(" "));
      return logger;
    },
    info() {
      return logger;
    },
    debug() {
      return logger;
    },
  } as Logger;
  return logger;
}
