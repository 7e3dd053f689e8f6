import { describe, expect, it } from "vitest";
import { XMLParser, XMLValidator } from "fast-xml-parser";
import { instancesFigureSvg, timeFigureSvg, workFigureSvg, type FigureContext } from "../harness/report/plots/figures.js";
import { styleOf } from "../harness/report/plots/style.js";
import type { SizeRow } from "../harness/report/sizes.js";
import type { FitRow } from "../harness/report/fits.js";
import type { Measure } from "../harness/report/observations.js";
import type { ComparisonRow } from "../harness/report/comparison.js";
import type { Tables } from "../harness/report/tables.js";
import type { PredictionRow, RunRow } from "../harness/types.js";

type Node = Record<string, unknown>;

function sizeRow(family: string, method: string, kind: "solver" | "predictor", measure: Measure, n: number, log2: number, censored = false): SizeRow {
  const v = 2 ** log2;
  return {
    family, n, method_kind: kind, method, run_length: null, optimal_run_length: true, measure, instances: 20,
    censored: censored ? 12 : 0, errors: 0, median: censored ? null : v, median_low: censored ? null : v / 1.3,
    median_high: censored ? null : v * 1.3, q75: null, q75_low: null, q75_high: null, q90: null, q90_low: null, q90_high: null,
    median_at_least: censored ? v : null, floor_ns: null, resamples: 2000, flag: "",
  };
}

function fitRow(family: string, method: string, kind: "solver" | "predictor", measure: Measure, a: number, c: number): FitRow {
  return {
    family, method_kind: kind, method, measure, basis: measure.endsWith("_ns") ? "time" : "work", quantile: 0.5, exponent: a,
    exponent_low: a - 0.01, exponent_high: a + 0.01, base: 2 ** a, base_low: 2 ** (a - 0.01), base_high: 2 ** (a + 0.01),
    intercept: c, r2: 0.99, n_from: 16, n_to: 24, points: 5, poly_degree: null, aic_exponential: null, aic_polynomial: null,
    growth_model: "exponential", floor_factor: null, below_floor: "", exponent_status: "", run_length_rule: "", resamples: 2000, flag: "",
  };
}

function collect(nodes: Node[], tag: string, ancestors: string[] = [], out: Array<{ attrs: Record<string, string>; ancestors: string[] }> = []) {
  for (const node of nodes) {
    const name = Object.keys(node).find((k) => k !== ":@");
    if (name === undefined) continue;
    const attrs = (node[":@"] ?? {}) as Record<string, string>;
    if (name === tag) out.push({ attrs, ancestors });
    const children = node[name];
    if (Array.isArray(children)) collect(children as Node[], tag, [...ancestors, attrs["@_class"] ?? ""], out);
  }
  return out;
}

function textOf(nodes: Node[]): string {
  let s = "";
  for (const node of nodes) {
    for (const [k, v] of Object.entries(node)) {
      if (k === "#text") s += String(v) + " ";
      else if (k !== ":@" && Array.isArray(v)) s += textOf(v as Node[]);
    }
  }
  return s;
}

function parse(svg: string): Node[] {
  // Well-formed XML (fast-xml-parser's validator) with an <svg> root.
  expect(XMLValidator.validate(svg)).toBe(true);
  const tree = new XMLParser({ ignoreAttributes: false, preserveOrder: true }).parse(svg) as Node[];
  expect(tree.some((n) => "svg" in n)).toBe(true);
  return tree;
}

/** Symbols of point marks (vega: <path> inside a "mark-symbol role-mark" group), legend symbols excluded. */
function markSymbols(tree: Node[]) {
  return collect(tree, "path").filter((p) => /mark-symbol role-mark/.test(p.ancestors.at(-1) ?? "") && !p.ancestors.some((a) => /legend/.test(a)));
}

const ctx = (family: string, nCounts: "variables" | "spins"): FigureContext => ({
  family, nCounts, parallelism: 1, secondsPerQuery: () => 1e-3, settings: "test settings",
});

function study(family: string): { sizes: SizeRow[]; fits: FitRow[] } {
  const sizes: SizeRow[] = [];
  for (let n = 12; n <= 24; n += 2) {
    sizes.push(sizeRow(family, "exhaustive", "solver", "tts_work", n, 0.3 * n + 2));
    sizes.push(sizeRow(family, "walk", "solver", "tts_work", n, 0.4 * n + 3, n === 24)); // largest size censored
    sizes.push(sizeRow(family, "grover", "predictor", "queries", n, 0.5 * n));
    sizes.push(sizeRow(family, "exhaustive", "solver", "tts_ns", n, 0.3 * n + 12));
  }
  const fits = [
    fitRow(family, "exhaustive", "solver", "tts_work", 0.3, 2),
    fitRow(family, "walk", "solver", "tts_work", 0.4, 3),
    fitRow(family, "grover", "predictor", "queries", 0.5, 0),
    fitRow(family, "exhaustive", "solver", "tts_ns", 0.3, 12),
  ];
  return { sizes, fits };
}

