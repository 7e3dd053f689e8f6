/**
 * Ising-type cost functions shared by the spin-glass and MaxCut generators, the coupling-file reader,
 * the spin solvers and the spectral predictor.
 *
 * E(s) = constant − Σ_t J_t · Π_{i ∈ t} s_i, with s_i ∈ {+1, −1}.
 * Spin/bit convention everywhere in speedbound: bit i of a configuration index z is 0 for s_i = +1 and 1 for
 * s_i = −1, so z = 0 is the all-up state.
 */
export interface Ising {
  /** Number of spins n. */
  readonly spins: number;
  /** Term t acts on termSpins[termOffsets[t] .. termOffsets[t+1]) (0-based, distinct); length = terms + 1. */
  readonly termOffsets: Int32Array;
  /** Spin indices of all terms, term after term. */
  readonly termSpins: Int32Array;
  /** Coefficient J_t of each term (the energy gets −J_t·Π s). */
  readonly coefficients: Float64Array;
  /** Constant energy offset (0 for the generated families). */
  readonly constant: number;
}

/** Builds an {@link Ising} from a list of terms. */
export function isingFromTerms(
  spins: number,
  terms: ReadonlyArray<{ readonly spins: ReadonlyArray<number>; readonly J: number }>,
  constant = 0,
): Ising {
  let total = 0;
  for (const t of terms) total += t.spins.length;
  const termSpins = new Int32Array(total);
  const termOffsets = new Int32Array(terms.length + 1);
  const coefficients = new Float64Array(terms.length);
  let at = 0;
  terms.forEach((t, i) => {
    termOffsets[i] = at;
    coefficients[i] = t.J;
    for (const s of t.spins) termSpins[at++] = s;
  });
  termOffsets[terms.length] = at;
  return { spins, termOffsets, termSpins, coefficients, constant };
}

/** Energy of configuration index z (bit i = 1 means s_i = −1). Reference evaluation; n ≤ 52. */
export function isingEnergyOf(model: Ising, z: number): number {
  let e = model.constant;
  for (let t = 0; t + 1 < model.termOffsets.length; t++) {
    let sign = 1;
    for (let i = model.termOffsets[t]; i < model.termOffsets[t + 1]; i++) {
      if (Math.floor(z / 2 ** model.termSpins[i]) % 2 === 1) sign = -sign;
    }
    e -= model.coefficients[t] * sign;
  }
  return e;
}

/** True when every term has even order, so E(s) = E(−s) and configurations come in mirror pairs. */
export function hasFlipSymmetry(model: Ising): boolean {
  for (let t = 0; t + 1 < model.termOffsets.length; t++) {
    if ((model.termOffsets[t + 1] - model.termOffsets[t]) % 2 === 1) return false;
  }
  return true;
}

/** Largest term order (2 for SK and MaxCut, p for p-spin). */
export function maxOrder(model: Ising): number {
  let p = 0;
  for (let t = 0; t + 1 < model.termOffsets.length; t++) p = Math.max(p, model.termOffsets[t + 1] - model.termOffsets[t]);
  return p;
}
