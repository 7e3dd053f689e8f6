import { describe, expect, it } from "vitest";
import { Rng, deriveSeed } from "../harness/random.js";
import { applyFloor } from "../harness/stats/floor.js";
import { compareGrowthModels } from "../harness/stats/growth-model.js";
import { runLengthEdges } from "../harness/stats/run-length-edge.js";
import { fitStudy } from "../harness/report/fits.js";
import { summariseSizes } from "../harness/report/sizes.js";
import { compareMethods } from "../harness/report/comparison.js";
import type { PredictionRow, RunRow } from "../harness/types.js";

describe("fixed-cost floor", () => {
  // Synthetic flat-plus-exponential series (hand-computed): floor 1e5 ns; median wall 1.5e5 + 10·2^n ns.
  // n = 16: 805 360 < 1e6; n = 18: 2 771 440 ≥ 1e6 = 10 × floor.
  const points = [10, 12, 14, 16, 18, 20, 22].map((n) => ({ n, medianWall: 1.5e5 + 10 * 2 ** n, floor: 1e5 }));

  it("keeps exactly the sizes at or above factor × floor", () => {
    const d = applyFloor(points, 10);
    expect(d.kept).toEqual([18, 20, 22]);
    expect(d.excluded.map((e) => e.n)).toEqual([10, 12, 14, 16]);
    expect(d.tooFew).toBe(false);
    expect(d.flag).toContain("left out: n = 10, 12, 14, 16");
  });

  it("withholds the fit with fewer than 3 sizes and says from where n would be needed", () => {
    // Factor 30: 3e6 ns; n = 18 (2.77e6) fails, n = 20 (1.06e7) passes: 2 sizes.
    const d = applyFloor(points, 30);
    expect(d.kept).toEqual([20, 22]);
    expect(d.tooFew).toBe(true);
    // The least-squares line of log2(median/floor) crosses log2 30 between the sizes that fail and pass; a
    // straight line through a curved (flat then exponential) series lands within a few sizes of it.
    expect(d.neededFrom).not.toBeNull();
    expect(d.neededFrom!).toBeGreaterThanOrEqual(14);
    expect(d.neededFrom!).toBeLessThanOrEqual(22);
    expect(d.flag).toMatch(/^not enough sizes above the fixed-cost floor \(n >= \d+ needed, 2 of 3 sizes at 30 x floor\)/);
  });

  it("a flat series (all set-up) never passes and has no needed n", () => {
    const flat = [10, 12, 14, 16].map((n) => ({ n, medianWall: 2e5, floor: 1e5 }));
    const d = applyFloor(flat, 10);
    expect(d.kept).toEqual([]);
    expect(d.neededFrom).toBeNull();
    expect(d.flag).toContain("time barely grows above the floor");
  });

  it("in the report: the time fit drops the sizes under the floor and a flat solver gets no time verdict", () => {
    const runs: RunRow[] = [];
    const predictions: PredictionRow[] = [];
    const rng = new Rng(deriveSeed("verdict-floor"));
    for (let n = 10; n <= 22; n += 2) {
      for (let i = 0; i < 15; i++) {
        const jitter = 1 + 0.05 * rng.normal();
        const base = {
          family: "ksat", n, instance: i, run_length: null, status: "ok" as const, trials: null, successes: null, trial_success_p: null,
          trial_success_p_low: null, trial_success_p_high: null, work_per_trial: null, wall_ns_per_trial: null, tts_ns_low: null, tts_ns_high: null, tts_work_low: null, message: "",
        };
        // "slow": floor 1e5 ns plus 10·2^n ns of real work; "flat": pure set-up, 2e5 ns at every size.
        const slow = (1.5e5 + 10 * 2 ** n) * jitter;
        runs.push({ ...base, solver: "slow", wall_ns: slow, cpu_ns: slow, tts_ns: slow, work: 2 ** n, tts_work: 2 ** n, floor_ns: 1e5 });
        runs.push({ ...base, solver: "flat", wall_ns: 2e5 * jitter, cpu_ns: 2e5 * jitter, tts_ns: 2e5 * jitter, work: 2 ** (0.5 * n), tts_work: 2 ** (0.5 * n), floor_ns: 1e5 });
        predictions.push({ family: "ksat", n, instance: i, predictor: "grover", status: "ok", queries: 2 ** (0.5 * n), queries_log2: 0.5 * n, queries_low: null, queries_high: null });
      }
    }
    const fits = fitStudy(runs, predictions, { resamples: 200, quantiles: [0.5], fitFrom: 10 });
    const slow = fits.find((f) => f.method === "slow" && f.measure === "tts_ns")!;
    expect(slow.below_floor).toBe("10, 12, 14, 16");
    expect(slow.n_from).toBe(18);
    const flat = fits.find((f) => f.method === "flat" && f.measure === "tts_ns")!;
    expect(flat.exponent).toBeNull();
    const rows = compareMethods(fits, () => 1e-3);
    const flatTime = rows.find((r) => r.basis === "time" && r.solver === "flat")!;
    expect(flatTime.speedup_label).toMatch(/^not enough sizes above the fixed-cost floor/);
    expect(flatTime.flags).toContain("below-floor");
    // On work the flat solver is fine (0.5 per variable, exactly Grover's): it is the strongest there.
    const flatWork = rows.find((r) => r.basis === "work" && r.solver === "flat")!;
    expect(flatWork.rated).toBe(true);
    expect(flatWork.classical_measure).toBe("tts_work");
    expect(flatWork.quantum_measure).toBe("queries");
  });
});

