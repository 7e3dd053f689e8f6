// The sk, pspin and maxcut generators: determinism, coupling statistics, graph structure and uniformity.
import { describe, expect, it } from "vitest";
import { InputError } from "../harness/errors.js";
import { maxcutFamily } from "../harness/families/maxcut.js";
import { pspinFamily, pspinVariance } from "../harness/families/pspin.js";
import { skFamily } from "../harness/families/sk.js";
import type { GeneratedFamily as Family, FamilyParams } from "../harness/families/types.js";
import type { Ising } from "../harness/model/ising.js";

function isingOf(family: Family, seed: string, params: FamilyParams, n: number, index: number): Ising {
  const p = family.generate(seed, params, n, index).problem;
  if (p.kind !== "ising") throw new Error(`${family.name} must give an Ising problem`);
  return p.ising;
}

/** Sample mean and unbiased variance. */
function moments(xs: Float64Array): { mean: number; variance: number } {
  let mean = 0;
  for (const x of xs) mean += x;
  mean /= xs.length;
  let v = 0;
  for (const x of xs) v += (x - mean) ** 2;
  return { mean, variance: v / (xs.length - 1) };
}

/**
 * Tolerance for a sample variance of N Gaussian values: its relative standard error is √(2/(N−1))
 * (textbook: (N−1)s²/σ² ~ χ²_{N−1}); we allow 5 standard errors (common practice).
 */
function varianceTolerance(sigma2: number, N: number): number {
  return 5 * sigma2 * Math.sqrt(2 / (N - 1));
}

describe("sk family", () => {
  it("is a pure function of (seed, params, n, index)", () => {
    const a = skFamily.generate("s", { couplings: "gauss" }, 20, 3);
    const b = skFamily.generate("s", { couplings: "gauss" }, 20, 3);
    expect(a.seed).toBe(b.seed);
    expect(a.problem).toEqual(b.problem);
    expect(a.meta).toEqual({ couplings: "gauss", terms: 190 });
    const base = isingOf(skFamily, "s", { couplings: "gauss" }, 20, 3).coefficients;
    expect(isingOf(skFamily, "s", { couplings: "gauss" }, 20, 4).coefficients).not.toEqual(base); // other index
    expect(isingOf(skFamily, "t", { couplings: "gauss" }, 20, 3).coefficients).not.toEqual(base); // other master seed
    expect(isingOf(skFamily, "s", { couplings: "pm1" }, 20, 3).coefficients).not.toEqual(base); // other params
  });

  it("has every pair once, i < j, no constant", () => {
    const m = isingOf(skFamily, "s", {}, 9, 0);
    expect(m.coefficients.length).toBe(36);
    const seen = new Set<string>();
    for (let t = 0; t < 36; t++) {
      expect(m.termOffsets[t + 1] - m.termOffsets[t]).toBe(2);
      const i = m.termSpins[2 * t];
      const j = m.termSpins[2 * t + 1];
      expect(i).toBeLessThan(j);
      seen.add(`${i},${j}`);
    }
    expect(seen.size).toBe(36);
    expect(m.constant).toBe(0);
  });

  it("Gaussian couplings: mean 0 and variance 1/n (n = 200, 19900 couplings, 5 standard errors)", () => {
    const n = 200;
    const m = isingOf(skFamily, "stats", { couplings: "gauss" }, n, 0);
    const { mean, variance } = moments(m.coefficients);
    const N = m.coefficients.length;
    expect(Math.abs(mean)).toBeLessThan(5 * Math.sqrt(1 / n / N)); // standard error of a mean
    expect(Math.abs(variance - 1 / n)).toBeLessThan(varianceTolerance(1 / n, N)); // the SK definition: Var J = 1/n
  });

  it("±1/√n couplings: every |J| = 1/√n, signs balanced within 5 standard errors", () => {
    const n = 200;
    const m = isingOf(skFamily, "stats", { couplings: "pm1" }, n, 0);
    let plus = 0;
    for (const J of m.coefficients) {
      expect(Math.abs(J)).toBe(1 / Math.sqrt(n));
      if (J > 0) plus++;
    }
    const N = m.coefficients.length;
    expect(Math.abs(plus - N / 2)).toBeLessThan(5 * Math.sqrt(N / 4)); // binomial(N, 1/2) standard deviation
  });

  it("rejects an unknown coupling distribution with an InputError", () => {
    expect(() => skFamily.generate("s", { couplings: "cauchy" }, 10, 0)).toThrow(InputError);
  });
});

