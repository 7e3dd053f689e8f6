/**
 * The matrix-free Lanczos solver (harness/predict/lanczos.ts) on H = −(1/n)Σ X_i + diag(d): residuals within the
 * tolerance and reported, the symmetric sector, near-degenerate pairs, memory limits, and that the stored-basis and
 * regenerated (second-pass) routes give identical results.
 */
import { EigenvalueDecomposition, Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import {
  LANCZOS_MEMORY_LIMIT_BYTES,
  LanczosWorkspace,
  lanczosMaxN,
  lanczosMemoryBytes,
  lowestEigenpairs,
} from "../harness/predict/lanczos.js";
import { Rng, deriveSeed } from "../harness/random.js";

/** A random diagonal, optionally flip-symmetric (d(z) = d(~z)), entries in [−b, 0]. */
function randomDiagonal(n: number, b: number, symmetric: boolean, seed: string): Float64Array {
  const rng = new Rng(deriveSeed("lanczos-test", seed));
  const N = 2 ** n;
  const d = new Float64Array(N);
  for (let z = 0; z < N; z++) d[z] = -b * rng.nextDouble() ** 4; // a few deep states, many shallow ones
  if (symmetric) for (let z = 0; z < N / 2; z++) d[N - 1 - z] = d[z];
  return d;
}

/** ‖Hψ − Eψ‖ computed here directly from the definition of H (independent of the solver's kernels). */
function residual(n: number, d: Float64Array, psi: Float64Array, e: number): number {
  let s = 0;
  for (let z = 0; z < psi.length; z++) {
    let flips = 0;
    for (let i = 0; i < n; i++) flips += psi[z ^ (1 << i)];
    const r = -flips / n + d[z] * psi[z] - e * psi[z];
    s += r * r;
  }
  return Math.sqrt(s);
}

/** Lowest eigenvalues of the explicit matrix (ml-matrix, EISPACK tred2/tql2 route). */
function denseEigenvalues(n: number, d: Float64Array): number[] {
  const N = 2 ** n;
  const h = Matrix.zeros(N, N);
  for (let z = 0; z < N; z++) {
    h.set(z, z, d[z]);
    for (let i = 0; i < n; i++) h.set(z, z ^ (1 << i), -1 / n);
  }
  return [...new EigenvalueDecomposition(h, { assumeSymmetric: true }).realEigenvalues].sort((a, b) => a - b);
}

describe("lowestEigenpairs", () => {
  it("meets the residual tolerance for both pairs and reports iterations and Krylov sizes", () => {
    for (const [n, tol] of [
      [10, 1e-9],
      [12, 1e-10],
      [13, 1e-8],
    ] as const) {
      const d = randomDiagonal(n, 1.2, false, `res-${n}`);
      const r = lowestEigenpairs(n, d, { tolerance: tol, maxIterations: 2000, seed: "t" });
      expect(r.converged).toBe(true);
      expect(r.residual0).toBeLessThanOrEqual(tol);
      expect(r.residual1).toBeLessThanOrEqual(tol);
      // The reported residual is the true one (recomputed here from the definition of H).
      expect(Math.abs(residual(n, d, r.psi0, r.e0) - r.residual0)).toBeLessThanOrEqual(1e-3 * tol + 1e-14);
      expect(r.iterations).toBeGreaterThan(r.krylov0);
      expect(r.krylov0).toBeGreaterThan(1);
      expect(r.krylov1).toBeGreaterThanOrEqual(1);
      expect(r.e1).toBeGreaterThan(r.e0);
      expect(r.sector).toBe("all");
      expect(r.dimension).toBe(2 ** n);
      let nn = 0;
      for (const a of r.psi0) nn += a * a;
      expect(nn).toBeCloseTo(1, 12);
    }
  });

  it("reports non-convergence (converged = false, residual above tolerance) when maxIterations is too small", () => {
    const n = 12;
    const d = randomDiagonal(n, 1.5, false, "short");
    const r = lowestEigenpairs(n, d, { tolerance: 1e-12, maxIterations: 4, seed: "t", maxRestarts: 1 });
    expect(r.converged).toBe(false);
    expect(Math.max(r.residual0, r.residual1)).toBeGreaterThan(1e-12);
  });

  it("stored basis, regenerated second pass and a reused workspace give identical results", () => {
    const n = 11;
    const d = randomDiagonal(n, 0.9, false, "identical");
    const options = { tolerance: 1e-10, maxIterations: 2000, seed: "same" };
    const regenerated = lowestEigenpairs(n, d, { ...options, basisBytes: 0 });
    const partly = lowestEigenpairs(n, d, { ...options, basisBytes: 8 * 2 ** n * 5 }); // 5 stored, rest regenerated
    const workspace = new LanczosWorkspace();
    lowestEigenpairs(n, d, { ...options, workspace });
    const stored = lowestEigenpairs(n, d, { ...options, workspace });
    expect(stored.stored).toBeGreaterThan(regenerated.krylov0);
    expect(stored.iterations).toBeLessThan(regenerated.iterations);
    for (const r of [partly, stored]) {
      expect(r.e0).toBe(regenerated.e0); // same arithmetic, bit for bit
      expect(r.e1).toBe(regenerated.e1);
      expect(r.psi0).toEqual(regenerated.psi0);
    }
  });

  it("agrees with a dense eigen-decomposition (ml-matrix) on a random diagonal, n = 8", () => {
    const n = 8;
    const d = randomDiagonal(n, 2, false, "dense");
    const r = lowestEigenpairs(n, d, { tolerance: 1e-11, maxIterations: 1000, seed: "t" });
    const ev = denseEigenvalues(n, d);
    expect(Math.abs(r.e0 - ev[0])).toBeLessThanOrEqual(1e-10);
    expect(Math.abs(r.e1 - ev[1])).toBeLessThanOrEqual(1e-10);
  });
});

describe("symmetric sector", () => {
  it("driver alone: gap 2/n in the full space, 4/n in the symmetric sector (eigenvalues −1 + 2|w|/n, Π X_i = (−1)^|w|)", () => {
    const n = 9;
    const d = new Float64Array(2 ** n);
    const all = lowestEigenpairs(n, d, { tolerance: 1e-11, maxIterations: 500, seed: "t" });
    const sym = lowestEigenpairs(n, d, { tolerance: 1e-11, maxIterations: 500, seed: "t", sector: "symmetric" });
    expect(all.e0).toBeCloseTo(-1, 12); // closed form
    expect(all.e1 - all.e0).toBeCloseTo(2 / n, 10); // closed form, |w| = 1
    expect(sym.e0).toBeCloseTo(-1, 12);
    expect(sym.e1 - sym.e0).toBeCloseTo(4 / n, 10); // closed form, |w| = 2
    expect(sym.dimension).toBe(2 ** (n - 1));
    for (const a of sym.psi0) expect(a).toBeCloseTo(2 ** (-n / 2), 10); // ψ = |+⟩
  });

  it("same ground state as the full space (Perron–Frobenius: unique, positive, hence symmetric); E1 can only rise", () => {
    const n = 11;
    const d = randomDiagonal(n, 1.4, true, "sym");
    const all = lowestEigenpairs(n, d, { tolerance: 1e-11, maxIterations: 2000, seed: "t" });
    const sym = lowestEigenpairs(n, d, { tolerance: 1e-11, maxIterations: 2000, seed: "t", sector: "symmetric" });
    expect(sym.sector).toBe("symmetric");
    expect(Math.abs(sym.e0 - all.e0)).toBeLessThanOrEqual(1e-10);
    for (let z = 0; z < 2 ** n; z++) {
      expect(sym.psi0[z]).toBe(sym.psi0[2 ** n - 1 - z]); // exactly symmetric by construction
      expect(Math.abs(sym.psi0[z] - all.psi0[z])).toBeLessThanOrEqual(1e-8);
      expect(sym.psi0[z]).toBeGreaterThan(0); // Perron–Frobenius: H is stoquastic and connected
    }
    expect(sym.e1).toBeGreaterThanOrEqual(all.e1 - 1e-10); // Courant–Fischer on a subspace
    expect(residual(n, d, sym.psi0, sym.e0)).toBeLessThanOrEqual(1e-11);
  });

  it("a mirror pair of deep wells: the full space resolves the tiny splitting, the symmetric sector skips it", () => {
    // d = −2 on z = 0 and on z = ~0 only: the two lowest levels are the even and odd combinations of the wells,
    // split by tunnelling through n flips; dense reference from ml-matrix.
    const n = 8;
    const N = 2 ** n;
    const d = new Float64Array(N);
    d[0] = -2;
    d[N - 1] = -2;
    const ev = denseEigenvalues(n, d);
    const all = lowestEigenpairs(n, d, { tolerance: 1e-11, maxIterations: 1000, seed: "t" });
    const sym = lowestEigenpairs(n, d, { tolerance: 1e-11, maxIterations: 1000, seed: "t", sector: "symmetric" });
    expect(ev[1] - ev[0]).toBeLessThan(1e-4); // the splitting really is small (4.4e-5 here) against E2 − E1 ≈ 0.2
    expect(Math.abs(all.e0 - ev[0])).toBeLessThanOrEqual(1e-10);
    expect(Math.abs(all.e1 - ev[1])).toBeLessThanOrEqual(1e-10);
    expect(Math.abs(sym.e0 - ev[0])).toBeLessThanOrEqual(1e-10);
    expect(sym.e1 - sym.e0).toBeGreaterThan(0.1); // the odd partner is outside the sector
    expect(Math.abs(sym.e1 - ev[2])).toBeLessThanOrEqual(1e-10); // next level: even (found by the dense ordering)
  });

  it("refuses the symmetric sector for a diagonal without the flip symmetry", () => {
    const d = randomDiagonal(6, 1, false, "asym");
    expect(() => lowestEigenpairs(6, d, { tolerance: 1e-9, maxIterations: 100, seed: "t", sector: "symmetric" })).toThrow(
      /d\(z\) = d\(~z\)/,
    );
  });
});

describe("memory limits", () => {
  it("n = 24 fits below 2 GiB in the full space; n = 25 does not (refused with n and the limit named)", () => {
    expect(lanczosMaxN("all")).toBe(24);
    expect(lanczosMaxN("symmetric")).toBe(25);
    // 6 working vectors + the caller's cost and diagonal, 8 bytes × 2^24 each: 1 GiB (arithmetic).
    expect(lanczosMemoryBytes(24, "all")).toBe(8 * 8 * 2 ** 24);
    expect(lanczosMemoryBytes(24, "all")).toBeLessThan(LANCZOS_MEMORY_LIMIT_BYTES);
    const tiny = new Float64Array(1);
    expect(() => lowestEigenpairs(25, tiny, { tolerance: 1e-9, maxIterations: 10, seed: "t" })).toThrow(
      'n = 25 exceeds the limit n ≤ 24 for sector "all"',
    );
    expect(() =>
      lowestEigenpairs(26, tiny, { tolerance: 1e-9, maxIterations: 10, seed: "t", sector: "symmetric" }),
    ).toThrow('n = 26 exceeds the limit n ≤ 25 for sector "symmetric"');
  });
});