describe("exponential or polynomial", () => {
  it("AIC by hand on three exact points", () => {
    // (n, log2 cost) = (1, 0), (2, 1), (4, 2): exactly log2 n, so the polynomial fit is exact (RSS floored at
    // 3e-12). The exponential fit: slope 9/14, RSS = Syy − slope·Sxy = 2 − 27/14 = 1/14; AIC = 3 ln(RSS/3) + 6.
    const g = compareGrowthModels([{ n: 1, log2: 0 }, { n: 2, log2: 1 }, { n: 4, log2: 2 }]);
    expect(g.expSlope!).toBeCloseTo(9 / 14, 12);
    expect(g.aicExponential!).toBeCloseTo(3 * Math.log(1 / 42) + 6, 10);
    expect(g.polyDegree!).toBeCloseTo(1, 12);
    expect(g.preferred).toBe("polynomial");
  });

  it("recovers a polynomial and an exponential synthetic series", () => {
    // Seeds "growth-poly" and "growth-exp"; log2 noise with sd 0.1; n = 10…40 step 2. Tolerances (common
    // practice): degree within 0.25 of 3, slope within 0.02 of 0.3.
    const series = (seed: string, f: (n: number) => number) => {
      const rng = new Rng(deriveSeed(seed));
      const out: Array<{ n: number; log2: number }> = [];
      for (let n = 10; n <= 40; n += 2) out.push({ n, log2: f(n) + 0.1 * rng.normal() });
      return out;
    };
    const poly = compareGrowthModels(series("growth-poly", (n) => 3 * Math.log2(n) + 1));
    expect(poly.preferred).toBe("polynomial");
    expect(Math.abs(poly.polyDegree! - 3)).toBeLessThan(0.25);
    const exp = compareGrowthModels(series("growth-exp", (n) => 0.3 * n + 2));
    expect(exp.preferred).toBe("exponential");
    expect(Math.abs(exp.expSlope! - 0.3)).toBeLessThan(0.02);
  });

  it("fewer than 3 points: undetermined", () => {
    expect(compareGrowthModels([{ n: 10, log2: 3 }, { n: 12, log2: 4 }]).preferred).toBe("undetermined");
  });
});