describe("pspin family", () => {
  it("is a pure function of (seed, params, n, index)", () => {
    const a = pspinFamily.generate("s", { p: 3 }, 12, 1);
    const b = pspinFamily.generate("s", { p: 3 }, 12, 1);
    expect(a.problem).toEqual(b.problem);
    expect(a.meta).toEqual({ p: 3, terms: 220 });
    const base = isingOf(pspinFamily, "s", { p: 3 }, 12, 1).coefficients;
    expect(isingOf(pspinFamily, "s", { p: 3 }, 12, 2).coefficients).not.toEqual(base);
  });

  it("lists every p-subset once, in increasing order (C(n,p) terms)", () => {
    for (const [n, p, count] of [
      [7, 3, 35],
      [8, 4, 70],
      [6, 2, 15],
    ]) {
      const m = isingOf(pspinFamily, "s", { p }, n, 0);
      expect(m.coefficients.length).toBe(count); // binomial coefficient C(n, p)
      const seen = new Set<string>();
      for (let t = 0; t < count; t++) {
        const spins = Array.from(m.termSpins.subarray(m.termOffsets[t], m.termOffsets[t + 1]));
        expect(spins.length).toBe(p);
        for (let k = 1; k < p; k++) expect(spins[k]).toBeGreaterThan(spins[k - 1]);
        expect(spins[p - 1]).toBeLessThan(n);
        seen.add(spins.join(","));
      }
      expect(seen.size).toBe(count);
    }
  });

  it("couplings have variance p!/(2 n^(p−1)) (5 standard errors)", () => {
    // The usual p-spin normalisation (Gross & Mézard, Nucl. Phys. B 240, 431 (1984)).
    for (const [n, p] of [
      [40, 3],
      [22, 4],
    ]) {
      const m = isingOf(pspinFamily, "stats", { p }, n, 0);
      const { mean, variance } = moments(m.coefficients);
      const want = pspinVariance(n, p);
      let fact = 1;
      for (let k = 2; k <= p; k++) fact *= k;
      expect(want).toBeCloseTo(fact / (2 * n ** (p - 1)), 15);
      const N = m.coefficients.length;
      expect(Math.abs(mean)).toBeLessThan(5 * Math.sqrt(want / N));
      expect(Math.abs(variance - want)).toBeLessThan(varianceTolerance(want, N));
    }
  });

  it("rejects p < 2 and n < p with an InputError", () => {
    expect(() => pspinFamily.generate("s", { p: 1 }, 10, 0)).toThrow(InputError);
    expect(() => pspinFamily.generate("s", { p: 5 }, 4, 0)).toThrow(InputError);
  });
});

