/**
 * The Ising engines of the annealer (cost = energy): a dense engine with local fields for order ≤ 2 models that
 * fill at least a quarter of the pairs, and a term engine for sparse graphs and higher orders (see anneal.ts).
 */
import type { Rng } from "../harness/random.js";
import type { Ising } from "../harness/model/ising.js";
import { type Engine, type Poll, EXP_STEPS, EXP_TABLE, MAX_EXPONENT, PLACEHOLDER_RNG, pollStop, randomBits } from "./anneal-setup.js";

/** Largest n for the dense pair matrix (8·n² bytes: 32 MiB at 2048). */
export const DENSE_MAX_SPINS = 2048;

/** Split of an Ising model into constant, local fields and the remaining terms. */
export function splitTerms(model: Ising): { constant: number; field: Float64Array } {
  let constant = model.constant;
  const field = new Float64Array(model.spins);
  for (let t = 0; t + 1 < model.termOffsets.length; t++) {
    const size = model.termOffsets[t + 1] - model.termOffsets[t];
    if (size === 0) constant -= model.coefficients[t];
    else if (size === 1) field[model.termSpins[model.termOffsets[t]]] += model.coefficients[t];
  }
  return { constant, field };
}

/** Exact energy of spins s (±1) from the term list, for starts and for verifying a success. */
export function energyFromTerms(model: Ising, s: Float64Array): number {
  let e = model.constant;
  for (let t = 0; t + 1 < model.termOffsets.length; t++) {
    let p = 1;
    for (let i = model.termOffsets[t]; i < model.termOffsets[t + 1]; i++) p *= s[model.termSpins[i]];
    e -= model.coefficients[t] * p;
  }
  return e;
}

/** Ising of order ≤ 2 with a dense symmetric coupling matrix; h_i = f_i + Σ_j J_ij s_j, ΔE_i = 2 s_i h_i. */
export class DenseEngine implements Engine {
  readonly n: number;
  best = Infinity;
  hit = false;
  private energy = 0;
  private threshold = -Infinity;
  private rng: Rng = PLACEHOLDER_RNG;
  private betas: Float64Array = new Float64Array(0);
  private readonly model: Ising;
  private readonly coupling: Float64Array;
  private readonly field: Float64Array;
  private readonly spin: Float64Array;
  private readonly local: Float64Array;
  private readonly bits: Uint8Array;

  constructor(model: Ising) {
    const n = model.spins;
    this.n = n;
    this.model = model;
    this.field = splitTerms(model).field;
    this.coupling = new Float64Array(n * n);
    for (let t = 0; t + 1 < model.termOffsets.length; t++) {
      if (model.termOffsets[t + 1] - model.termOffsets[t] !== 2) continue;
      const i = model.termSpins[model.termOffsets[t]];
      const j = model.termSpins[model.termOffsets[t] + 1];
      this.coupling[i * n + j] += model.coefficients[t];
      this.coupling[j * n + i] += model.coefficients[t];
    }
    this.spin = new Float64Array(n);
    this.local = new Float64Array(n);
    this.bits = new Uint8Array(n);
  }

  prepare(betas: Float64Array): void {
    this.betas = betas;
  }

  run(poll: Poll): boolean {
    const betas = this.betas;
    for (let s = 0; s < betas.length; s++) {
      if (pollStop(poll)) return false;
      poll.since += this.n;
      this.sweep(betas[s], this.rng);
    }
    return true;
  }

  start(rng: Rng, threshold: number): void {
    this.rng = rng;
    const n = this.n;
    randomBits(rng, this.bits);
    for (let i = 0; i < n; i++) this.spin[i] = this.bits[i] === 0 ? 1 : -1;
    for (let i = 0; i < n; i++) {
      let h = this.field[i];
      for (let j = 0; j < n; j++) h += this.coupling[i * n + j] * this.spin[j];
      this.local[i] = h;
    }
    this.energy = energyFromTerms(this.model, this.spin);
    this.best = this.energy;
    this.hit = this.energy <= threshold;
    this.threshold = this.hit ? -Infinity : threshold;
  }

  delta(i: number): number {
    return 2 * this.spin[i] * this.local[i];
  }

  flip(i: number): void {
    const n = this.n;
    const s = this.spin;
    const h = this.local;
    const J = this.coupling;
    this.energy += 2 * s[i] * h[i];
    const c = -2 * s[i];
    s[i] = -s[i];
    const row = i * n;
    for (let j = 0; j < n; j++) h[j] += c * J[row + j];
  }

  sweep(beta: number, rng: Rng): void {
    const n = this.n;
    const s = this.spin;
    const h = this.local;
    const J = this.coupling;
    const table = EXP_TABLE;
    let e = this.energy;
    let best = this.best;
    for (let i = 0; i < n; i++) {
      const si = s[i];
      const d = 2 * si * h[i];
      if (d > 0) {
        const x = beta * d;
        if (x > MAX_EXPONENT) continue;
        const u = rng.nextU32();
        const k = (x * EXP_STEPS) | 0;
        if (u >= table[k] || (u >= table[k + 1] && u >= Math.exp(-x) * 4294967296)) continue;
      }
      s[i] = -si;
      const c = -2 * si;
      const row = i * n;
      for (let j = 0; j < n; j++) h[j] += c * J[row + j];
      e += d;
      if (e < best) {
        best = e;
        if (e <= this.threshold) e = this.confirm(e);
      }
    }
    this.energy = e;
    this.best = best;
  }

