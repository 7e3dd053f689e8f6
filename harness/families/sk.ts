/**
 * Sherrington–Kirkpatrick spin glass ("Solvable model of a spin-glass", Phys. Rev. Lett. 35, 1792 (1975)):
 * E(s) = −Σ_{i<j} J_ij s_i s_j over all n(n−1)/2 pairs, with J_ij ~ N(0, 1/n) (`couplings = "gauss"`, default)
 * or J_ij = ±1/√n with equal probability (`couplings = "pm1"`). With this scaling E/n stays of order one and the
 * ground-state energy per spin tends to the Parisi value −0.7633.
 */
import { InputError } from "../errors.js";
import type { Ising } from "../model/ising.js";
import { Rng, deriveSeed } from "../random.js";
import { canonicalParams } from "./params.js";
import type { GeneratedFamily, FamilyParams, GeneratedInstance } from "./types.js";

/** Coupling distributions of the `sk` family. */
export type SkCouplings = "gauss" | "pm1";

/**
 * The `sk` family. Parameters: `couplings` ("gauss" | "pm1", default "gauss"). Terms come in the order
 * (0,1), (0,2), …, (0,n−1), (1,2), …; meta = { couplings, terms }.
 */
export const skFamily: GeneratedFamily = {
  name: "sk",
  kind: "ising",
  source: "generated",
  description: "Sherrington–Kirkpatrick spin glass, J ~ N(0,1/n) or ±1/√n on every pair",
  params: ["couplings"],
  resolveParams(read) {
    const couplings = read.text("couplings");
    if (!["gauss", "pm1"].includes(couplings)) throw new InputError(`--couplings: '${couplings}' is not gauss or pm1`);
    return { couplings };
  },
  checkSize: () => null,
  flipSymmetric: () => true,
  costShape: () => ({ kind: "ising", clausesPerVariable: 0, k: 0, termsAt: (n) => (n * (n - 1)) / 2, order: 2 }),
  generate(masterSeed: string, params: FamilyParams, n: number, index: number): GeneratedInstance {
    const couplings = String(params.couplings ?? "gauss");
    if (couplings !== "gauss" && couplings !== "pm1") {
      throw new InputError(`--couplings: '${couplings}' is not one of gauss, pm1`);
    }
    if (!Number.isInteger(n) || n < 1) throw new InputError(`sk: n = ${n} must be a positive integer`);
    const seed = deriveSeed(masterSeed, "sk", canonicalParams(params), n, index);
    const rng = new Rng(seed);
    const terms = (n * (n - 1)) / 2;
    const termSpins = new Int32Array(2 * terms);
    const termOffsets = new Int32Array(terms + 1);
    const coefficients = new Float64Array(terms);
    const scale = 1 / Math.sqrt(n);
    let t = 0;
    for (let i = 0; i < n; i++) {
      for (let j = i + 1; j < n; j++) {
        termOffsets[t] = 2 * t;
        termSpins[2 * t] = i;
        termSpins[2 * t + 1] = j;
        coefficients[t] = couplings === "gauss" ? rng.normal() * scale : rng.bit() === 1 ? scale : -scale;
        t++;
      }
    }
    termOffsets[terms] = 2 * terms;
    const ising: Ising = { spins: n, termOffsets, termSpins, coefficients, constant: 0 };
    return { problem: { kind: "ising", ising }, seed, meta: { couplings, terms } };
  },
};
