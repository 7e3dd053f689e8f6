import { describe, expect, it } from "vitest";
import { chooseCutoffOnGrid, distributionOfRow, fineCutoffGrid, RLD_GRID_PER_DECADE } from "../harness/report/run-length-grid.js";
import { fitStudy } from "../harness/report/fits.js";
import { summariseSizes } from "../harness/report/sizes.js";
import type { RunRow } from "../harness/types.js";

// TTS_0.99 at cut-off t with per-restart success p: t·ln(0.01)/ln(1 − p) (Rønnow et al., "Defining and detecting
// quantum speedup", Science 345, 420 (2014)). Hand values below use ln(0.01) = −4.605170, ln(0.5) = −0.693147,
// ln(0.7) = −0.356675, ln(0.9) = −0.105361.
const rønnow = (t: number, p: number): number => (t * Math.log(0.01)) / Math.log(1 - p);

const CAP = 1000;
/** Half the trials solved at exactly `v` flips, half censored: p(c) = 0.5 for c ≥ v, so TTS is least at c = v. */
const inside = (v: number): number[] => [v, v, v, v, v, -1, -1, -1, -1, -1];
/** Solved only late (400, 990, 1000 flips) of 10 trials: p(422) = 0.1, p(909) = 0.1, p(1000) = 0.3. */
const late = [400, 990, 1000, -1, -1, -1, -1, -1, -1, -1];

/** A hand-made breakwalk-like run row at cap CAP; 2 ns per flip; the row's own TTS from its success count. */
function row(n: number, instance: number, solver: string, steps: number[] | null, stepsForCounts: number[]): RunRow {
  const successes = stepsForCounts.filter((s) => s >= 0).length;
  const trials = stepsForCounts.length;
  const work = stepsForCounts.reduce((a, s) => a + (s >= 0 ? s : CAP), 0);
  const p = successes / trials;
  const ttsWork = (work / trials) * (Math.log(0.01) / Math.log1p(-p));
  return {
    family: "ksat", n, instance, solver, run_length: CAP, status: "ok", wall_ns: 2 * work, cpu_ns: 2 * work, work,
    floor_ns: null, trials, successes, trial_success_p: p, trial_success_p_low: null, trial_success_p_high: null,
    work_per_trial: work / trials, wall_ns_per_trial: (2 * work) / trials, tts_ns: 2 * ttsWork, tts_ns_low: null,
    tts_ns_high: null, tts_work: ttsWork, tts_work_low: null, message: "",
    ...(steps === null ? {} : { steps_to_solution: steps }),
  };
}

// n = 10, 12, 14: optimum inside the grid at 5, 10, 20 flips; n = 16: optimum at the cap.
const SIZES: Array<[number, number[]]> = [[10, inside(5)], [12, inside(10)], [14, inside(20)], [16, late]];
const runs: RunRow[] = [];
for (const [n, steps] of SIZES) {
  for (let i = 0; i < 3; i++) {
    runs.push(row(n, i, "rldwalk", steps, steps));
    runs.push(row(n, i, "countwalk", null, steps)); // the same trials without a distribution: today's rule
  }
}
const options = { resamples: 200, fitFrom: 10 };

describe("fine cut-off grid", () => {
  it("has 24 points per decade from 1 flip to the cap, rounded to whole flips", () => {
    expect(RLD_GRID_PER_DECADE).toBe(24);
    const g = fineCutoffGrid(CAP);
    // round(10^(k/24)), k = 0…71, duplicates dropped, then the cap (hand-computed: 58 points).
    expect(g.length).toBe(58);
    expect(g[0]).toBe(1);
    expect(g[g.length - 1]).toBe(CAP);
    for (const c of [5, 10, 20, 383, 422, 909]) expect(g).toContain(c);
    expect(g).not.toContain(990);
    for (let i = 1; i < g.length; i++) expect(g[i]!).toBeGreaterThan(g[i - 1]!);
  });

  it("finds Rønnow's TTS optimum inside the grid and at the cap", () => {
    const one = (steps: number[]) => new Map([[0, distributionOfRow({ run_length: CAP, cpu_ns: 2, work: 1, steps_to_solution: steps })!]]);
    const a = chooseCutoffOnGrid(one(inside(5)));
    expect(a.cutoff).toBe(5);
    // 5 · ln 0.01 / ln 0.5 = 5 · 6.643856 = 33.2193 flips; 2 ns per flip.
    expect(a.atChoice.get(0)!.work).toBeCloseTo(rønnow(5, 0.5), 9);
    expect(a.atChoice.get(0)!.work).toBeCloseTo(33.2193, 3);
    expect(a.atChoice.get(0)!.ns).toBeCloseTo(2 * 33.2193, 3);
    const b = chooseCutoffOnGrid(one(late));
    // Candidates: 422 · ln 0.01/ln 0.9 = 18 445.5, 909 · 43.7086 = 39 731.1, 1000 · ln 0.01/ln 0.7 = 12 911.4.
    expect(b.cutoff).toBe(CAP);
    expect(b.atChoice.get(0)!.work).toBeCloseTo(12911.4, 0);
    expect(b.points.find((p) => p.runLength === 422)!.tts).toBeCloseTo(18445.5, 0);
    expect(b.points.find((p) => p.runLength === 383)!.tts).toBeNull(); // p = 0 below 400 flips
  });
});

