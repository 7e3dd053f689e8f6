import { describe, expect, it } from "vitest";
import { XMLParser, XMLValidator } from "fast-xml-parser";
import { scalingPlotSvg } from "../harness/report/plot.js";
import type { FitRow, Measure, SizeRow } from "../harness/report/summarise.js";

type Node = Record<string, unknown>;

function sizeRow(family: string, method: string, kind: "solver" | "predictor", measure: Measure, n: number, log2: number, runLength: number | null = null, optimal = true): SizeRow {
  const v = 2 ** log2;
  return {
    family, n, method_kind: kind, method, run_length: runLength, optimal_run_length: optimal, measure, instances: 20,
    censored: 0, errors: 0, median: v, median_low: v / 1.3, median_high: v * 1.3, q75: v * 1.5, q75_low: v * 1.2,
    q75_high: v * 1.9, q90: v * 2, q90_low: v * 1.5, q90_high: v * 2.6, resamples: 2000, flag: "",
  };
}

function fitRow(family: string, method: string, kind: "solver" | "predictor", measure: Measure, a: number, c: number): FitRow {
  return {
    family, method_kind: kind, method, measure, quantile: 0.5, exponent: a, exponent_low: a - 0.01, exponent_high: a + 0.01,
    base: 2 ** a, base_low: 2 ** (a - 0.01), base_high: 2 ** (a + 0.01), intercept: c, r2: 0.99, n_from: 16, n_to: 24,
    points: 5, run_length_rule: "", resamples: 2000, flag: "",
  };
}

/** Every element named `tag` (with its attributes) in a preserveOrder parse tree, with the classes of its ancestors. */
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

describe("scaling plot", () => {
  it("is well-formed SVG with one fitted line per fitted series, distinct dashes and point shapes", async () => {
    const sizes: SizeRow[] = [];
    for (let n = 12; n <= 24; n += 2) {
      sizes.push(sizeRow("ksat", "exhaustive", "solver", "wall_ns", n, n + 1));
      sizes.push(sizeRow("ksat", "walk", "solver", "tts_ns", n, 0.4 * n + 8));
      sizes.push(sizeRow("ksat", "anneal", "solver", "tts_ns", n, 0.3 * n + 10, 100, true));
      sizes.push(sizeRow("ksat", "anneal", "solver", "tts_ns", n, 0.2 * n + 14, 1000, false)); // not drawn
      sizes.push(sizeRow("ksat", "grover", "predictor", "queries", n, 0.5 * n));
      sizes.push(sizeRow("ksat", "amplified-walk", "predictor", "queries", n, 0.2 * n + 3));
      sizes.push(sizeRow("sk", "exhaustive", "solver", "wall_ns", n, n)); // other family: not drawn
    }
    const fits = [
      fitRow("ksat", "exhaustive", "solver", "wall_ns", 1, 1),
      fitRow("ksat", "walk", "solver", "tts_ns", 0.4, 8),
      fitRow("ksat", "anneal", "solver", "tts_ns", 0.3, 10),
      fitRow("ksat", "grover", "predictor", "queries", 0.5, 0),
      // amplified-walk: no fit row → points but no line.
      fitRow("sk", "exhaustive", "solver", "wall_ns", 1, 0),
    ];
    const svg = await scalingPlotSvg(sizes, fits, "ksat");

    // Well-formed XML (fast-xml-parser's validator) with an <svg> root.
    expect(XMLValidator.validate(svg)).toBe(true);
    const tree = new XMLParser({ ignoreAttributes: false, preserveOrder: true }).parse(svg) as Node[];
    expect(tree.some((n) => "svg" in n)).toBe(true);

    // vega draws each series of a line mark as one <path> inside a "mark-line role-mark" group.
    const paths = collect(tree, "path");
    const linePaths = paths.filter((p) => /mark-line role-mark/.test(p.ancestors.at(-1) ?? ""));
    expect(linePaths).toHaveLength(4); // four fitted series in family ksat
    // Black-and-white legibility: every fitted series has its own dash pattern (common practice for print).
    expect(new Set(linePaths.map((p) => p.attrs["@_stroke-dasharray"])).size).toBe(4);
    // Points: one shape per series (5 series drawn; the 1000-sweep anneal rows and family sk are left out).
    const points = paths.filter((p) => /mark-symbol role-mark/.test(p.ancestors.at(-1) ?? ""));
    expect(points).toHaveLength(5 * 7);
    expect(new Set(points.map((p) => p.attrs["@_d"])).size).toBe(5);
    // Interval bars: one rule per point.
    const bars = collect(tree, "line").filter((l) => /mark-rule role-mark/.test(l.ancestors.at(-1) ?? ""));
    expect(bars).toHaveLength(5 * 7);

    // The measure is on the axis title.
    const text = textOf(tree);
    expect(text).toContain("log₂ median cost");
    expect(text).toContain("ns");
    expect(text).toContain("queries");
  });
});
