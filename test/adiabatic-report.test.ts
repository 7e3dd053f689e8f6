/**
 * The adiabatic predictor in a study's tables and verdict: skipped cells keep their reason, its measure is the time
 * scale 1/gap² (fitted as `runtime_scale` on its own basis, never in `queries`), and the comparison shows its exponent
 * but rates it on neither basis (the verdict rules compare like measures only: issue 13, README "Verdict rules").
 * The inputs are constructed so the expected values follow from the definitions (common practice).
 */
import { describe, expect, it } from "vitest";
import type { JournalRecord } from "../harness/engine/journal.js";
import type { StudySpec } from "../harness/engine/study.js";
import { buildTables } from "../harness/report/tables.js";
import { fitStudy, type FitRow } from "../harness/report/fits.js";
import { compareMethods } from "../harness/report/comparison.js";
import { checkLimits } from "../harness/cli/resolve.js";
import { familyNamed } from "../harness/families/registry.js";
import { predictorNamed } from "../harness/predict/registry.js";
import { InputError } from "../harness/errors.js";

const spec = {
  family: "ksat", familyParams: { k: 3, density: 4.267, planted: false, satisfiable: false, unique: true }, sizes: [8, 10, 12, 14],
  instances: 3, seed: "1", files: [], solvers: [], trials: 1, walkFlipsPerVariable: 3, sweeps: [], schedule: "geometric",
  beta: null, predictors: ["adiabatic"], spectral: { bValues: [0.7], eta: 0.5 }, adiabatic: { grid: 21 },
  costModel: {} as StudySpec["costModel"], report: { fitFrom: null, resamples: 200 },
} as unknown as StudySpec;

/** Journal of one adiabatic study: 1/gap² = 2^(0.3·n + i/10) per instance i, and one skipped instance at n = 8. */
function journal(): JournalRecord[] {
  const records: JournalRecord[] = [];
  for (const n of spec.sizes) {
    for (let i = 0; i < 3; i++) {
      const base = { n, index: i, file: "", wall_ns: 1000 };
      records.push({
        ...base, key: `truth|${n}|${i}`, kind: "truth", status: "ok", message: "", seed: "s", meta: {}, optimum: 0,
        degeneracy: n === 8 && i === 2 ? 3 : 1, assignments: 2 ** n, mean: 1,
      });
      const skipped = n === 8 && i === 2;
      const scale = 2 ** (0.3 * n + i / 10);
      records.push({
        ...base, key: `adiabatic|${n}|${i}|21`, kind: "spectral", predictor: "adiabatic", b: 21,
        status: skipped ? "skipped" : "ok", message: skipped ? "not applicable: 3 configurations reach the optimum" : "",
        row: skipped
          ? { status: "skipped", reason: "not applicable: 3 configurations reach the optimum", n, grid: 21, runtime_scale: null }
          : { status: "ok", reason: "", n, grid: 21, gap_min: 1 / Math.sqrt(scale), runtime_scale: scale },
      });
    }
  }
  return records;
}

describe("adiabatic in the tables, fits and comparison", () => {
  const tables = buildTables(spec, journal());
  const rows = tables.predictions.filter((p) => p.predictor === "adiabatic");

  it("a skipped cell stays a skipped row with its reason; 1/gap² is never written as queries", () => {
    expect(rows).toHaveLength(12);
    const skipped = rows.filter((r) => r.status === "skipped");
    expect(skipped).toHaveLength(1);
    expect(skipped[0]!.reason).toMatch(/3 configurations reach the optimum/);
    for (const r of rows) expect(r.queries).toBeNull();
  });

  it("fits runtime_scale on its own basis, with no run-length rule (the grid is a numerical setting)", () => {
    const fits = fitStudy(tables.runs, tables.predictions, { resamples: 200, quantiles: [0.5] });
    const f = fits.find((x) => x.method === "adiabatic")!;
    expect(f.measure).toBe("runtime_scale");
    expect(f.basis).toBe("scale");
    expect(f.exponent_status).toBe("");
    // The median instance (i = 1) has log₂ scale = 0.3·n + 0.1 exactly: slope 0.3 by construction.
    expect(f.exponent!).toBeCloseTo(0.3, 9);
    expect(fits.some((x) => x.method === "adiabatic" && x.measure === "queries")).toBe(false);
  });

  it("comparison rows show the exponent but are not rated on either basis, and say why", () => {
    const fit = (method: string, measure: FitRow["measure"], a: number): FitRow => ({
      family: "ksat", method_kind: method === "adiabatic" ? "predictor" : "solver", method, measure, quantile: 0.5,
      exponent: a, exponent_low: a - 0.02, exponent_high: a + 0.02, base: 2 ** a, base_low: null, base_high: null, intercept: 1,
      r2: 1, n_from: 8, n_to: 14, points: 4, basis: measure === "tts_ns" ? "time" : measure === "runtime_scale" ? "scale" : "work",
      poly_degree: null, aic_exponential: null, aic_polynomial: null, growth_model: "exponential", floor_factor: null,
      below_floor: "", exponent_status: "", run_length_rule: "", resamples: 200, flag: "",
    });
    const all = compareMethods([fit("walk", "tts_work", 0.6), fit("walk", "tts_ns", 0.6), fit("adiabatic", "runtime_scale", 0.3)], () => 1e-3);
    expect(all.map((r) => r.basis).sort()).toEqual(["time", "work"]);
    for (const r of all) {
      expect(r.rated).toBe(false);
      expect(r.exponent_quantum).toBe(0.3);
      expect(r.exponent_ratio).toBeNull();
      expect(r.crossover_n).toBeNull();
      expect(r.quantum_measure).toMatch(/^runtime_scale: a time scale 1\/gap_min².*not an oracle count/);
      expect(r.speedup_label).toMatch(new RegExp(`^not rated on the ${r.basis} basis \\(.*no like classical measure\\)$`));
    }
  });
});

describe("memory limit at the edge, through the predictor cell's memory rule", () => {
  it("refuses 3-SAT n = 26 under 1 GiB naming both figures, and accepts it under 4 GiB", () => {
    const fam = familyNamed("ksat");
    const params = { k: 3, density: 4.267, planted: false, satisfiable: false, unique: false };
    // 6 vectors × 8 B + 1 B cost (111 clauses ≤ 255) = 49 B per amplitude; 49·2^26 B + 16 MiB = 3.08 GiB.
    const gib = 1024 ** 3;
    expect(() => checkLimits(fam, params, [26], ["adiabatic"], null, { "spectral-memory": gib })).toThrow(InputError);
    expect(() => checkLimits(fam, params, [26], ["adiabatic"], null, { "spectral-memory": gib }))
      .toThrow(/--predict: adiabatic at n = 26 needs 3\.08 GiB \(49 bytes per amplitude × 2\^26\), but --spectral-memory allows 1\.00 GiB/);
    expect(() => checkLimits(fam, params, [26], ["spectral", "adiabatic"], null, { "spectral-memory": 4 * gib })).not.toThrow();
  });

  it("SK uses the flip-symmetric sector: 28 bytes per amplitude of the full space", () => {
    const m = predictorNamed("spectral").cell!.memory!({ kind: "ising", flipSymmetric: true, clauses: null }, 29, { "spectral-memory": 24 * 1024 ** 3 });
    expect(m.detail).toBe("28 bytes per amplitude × 2^29");
    expect(m.needed).toBe(28 * 2 ** 29 + 16 * 1024 ** 2);
  });
});
