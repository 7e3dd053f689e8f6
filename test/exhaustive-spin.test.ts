// Exact spin enumeration equals brute force over all 2^n configurations (isingEnergyOf), with and without the
// mirror symmetry, over prefix slices, with 3-body terms and local fields, for both kernels and several block sizes.
import { describe, expect, it } from "vitest";
import { type Ising, isingEnergyOf, isingFromTerms } from "../harness/model/ising.js";
import { Rng } from "../harness/random.js";
import { type SpinExactOptions, exhaustiveSpinSlice } from "../solvers/exhaustive-spin.js";

const TOL = 1e-9; // common practice: far above rounding of sums of ≤ 100 O(1) terms, far below the gaps used here

/** Reference: minimum and number of configurations within TOL of it, by definition (source: the definition). */
function brute(model: Ising, prefixBits = 0, prefix = 0): { optimum: number; degeneracy: number } {
  const n = model.spins;
  const energies: number[] = [];
  for (let z = 0; z < 2 ** n; z++) {
    if (prefixBits > 0 && Math.floor(z / 2 ** (n - prefixBits)) !== prefix) continue;
    energies.push(isingEnergyOf(model, z));
  }
  const optimum = Math.min(...energies);
  return { optimum, degeneracy: energies.filter((e) => e <= optimum + TOL).length };
}

/** Random model: all pairs with probability `density`, optional fields and 3-body terms; integer couplings make
 * large degeneracies, Gaussian ones make a unique pair of optima. */
function randomModel(seed: string, n: number, kind: { density: number; integer: boolean; fields: boolean; triples: number }): Ising {
  const rng = new Rng(seed);
  const J = (): number => (kind.integer ? rng.below(3) - 1 : rng.normal());
  const terms: { spins: number[]; J: number }[] = [];
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) if (rng.nextDouble() < kind.density) terms.push({ spins: [j, i], J: J() });
  if (kind.fields) for (let i = 0; i < n; i++) terms.push({ spins: [i], J: J() });
  for (let k = 0; k < kind.triples && n >= 3; k++) {
    const a = rng.below(n);
    let b = rng.below(n);
    while (b === a) b = rng.below(n);
    let c = rng.below(n);
    while (c === a || c === b) c = rng.below(n);
    terms.push({ spins: [a, b, c], J: J() });
  }
  return isingFromTerms(n, terms, kind.integer ? 3 : 0.25);
}

const KERNELS: ReadonlyArray<SpinExactOptions> = [
  { kernel: "pairs", lowBits: 0 },
  { kernel: "pairs", lowBits: 1 },
  { kernel: "pairs", lowBits: 3 },
  { kernel: "pairs", lowBits: 12 },
  { kernel: "walsh", lowBits: 0 },
  { kernel: "walsh", lowBits: 2 },
  { kernel: "walsh", lowBits: 12 },
  { kernel: "terms" },
  {},
];
/** Kernels for models with terms of order > 2. */
const HIGHER: ReadonlyArray<SpinExactOptions> = KERNELS.filter((k) => k.kernel !== "pairs");

