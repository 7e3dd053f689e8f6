// Mean SK ground-state energy per spin at n = 16…22 against the Parisi value and its finite-size approach.
// Cost: 400 Gaussian instances per size, exhaustive with the mirror symmetry (2^(n−1) configurations each,
// ≈ 1.1·10^9 in all): about 5 s of one core at the measured kernel speed.
import { beforeAll, describe, expect, it } from "vitest";
import { skFamily } from "../harness/families/sk.js";
import { exhaustiveSpinSlice } from "../solvers/exhaustive-spin.js";

// Parisi's ground-state energy per spin of the SK model, −0.7633 (Parisi, "A sequence of approximated solutions
// to the S-K model for spin glasses", J. Phys. A 13, L115 (1980); value −0.76321… e.g. Crisanti & Rizzo,
// Phys. Rev. E 65, 046137 (2002)).
const PARISI = -0.7633;
const SIZES = [16, 18, 20, 22];
const INSTANCES = 400;
const TOL = 1e-9; // common practice (as costTolerance in harness/model/problem.ts)

/** Complementary error function, fractional error < 1.2e-7 (Numerical Recipes in C, 2nd ed., §6.2, erfcc). */
function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  // Horner form of the book's Chebyshev fit, lowest coefficient first.
  const c = [-1.26551223, 1.00002368, 0.37409196, 0.09678418, -0.18628806, 0.27886807, -1.13520398, 1.48851587, -0.82215223, 0.17087277];
  let poly = 0;
  for (let k = c.length - 1; k >= 0; k--) poly = c[k] + t * poly;
  const r = t * Math.exp(-z * z + poly);
  return x >= 0 ? r : 2 - r;
}

interface SizeStats {
  n: number;
  mean: number;
  se: number;
  perSpin: number[];
}

function groundEnergies(n: number): SizeStats {
  const perSpin: number[] = [];
  for (let k = 0; k < INSTANCES; k++) {
    const ising = skFamily.generate("sk-ground-energy", { couplings: "gauss" }, n, k).problem;
    if (ising.kind !== "ising") throw new Error("sk must give an Ising problem");
    const r = exhaustiveSpinSlice(ising.ising, 0, 0, true, TOL, null);
    if (!r.complete) throw new Error("enumeration stopped early");
    perSpin.push(r.optimum / n);
  }
  const mean = perSpin.reduce((a, b) => a + b, 0) / perSpin.length;
  const variance = perSpin.reduce((a, e) => a + (e - mean) ** 2, 0) / (perSpin.length - 1);
  return { n, mean, se: Math.sqrt(variance / perSpin.length), perSpin };
}

describe("SK ground-state energy per spin, n = 16…22", () => {
  let stats: SizeStats[] = [];
  beforeAll(() => {
    stats = SIZES.map(groundEnergies);
  });

  it("every size's mean lies above the Parisi value −0.7633 (by more than 3 standard errors)", () => {
    for (const s of stats) expect(s.mean - 3 * s.se).toBeGreaterThan(PARISI);
  });

  it("the mean is not below the first-moment bound E[min] ≥ −((n−1)/n)·√ln2 per spin", () => {
    // Source: E[max of M Gaussians of variance σ²] ≤ σ·√(2 ln M) (the Gaussian maximal inequality); here
    // σ² = Var E(s) = C(n,2)/n = (n−1)/2 and M = 2^(n−1) mirror pairs, so E[E_min]/n ≥ −((n−1)/n)√ln2 > −√ln2.
    for (const s of stats) {
      const bound = -((s.n - 1) / s.n) * Math.sqrt(Math.LN2);
      expect(s.mean + 3 * s.se).toBeGreaterThan(bound);
      expect(s.mean).toBeGreaterThan(-Math.sqrt(Math.LN2));
    }
  });

  it("instances below −√ln2 are no more frequent than the union bound allows", () => {
    // Single instances may dip below −√ln2 at these sizes (the bound is asymptotic). Union (first-moment) bound:
    // P(E_min/n < −x) ≤ 2^(n−1)·Φ̄(x·n/σ), σ = √((n−1)/2): about 1.7–1.9% for x = √ln2 and n = 16…22.
    const x = Math.sqrt(Math.LN2);
    for (const s of stats) {
      const p = Math.min(1, 2 ** (s.n - 1) * 0.5 * erfc((x * s.n) / Math.sqrt((s.n - 1) / 2) / Math.SQRT2));
      const below = s.perSpin.filter((e) => e < -x).length;
      // Binomial count under the bound: mean + 4 standard deviations (common practice).
      expect(below).toBeLessThanOrEqual(INSTANCES * p + 4 * Math.sqrt(INSTANCES * p * (1 - p)));
    }
  });

  it("approaches the Parisi value as n grows, consistent with e_n ≈ e_∞ + A·n^(−2/3), A > 0", () => {
    // Finite-size form: Boettcher, "Extremal optimization for Sherrington-Kirkpatrick spin glasses",
    // Eur. Phys. J. B 46, 501 (2005).
    const first = stats[0];
    const last = stats[stats.length - 1];
    expect(first.mean - last.mean).toBeGreaterThan(2 * Math.hypot(first.se, last.se));

    // (a) Weighted least squares e_n = e_∞ + A·x, x = n^(−2/3): slope A > 0 by 2 standard errors, and the
    //     extrapolated e_∞ within 3 standard errors of Parisi's value.
    let sw = 0;
    let sx = 0;
    let sy = 0;
    let sxx = 0;
    let sxy = 0;
    for (const s of stats) {
      const w = 1 / s.se ** 2;
      const x = s.n ** (-2 / 3);
      sw += w;
      sx += w * x;
      sy += w * s.mean;
      sxx += w * x * x;
      sxy += w * x * s.mean;
    }
    const det = sw * sxx - sx * sx;
    const A = (sw * sxy - sx * sy) / det;
    const eInf = (sxx * sy - sx * sxy) / det;
    const seA = Math.sqrt(sw / det);
    const seInf = Math.sqrt(sxx / det);
    expect(A).toBeGreaterThan(2 * seA);
    expect(Math.abs(eInf - PARISI)).toBeLessThan(3 * seInf);

    // (b) With e_∞ fixed at Parisi's value, A_n = (e_n − e_∞)·n^(2/3) is positive at every n and the four agree
    //     with one A: χ² with 3 degrees of freedom below 16.27 (its 0.1% point; standard χ² tables).
    const an = stats.map((s) => ({ a: (s.mean - PARISI) * s.n ** (2 / 3), se: s.se * s.n ** (2 / 3) }));
    for (const v of an) expect(v.a).toBeGreaterThan(0);
    const wsum = an.reduce((acc, v) => acc + 1 / v.se ** 2, 0);
    const aBar = an.reduce((acc, v) => acc + v.a / v.se ** 2, 0) / wsum;
    const chi2 = an.reduce((acc, v) => acc + ((v.a - aBar) / v.se) ** 2, 0);
    expect(chi2).toBeLessThan(16.27);
  });
});