describe("maxcut family", () => {
  it("is a pure function of (seed, params, n, index)", () => {
    const a = maxcutFamily.generate("s", { degree: 3 }, 30, 0);
    const b = maxcutFamily.generate("s", { degree: 3 }, 30, 0);
    expect(a.problem).toEqual(b.problem);
    expect(a.meta).toEqual(b.meta);
    expect(maxcutFamily.generate("s", { degree: 3 }, 30, 1).problem).not.toEqual(a.problem);
  });

  it("draws simple d-regular graphs: no loop, no repeated edge, every degree d, J = −1 per edge", () => {
    for (const [n, d] of [
      [10, 3],
      [40, 3],
      [12, 4],
      [30, 5],
      [9, 8],
      [10, 6],
      [6, 1],
    ]) {
      for (let index = 0; index < 4; index++) {
        const inst = maxcutFamily.generate("regular", { degree: d }, n, index);
        const m = isingOf(maxcutFamily, "regular", { degree: d }, n, index);
        expect(inst.meta.degree).toBe(d);
        expect(inst.meta.edges).toBe((n * d) / 2);
        expect(Number.isInteger(inst.meta.rejected_draws) && Number(inst.meta.rejected_draws) >= 0).toBe(true);
        const degree = new Array<number>(n).fill(0);
        const seen = new Set<number>();
        for (let t = 0; t + 1 < m.termOffsets.length; t++) {
          expect(m.termOffsets[t + 1] - m.termOffsets[t]).toBe(2);
          const i = m.termSpins[m.termOffsets[t]];
          const j = m.termSpins[m.termOffsets[t] + 1];
          expect(i).toBeLessThan(j); // also excludes loops
          expect(seen.has(i * n + j)).toBe(false);
          seen.add(i * n + j);
          degree[i]++;
          degree[j]++;
          expect(m.coefficients[t]).toBe(-1);
        }
        expect(degree.every((x) => x === d)).toBe(true);
      }
    }
  });

  it("is uniform over labelled 2-regular graphs on 6 vertices (χ² over all 70 of them)", () => {
    // Labelled 2-regular graphs on 6 vertices: 60 hexagons (5!/2) + 10 pairs of triangles (C(6,3)/2) = 70
    // (closed form; OEIS A001205). Uniform sampling gives each 1/70: χ² with 69 degrees of freedom; 5000 draws.
    const draws = 5000;
    const counts = new Map<string, number>();
    let triangles = 0;
    let rejected = 0;
    for (let index = 0; index < draws; index++) {
      const inst = maxcutFamily.generate("uniform", { degree: 2 }, 6, index);
      rejected += Number(inst.meta.rejected_draws);
      if (inst.problem.kind !== "ising") throw new Error("ising expected");
      const key = Array.from(inst.problem.ising.termSpins).join(",");
      counts.set(key, (counts.get(key) ?? 0) + 1);
      // Two triangles: the neighbours of vertex 0 are adjacent to each other.
      const s = inst.problem.ising.termSpins;
      const nb: number[] = [];
      for (let k = 0; k < s.length; k += 2) if (s[k] === 0) nb.push(s[k + 1]);
      let adjacent = false;
      for (let k = 0; k < s.length; k += 2) if (s[k] === Math.min(nb[0], nb[1]) && s[k + 1] === Math.max(nb[0], nb[1])) adjacent = true;
      if (adjacent) triangles++;
    }
    expect(counts.size).toBe(70);
    const expected = draws / 70;
    let chi2 = 0;
    for (const c of counts.values()) chi2 += (c - expected) ** 2 / expected;
    // 69 degrees of freedom: mean 69, s.d. √138 ≈ 11.7; 0.1% upper point ≈ 111.1 (standard χ² tables).
    expect(chi2).toBeLessThan(111.1);
    // Share of two-triangle graphs 10/70 = 1/7, within 5 binomial standard errors.
    expect(Math.abs(triangles / draws - 1 / 7)).toBeLessThan(5 * Math.sqrt((1 / 7) * (6 / 7) / draws));
    // The pairing model does reject: P(simple) for n = 6, d = 2 is 70·(2!)^6 / (11·9·7·5·3·1) = 4480/10395 ≈ 0.431
    // (closed form: (d!)^n pairings per simple graph over (nd−1)!! pairings), so ≈ 1.32 rejections a draw.
    const perDraw = rejected / draws;
    const pSimple = 4480 / 10395;
    const meanRejections = (1 - pSimple) / pSimple; // geometric distribution
    const sdRejections = Math.sqrt(1 - pSimple) / pSimple;
    expect(Math.abs(perDraw - meanRejections)).toBeLessThan(5 * (sdRejections / Math.sqrt(draws)));
  });

  it("is uniform over labelled 3-regular graphs on 6 vertices, drawn as complements (χ² over all 70)", () => {
    // d = 3 > (n−1)/2 = 2.5, so the family draws a 2-regular graph and complements it: again 70 graphs
    // (complementation is a bijection; closed form as above), χ² with 69 degrees of freedom, 0.1% point 111.1.
    const draws = 5000;
    const counts = new Map<string, number>();
    for (let index = 0; index < draws; index++) {
      const inst = maxcutFamily.generate("uniform-3", { degree: 3 }, 6, index);
      if (inst.problem.kind !== "ising") throw new Error("ising expected");
      const key = Array.from(inst.problem.ising.termSpins).join(",");
      counts.set(key, (counts.get(key) ?? 0) + 1);
    }
    expect(counts.size).toBe(70);
    let chi2 = 0;
    for (const c of counts.values()) chi2 += (c - draws / 70) ** 2 / (draws / 70);
    expect(chi2).toBeLessThan(111.1);
  });

  it("rejects n·d odd and d ≥ n with a clear InputError", () => {
    expect(() => maxcutFamily.generate("s", { degree: 3 }, 7, 0)).toThrow(/n·degree = 7·3 is odd/);
    expect(() => maxcutFamily.generate("s", { degree: 5 }, 5, 0)).toThrow(/needs more than 5 vertices/);
    expect(() => maxcutFamily.generate("s", { degree: 0 }, 5, 0)).toThrow(InputError);
  });
});