describe("exhaustiveSpinSlice = brute force", () => {
  it("pair models, whole space, with and without mirror (every kernel and block size)", () => {
    for (let n = 1; n <= 11; n++) {
      for (const integer of [false, true]) {
        const model = randomModel(`pairs-${n}-${integer}`, n, { density: 0.7, integer, fields: false, triples: 0 });
        const want = brute(model);
        for (const opt of KERNELS) {
          for (const mirror of [false, true]) {
            const got = exhaustiveSpinSlice(model, 0, 0, mirror, TOL, null, opt);
            expect(got.optimum).toBeCloseTo(want.optimum, 9);
            expect(got.degeneracy).toBe(want.degeneracy);
            expect(got.assignments).toBe(2 ** n);
            expect(got.complete).toBe(true);
          }
        }
      }
    }
  });

  it("4-body terms with the mirror symmetry (walsh and terms kernels)", () => {
    const rng = new Rng("quartic");
    for (const n of [6, 9, 12]) {
      const terms: { spins: number[]; J: number }[] = [];
      for (let k = 0; k < 3 * n; k++) {
        const set = new Set<number>();
        while (set.size < 4) set.add(rng.below(n));
        terms.push({ spins: [...set], J: rng.below(5) - 2 });
      }
      for (let i = 0; i + 1 < n; i++) terms.push({ spins: [i, i + 1], J: rng.below(3) - 1 });
      const model = isingFromTerms(n, terms);
      const want = brute(model);
      for (const opt of HIGHER) {
        for (const mirror of [false, true]) {
          const got = exhaustiveSpinSlice(model, 0, 0, mirror, TOL, null, opt);
          expect(got.optimum).toBeCloseTo(want.optimum, 9);
          expect(got.degeneracy).toBe(want.degeneracy);
        }
      }
    }
  });

  it("the drift guard path: many high Gray steps (n = 15, lowBits 1 → 2^14 high steps, recompute every 2^8)", () => {
    for (const integer of [false, true]) {
      const model = randomModel(`long-${integer}`, 15, { density: 1, integer, fields: false, triples: 0 });
      const want = brute(model);
      const got = exhaustiveSpinSlice(model, 0, 0, false, TOL, null, { lowBits: 1 });
      expect(got.optimum).toBeCloseTo(want.optimum, 9);
      expect(got.degeneracy).toBe(want.degeneracy);
      const mirrored = exhaustiveSpinSlice(model, 0, 0, true, TOL, null, { lowBits: 0 });
      expect(mirrored.optimum).toBeCloseTo(want.optimum, 9);
      expect(mirrored.degeneracy).toBe(want.degeneracy);
      const walsh = exhaustiveSpinSlice(model, 0, 0, false, TOL, null, { kernel: "walsh", lowBits: 1 });
      expect(walsh.optimum).toBeCloseTo(want.optimum, 9);
      expect(walsh.degeneracy).toBe(want.degeneracy);
    }
  });

  it("prefix slices: each slice equals brute force on it, with and without mirror (top prefix bit 0)", () => {
    const n = 10;
    for (const integer of [false, true]) {
      const model = randomModel(`slices-${integer}`, n, { density: 0.8, integer, fields: false, triples: 0 });
      for (const prefixBits of [1, 3, n]) {
        for (let prefix = 0; prefix < 2 ** prefixBits; prefix++) {
          const want = brute(model, prefixBits, prefix);
          for (const opt of KERNELS) {
            const got = exhaustiveSpinSlice(model, prefixBits, prefix, false, TOL, null, opt);
            expect(got.optimum).toBeCloseTo(want.optimum, 9);
            expect(got.degeneracy).toBe(want.degeneracy);
            expect(got.assignments).toBe(2 ** (n - prefixBits));
            if (prefix < 2 ** (prefixBits - 1)) {
              // Mirror: the slice with top spin up stands for itself and its mirror image (source: E(s) = E(−s)).
              const mirrorWant = want;
              const m = exhaustiveSpinSlice(model, prefixBits, prefix, true, TOL, null, opt);
              expect(m.optimum).toBeCloseTo(mirrorWant.optimum, 9);
              expect(m.degeneracy).toBe(2 * mirrorWant.degeneracy);
              expect(m.assignments).toBe(2 ** (n - prefixBits + 1));
            }
          }
        }
      }
    }
  });

  it("3-body terms and local fields (no mirror), whole space and slices", () => {
    for (let n = 3; n <= 11; n += 2) {
      for (const integer of [false, true]) {
        const model = randomModel(`odd-${n}-${integer}`, n, { density: 0.5, integer, fields: true, triples: 2 * n });
        const want = brute(model);
        for (const opt of HIGHER) {
          const got = exhaustiveSpinSlice(model, 0, 0, false, TOL, null, opt);
          expect(got.optimum).toBeCloseTo(want.optimum, 9);
          expect(got.degeneracy).toBe(want.degeneracy);
          expect(got.assignments).toBe(2 ** n);
          for (let prefix = 0; prefix < 4; prefix++) {
            const w = brute(model, 2, prefix);
            const g = exhaustiveSpinSlice(model, 2, prefix, false, TOL, null, opt);
            expect(g.optimum).toBeCloseTo(w.optimum, 9);
            expect(g.degeneracy).toBe(w.degeneracy);
          }
        }
      }
    }
  });

  it("fields only (pairs kernel, no mirror): optimum −Σ|h| with 2^(zero fields) optima (source: closed form)", () => {
    const h = [0.5, -2, 0, 1.25, 0, -0.75];
    const model = isingFromTerms(6, h.map((J, i) => ({ spins: [i], J })));
    for (const opt of KERNELS) {
      const got = exhaustiveSpinSlice(model, 0, 0, false, TOL, null, opt);
      expect(got.optimum).toBeCloseTo(-4.5, 12);
      expect(got.degeneracy).toBe(4);
    }
  });

  it("a raised stop flag ends the slice early, marked incomplete", () => {
    const model = randomModel("stop", 14, { density: 1, integer: false, fields: false, triples: 0 });
    const stop = new Int32Array(new SharedArrayBuffer(4));
    Atomics.store(stop, 0, 1);
    for (const opt of KERNELS) {
      const got = exhaustiveSpinSlice(model, 0, 0, false, TOL, stop, opt);
      expect(got.complete).toBe(false);
      expect(got.assignments).toBeLessThan(2 ** 14);
    }
  });

  it("rejects a mirror request on a model with odd-order terms, and bad prefixes", () => {
    const model = isingFromTerms(3, [{ spins: [0], J: 1 }]);
    expect(() => exhaustiveSpinSlice(model, 0, 0, true, TOL, null)).toThrow(RangeError);
    const even = isingFromTerms(3, [{ spins: [0, 1], J: 1 }]);
    expect(() => exhaustiveSpinSlice(even, 2, 2, true, TOL, null)).toThrow(RangeError); // top spin down
    expect(() => exhaustiveSpinSlice(even, 2, 4, false, TOL, null)).toThrow(RangeError);
    expect(() => exhaustiveSpinSlice(even, 4, 0, false, TOL, null)).toThrow(RangeError);
  });
});