describe("work figure", () => {
  it("one mark series per method, censored medians open at their bound, fitted lines, x axis names what n counts", async () => {
    const { sizes, fits } = study("ksat");
    const tree = parse(await workFigureSvg(sizes, fits, ctx("ksat", "variables")));
    const symbols = markSymbols(tree);
    // 3 methods × 7 sizes, none dropped (the censored walk median at n = 24 is drawn).
    expect(symbols).toHaveLength(3 * 7);
    // Filled medians carry their colour as fill; the censored one is open: a stroke and no fill of its own (vega
    // leaves the attribute out; the root group's fill="none" applies).
    const open = symbols.filter((s) => s.attrs["@_fill"] === undefined);
    expect(open).toHaveLength(1);
    expect(open[0]!.attrs["@_stroke"]).toBe(styleOf("walk").colour);
    // One shape per method (distinct path data), one colour per method, each the method's fixed style.
    const filledColours = new Set(symbols.filter((s) => !open.includes(s)).map((s) => s.attrs["@_fill"]));
    expect(filledColours).toEqual(new Set(["exhaustive", "walk", "grover"].map((m) => styleOf(m).colour)));
    // Three fitted lines, each with its own dash pattern (legible in grey).
    const lines = collect(tree, "path").filter((p) => /mark-line role-mark/.test(p.ancestors.at(-1) ?? "") && !p.ancestors.some((a) => /legend/.test(a)));
    expect(lines).toHaveLength(3);
    const text = textOf(tree);
    expect(text).toContain("n (variables)");
    expect(text).toContain("log2 median operations");
  });

  it("keeps each method's style in every family's figure", async () => {
    const a = study("ksat");
    const b = study("sk");
    const left = markSymbols(parse(await workFigureSvg(a.sizes, a.fits, ctx("ksat", "variables"))));
    // The sk study lacks walk: the remaining methods must keep their colours and shapes.
    const rightTree = parse(await workFigureSvg(b.sizes.filter((r) => r.method !== "walk"), b.fits, ctx("sk", "spins")));
    const right = markSymbols(rightTree);
    const shapeOf = (list: typeof left, colour: string) => new Set(list.filter((s) => s.attrs["@_fill"] === colour).map((s) => s.attrs["@_d"]));
    for (const m of ["exhaustive", "grover"]) {
      expect(shapeOf(right, styleOf(m).colour)).toEqual(shapeOf(left, styleOf(m).colour));
      expect(shapeOf(right, styleOf(m).colour).size).toBe(1);
    }
    expect(textOf(rightTree)).toContain("n (spins)");
  });
});

describe("time figure", () => {
  it("marks the crossover and labels it an extrapolation", async () => {
    const { sizes, fits } = study("ksat");
    const crossing: ComparisonRow = {
      family: "ksat", basis: "time", solver: "exhaustive", predictor: "grover", quantile: 0.5, classical_measure: "tts_ns",
      quantum_measure: "seconds (predicted)", exponent_classical: 0.3, exponent_classical_low: 0.29, exponent_classical_high: 0.31,
      exponent_quantum: 0.5, exponent_quantum_low: 0.49, exponent_quantum_high: 0.51, exponent_ratio: 0.6, exponent_ratio_low: 0.57,
      exponent_ratio_high: 0.63, n_from: 16, n_to: 24, rated: true, strongest_classical: true, speedup_label: "quantum slower",
      better_than_grover: false, parallelism: 1, crossover_n: 40.5, crossover_seconds: 2 ** 10, crossover: "crossing",
      extrapolated: true, flags: "extrapolated", note: "",
    };
    const tree = parse(await timeFigureSvg(sizes, fits, [crossing], ctx("ksat", "variables")));
    const text = textOf(tree);
    expect(text).toContain("n* = 40.5 (extrapolated)");
    expect(text).toContain("log2 median seconds");
    // Two methods (exhaustive seconds, grover predicted seconds) × 7 sizes.
    expect(markSymbols(tree)).toHaveLength(2 * 7);
  });
});

describe("instances figure", () => {
  it("prints Spearman's rank correlation of per-instance classical and quantum costs", async () => {
    // Five instances; quantum ranks equal the classical ones except one adjacent swap: Σd² = 2, so
    // ρ = 1 − 6·Σd²/(m(m² − 1)) = 1 − 12/120 = 0.9 (Spearman's formula without ties).
    const n = 20;
    const runs: RunRow[] = [1, 2, 3, 4, 5].map((k, i) => ({
      family: "sk", n, instance: i, solver: "anneal", run_length: 100, status: "ok", wall_ns: 1e6 * k, cpu_ns: 1e6 * k, work: 1, floor_ns: null,
      trials: 10, successes: 5, trial_success_p: 0.5, trial_success_p_low: 0.2, trial_success_p_high: 0.8, work_per_trial: 1, wall_ns_per_trial: 1, tts_ns: 1e6 * k,
      tts_ns_low: null, tts_ns_high: null, tts_work: 1, tts_work_low: null, message: "",
    }));
    const q = [1, 3, 2, 4, 5];
    const predictions: PredictionRow[] = q.map((v, i) => ({ family: "sk", n, instance: i, predictor: "min-finding", status: "ok", queries: 100 * v, queries_log2: null, queries_low: null, queries_high: null }));
    const tables: Tables = { instances: [], runs, predictions };
    const sizes = [{ ...sizeRow("sk", "anneal", "solver", "tts_ns", n, 21), run_length: 100 }];
    const tree = parse(await instancesFigureSvg(tables, sizes, ctx("sk", "spins")));
    expect(textOf(tree)).toContain("Spearman rho = 0.90");
    expect(markSymbols(tree)).toHaveLength(5);
  });
});