describe("run-length edges (Rønnow et al., Science 345, 420 (2014))", () => {
  const grid = [10, 30, 100, 300];
  // TTS(run length) = a convex curve in log run length with its minimum at `best` (hand-made).
  const size = (n: number, best: number) => ({
    n,
    points: grid.map((runLength) => ({ runLength, tts: 1000 * (1 + (Math.log(runLength) - Math.log(best)) ** 2) })),
  });

  it("optimum inside the grid at every size: an estimate", () => {
    const r = runLengthEdges([size(16, 30), size(18, 30), size(20, 100)]);
    expect(r.status).toBe("estimate");
    expect(r.perSize.map((p) => p.optimal)).toEqual([30, 30, 100]);
  });

  it("optimum at the longest run length at the largest sizes: the exponent is an upper bound", () => {
    const r = runLengthEdges([size(16, 30), size(18, 100), size(20, 1000), size(22, 3000)]);
    expect(r.status).toBe("upper bound");
    expect(r.flag).toContain("optimal run length at the grid edge: exponent is an upper bound");
    expect(r.perSize.filter((p) => p.edge === "high").map((p) => p.n)).toEqual([20, 22]);
  });

  it("optimum at the shortest run length at the smallest sizes: a lower bound; only the fit's sizes count", () => {
    const all = [size(12, 1), size(14, 3), size(16, 30), size(18, 100)];
    expect(runLengthEdges(all).status).toBe("lower bound");
    expect(runLengthEdges(all, [16, 18]).status).toBe("estimate");
  });

  it("in the report: an amplified run length where trials never succeeded (p = 0) stays on the grid and counts as censored", () => {
    // Hand-made amplified-solver rows at run lengths 1, 3, 10 (n = 14..22, 6 instances): at run length 1 four
    // instances never succeeded (p = 0: no finite cost, amplify.ts gives queries and steps null) and two did
    // cheaply (10 steps); at 3 and 10 every instance succeeded (3: 100·2^(0.1 n) steps, 10: twice that). The p = 0
    // instances are lower bounds, so the median at 1 is undefined (4 of 6 censored) and 3 is the optimum, inside
    // the grid [1, 10]: an estimate. Dropping them instead would take the median over the 2 cheap instances,
    // choose run length 1 and call every size a grid edge.
    const predictions: PredictionRow[] = [];
    for (let n = 14; n <= 22; n += 2) {
      for (let i = 0; i < 6; i++) {
        const row = (runLength: number, p: number, steps: number | null): PredictionRow => ({
          family: "sk", n, instance: i, predictor: "amplified-anneal", status: "ok", run_length: runLength, trial_success_p: p,
          queries: steps === null ? null : steps / runLength, queries_log2: null, queries_low: steps === null ? 5 : steps / runLength,
          queries_high: null, expected_work: steps, expected_work_low: steps, expected_work_high: null,
        } as PredictionRow);
        predictions.push(row(1, i < 4 ? 0 : 0.3, i < 4 ? null : 10));
        predictions.push(row(3, 0.2, 100 * 2 ** (0.1 * n)));
        predictions.push(row(10, 0.4, 200 * 2 ** (0.1 * n)));
      }
    }
    const sizes = summariseSizes([], predictions, { resamples: 200 });
    const atOne = sizes.find((r) => r.method === "amplified-anneal" && r.measure === "expected_work" && r.n === 18 && r.run_length === 1)!;
    expect(atOne.censored).toBe(4);
    expect(atOne.median).toBeNull();
    expect(sizes.filter((r) => r.method === "amplified-anneal" && r.measure === "expected_work" && r.optimal_run_length).map((r) => r.run_length)).toEqual([3, 3, 3, 3, 3]);
    const fit = fitStudy([], predictions, { resamples: 200, quantiles: [0.5], fitFrom: 14 }).find((f) => f.method === "amplified-anneal" && f.measure === "expected_work")!;
    expect(fit.exponent_status).toBe("estimate");
    expect(fit.exponent!).toBeCloseTo(0.1, 10); // the exact 2^(0.1 n) of the rows at run length 3
  });

  it("one run length: not scanned", () => {
    const r = runLengthEdges([{ n: 10, points: [{ runLength: 30, tts: 5 }] }, { n: 12, points: [{ runLength: 36, tts: 9 }] }]);
    expect(r.status).toBe("not scanned");
  });
});