describe("report: fine-grid run length from run-length distributions", () => {
  const sizes = summariseSizes(runs, [], options);
  const fits = fitStudy(runs, [], options);

  it("sizes.csv: the TTS at the per-size cut-off is the optimal row, the cap's own TTS row is not", () => {
    for (const [n, cut, tts] of [[10, 5, rønnow(5, 0.5)], [12, 10, rønnow(10, 0.5)], [14, 20, rønnow(20, 0.5)], [16, CAP, rønnow(CAP, 0.3)]] as const) {
      const work = sizes.find((r) => r.method === "rldwalk" && r.n === n && r.measure === "tts_work" && r.optimal_run_length);
      expect(work?.run_length).toBe(cut);
      expect(work!.median!).toBeCloseTo(tts, 6);
      const ns = sizes.find((r) => r.method === "rldwalk" && r.n === n && r.measure === "tts_ns" && r.optimal_run_length);
      expect(ns!.median!).toBeCloseTo(2 * tts, 6); // scaled by the cell's 2 ns per flip
      expect(work!.flag).toContain("run-length distributions");
    }
    const capTts = sizes.find((r) => r.method === "rldwalk" && r.n === 10 && r.measure === "tts_work" && r.run_length === CAP);
    expect(capTts?.optimal_run_length).toBe(false);
    const capWork = sizes.find((r) => r.method === "rldwalk" && r.n === 10 && r.measure === "work" && r.run_length === CAP);
    expect(capWork?.optimal_run_length).toBe(true);
  });

  it("fits: an optimum at the cap at the largest size makes the exponent an upper bound", () => {
    const f = fits.find((r) => r.method === "rldwalk" && r.measure === "tts_work" && r.quantile === 0.5)!;
    expect(f.n_from).toBe(10);
    expect(f.n_to).toBe(16);
    expect(f.exponent_status).toBe("upper bound");
    expect(f.flag).toContain("optimal run length at the grid edge: exponent is an upper bound (n = 16 (longest run length))");
    expect(f.run_length_rule).toContain("24 per decade");
  });

  it("fits: the cap's own measures (work, cpu_ns) keep the scanned grid (one run length: not scanned)", () => {
    const f = fits.find((r) => r.method === "rldwalk" && r.measure === "work" && r.quantile === 0.5)!;
    expect(f.exponent_status).toBe("not scanned");
    expect(f.run_length_rule).toBe("");
  });

  it("fits: with the optimum inside the grid at every size the exponent is an estimate", () => {
    const f = fitStudy(runs, [], { ...options, fitTo: 14 }).find((r) => r.method === "rldwalk" && r.measure === "tts_work" && r.quantile === 0.5)!;
    expect(f.exponent_status).toBe("estimate");
    expect(f.flag).not.toContain("grid edge");
    // log2 of 33.2, 66.4, 132.9 over n = 10, 12, 14: slope exactly 1/2 bit per variable.
    expect(f.exponent!).toBeCloseTo(0.5, 9);
  });

  it("rows without distributions are treated as before (one run length: not scanned)", () => {
    const f = fits.find((r) => r.method === "countwalk" && r.measure === "tts_work" && r.quantile === 0.5)!;
    expect(f.exponent_status).toBe("not scanned");
    expect(f.run_length_rule).toBe("");
    const s = sizes.filter((r) => r.method === "countwalk" && r.measure === "tts_work");
    expect(s.every((r) => r.run_length === CAP && r.optimal_run_length)).toBe(true);
  });
});