  /** Recomputes the energy from scratch when the running value claims success; returns the exact value. */
  private confirm(running: number): number {
    const exact = energyFromTerms(this.model, this.spin);
    if (exact <= this.threshold) {
      this.hit = true;
      this.threshold = -Infinity; // one success per trial is all we count
    }
    return Number.isFinite(exact) ? exact : running;
  }
}

/**
 * Any Ising model through its term list: product sign of each term, and per spin g_i = Σ_{t∋i} J_t·Π_t s,
 * so ΔE_i = 2·g_i; flipping i negates its terms' products and moves g_j of their other spins.
 */
export class TermEngine implements Engine {
  readonly n: number;
  best = Infinity;
  hit = false;
  private energy = 0;
  private threshold = -Infinity;
  private rng: Rng = PLACEHOLDER_RNG;
  private betas: Float64Array = new Float64Array(0);
  private readonly model: Ising;
  /** Non-constant terms: spins of term t are termSpins[termStart[t] .. termStart[t+1]). */
  private readonly termStart: Int32Array;
  private readonly termSpins: Int32Array;
  private readonly termJ: Float64Array;
  /** Terms containing spin i: memberOf[memberStart[i] .. memberStart[i+1]). */
  private readonly memberStart: Int32Array;
  private readonly memberOf: Int32Array;
  private readonly product: Float64Array;
  private readonly sum: Float64Array;
  private readonly spin: Float64Array;
  private readonly bits: Uint8Array;

  constructor(model: Ising) {
    const n = model.spins;
    this.n = n;
    this.model = model;
    const start: number[] = [0];
    const spins: number[] = [];
    const J: number[] = [];
    for (let t = 0; t + 1 < model.termOffsets.length; t++) {
      const from = model.termOffsets[t];
      const to = model.termOffsets[t + 1];
      if (from === to) continue;
      for (let i = from; i < to; i++) spins.push(model.termSpins[i]);
      start.push(spins.length);
      J.push(model.coefficients[t]);
    }
    this.termStart = Int32Array.from(start);
    this.termSpins = Int32Array.from(spins);
    this.termJ = Float64Array.from(J);
    const terms = J.length;
    this.memberStart = new Int32Array(n + 1);
    for (const i of spins) this.memberStart[i + 1]++;
    for (let i = 0; i < n; i++) this.memberStart[i + 1] += this.memberStart[i];
    const fill = this.memberStart.slice(0, n);
    this.memberOf = new Int32Array(spins.length);
    for (let t = 0; t < terms; t++) {
      for (let k = start[t]; k < start[t + 1]; k++) this.memberOf[fill[spins[k]]++] = t;
    }
    this.product = new Float64Array(terms);
    this.sum = new Float64Array(n);
    this.spin = new Float64Array(n);
    this.bits = new Uint8Array(n);
  }

  prepare(betas: Float64Array): void {
    this.betas = betas;
  }

  run(poll: Poll): boolean {
    const betas = this.betas;
    for (let s = 0; s < betas.length; s++) {
      if (pollStop(poll)) return false;
      poll.since += this.n;
      this.sweep(betas[s], this.rng);
    }
    return true;
  }

  start(rng: Rng, threshold: number): void {
    this.rng = rng;
    const n = this.n;
    randomBits(rng, this.bits);
    for (let i = 0; i < n; i++) this.spin[i] = this.bits[i] === 0 ? 1 : -1;
    this.sum.fill(0);
    for (let t = 0; t < this.termJ.length; t++) {
      let p = 1;
      for (let k = this.termStart[t]; k < this.termStart[t + 1]; k++) p *= this.spin[this.termSpins[k]];
      this.product[t] = p;
      const w = this.termJ[t] * p;
      for (let k = this.termStart[t]; k < this.termStart[t + 1]; k++) this.sum[this.termSpins[k]] += w;
    }
    this.energy = energyFromTerms(this.model, this.spin);
    this.best = this.energy;
    this.hit = this.energy <= threshold;
    this.threshold = this.hit ? -Infinity : threshold;
  }

  delta(i: number): number {
    return 2 * this.sum[i];
  }

  flip(i: number): void {
    this.energy += 2 * this.sum[i];
    this.apply(i);
  }

  private apply(i: number): void {
    const { termStart, termSpins, termJ, memberStart, memberOf, product, sum } = this;
    this.spin[i] = -this.spin[i];
    for (let k = memberStart[i], end = memberStart[i + 1]; k < end; k++) {
      const t = memberOf[k];
      const w2 = 2 * termJ[t] * product[t];
      product[t] = -product[t];
      for (let q = termStart[t], e = termStart[t + 1]; q < e; q++) {
        const j = termSpins[q];
        if (j !== i) sum[j] -= w2;
      }
    }
    sum[i] = -sum[i];
  }

  sweep(beta: number, rng: Rng): void {
    const n = this.n;
    const sum = this.sum;
    const table = EXP_TABLE;
    let e = this.energy;
    let best = this.best;
    for (let i = 0; i < n; i++) {
      const d = 2 * sum[i];
      if (d > 0) {
        const x = beta * d;
        if (x > MAX_EXPONENT) continue;
        const u = rng.nextU32();
        const k = (x * EXP_STEPS) | 0;
        if (u >= table[k] || (u >= table[k + 1] && u >= Math.exp(-x) * 4294967296)) continue;
      }
      this.apply(i);
      e += d;
      if (e < best) {
        best = e;
        if (e <= this.threshold) e = this.confirm(e);
      }
    }
    this.energy = e;
    this.best = best;
  }

  private confirm(running: number): number {
    const exact = energyFromTerms(this.model, this.spin);
    if (exact <= this.threshold) {
      this.hit = true;
      this.threshold = -Infinity;
    }
    return Number.isFinite(exact) ? exact : running;
  }
}
