/**
 * Dense p-spin glass (Derrida, "Random-energy model: limit of a family of disordered models", Phys. Rev. Lett. 45,
 * 79 (1980); Gross & Mézard, Nucl. Phys. B 240, 431 (1984)): E(s) = −Σ_{i1<…<ip} J s_i1…s_ip over all C(n, p)
 * p-subsets, J ~ N(0, p!/(2 n^{p−1})), the usual normalisation that makes E/n of order one. p = 2 is SK.
 */
import { InputError } from "../errors.js";
import type { Ising } from "../model/ising.js";
import { Rng, deriveSeed } from "../random.js";
import { canonicalParams } from "./params.js";
import type { GeneratedFamily, FamilyParams, GeneratedInstance } from "./types.js";

/** Largest number of terms one instance may have (C(n, p)); 5·10^7 terms are ~1 GB of arrays (common practice). */
export const PSPIN_MAX_TERMS = 50_000_000;

/** Number of terms C(n, p) of an instance (rounded from the product formula; exact below 2^53). */
export function pspinTerms(n: number, p: number): number {
  let terms = 1;
  for (let k = 0; k < p; k++) terms = (terms * (n - k)) / (k + 1);
  return Math.round(terms);
}

/** Variance of each coupling, p!/(2 n^{p−1}). */
export function pspinVariance(n: number, p: number): number {
  let f = 1;
  for (let k = 2; k <= p; k++) f *= k;
  return f / (2 * n ** (p - 1));
}

/**
 * The `pspin` family. Parameters: `p` (integer ≥ 2, default 3, at most n). Terms come in lexicographic order of
 * their index sets; meta = { p, terms }.
 */
export const pspinFamily: GeneratedFamily = {
  name: "pspin",
  kind: "ising",
  source: "generated",
  description: "dense p-spin glass over all C(n, p) p-subsets, Var J = p!/(2 n^{p−1})",
  params: ["p"],
  resolveParams: (read) => ({ p: read.number("p") }),
  checkSize(n, params) {
    const p = Number(params.p);
    if (n < p) return `--n: size ${n} is smaller than p = ${p}`;
    const terms = pspinTerms(n, p);
    if (terms > PSPIN_MAX_TERMS) return `--n: size ${n} with p = ${p} has C(${n}, ${p}) = ${terms} terms, beyond the limit of ${PSPIN_MAX_TERMS}`;
    return null;
  },
  // Terms of even order only: E(s) = E(−s).
  flipSymmetric: (params) => Number(params.p) % 2 === 0,
  costShape(params) {
    const p = Number(params.p);
    const binom = (n: number): number => {
      let c = 1;
      for (let i = 0; i < p; i++) c = (c * (n - i)) / (i + 1);
      return c;
    };
    return { kind: "ising", clausesPerVariable: 0, k: 0, termsAt: binom, order: p };
  },
  generate(masterSeed: string, params: FamilyParams, n: number, index: number): GeneratedInstance {
    const p = Number(params.p ?? 3);
    if (!Number.isInteger(p) || p < 2) throw new InputError(`--p: ${String(params.p)} must be an integer ≥ 2`);
    if (!Number.isInteger(n) || n < p) throw new InputError(`pspin: n = ${n} must be an integer ≥ p = ${p}`);
    const terms = pspinTerms(n, p);
    if (terms > PSPIN_MAX_TERMS) throw new InputError(`pspin: C(${n}, ${p}) = ${terms} terms exceed ${PSPIN_MAX_TERMS}`);
    const seed = deriveSeed(masterSeed, "pspin", canonicalParams(params), n, index);
    const rng = new Rng(seed);
    const sigma = Math.sqrt(pspinVariance(n, p));
    const termSpins = new Int32Array(p * terms);
    const termOffsets = new Int32Array(terms + 1);
    const coefficients = new Float64Array(terms);
    // Walk the p-subsets in lexicographic order: idx is the current subset.
    const idx = new Int32Array(p);
    for (let k = 0; k < p; k++) idx[k] = k;
    for (let t = 0; t < terms; t++) {
      termOffsets[t] = p * t;
      for (let k = 0; k < p; k++) termSpins[p * t + k] = idx[k];
      coefficients[t] = rng.normal() * sigma;
      let k = p - 1;
      while (k >= 0 && idx[k] === n - p + k) k--;
      if (k < 0) break;
      idx[k]++;
      for (let r = k + 1; r < p; r++) idx[r] = idx[r - 1] + 1;
    }
    termOffsets[terms] = p * terms;
    const ising: Ising = { spins: n, termOffsets, termSpins, coefficients, constant: 0 };
    return { problem: { kind: "ising", ising }, seed, meta: { p, terms } };
  },
};
