/**
 * Exact state-vector simulation of Grover's iteration, for tests only: 2^n real amplitudes in a Float64Array,
 * oracle = phase flip of the marked basis states, diffusion = reflection about the uniform state
 * (a ↦ 2·mean(a) − a). Independent of the closed forms in harness/predict/grover.ts.
 */

/** Uniform superposition over 2^n basis states. */
export function uniformState(n: number): Float64Array {
  const N = 2 ** n;
  return new Float64Array(N).fill(1 / Math.sqrt(N));
}

/** Oracle: flips the sign of every marked amplitude. */
export function applyOracle(state: Float64Array, marked: ReadonlyArray<number>): void {
  for (const z of marked) state[z] = -state[z];
}

/** Diffusion: reflection about the uniform state, a ↦ 2·mean − a. */
export function applyDiffusion(state: Float64Array): void {
  let sum = 0;
  for (let i = 0; i < state.length; i++) sum += state[i];
  const twoMean = (2 * sum) / state.length;
  for (let i = 0; i < state.length; i++) state[i] = twoMean - state[i];
}

/** Probability of measuring a marked state. */
export function markedProbability(state: Float64Array, marked: ReadonlyArray<number>): number {
  let p = 0;
  for (const z of marked) p += state[z] * state[z];
  return p;
}

/**
 * Success probability after k = 0, 1, …, kMax Grover iterations from the uniform state (entry k).
 * @param marked - distinct basis-state indices in [0, 2^n).
 */
export function groverCurve(n: number, marked: ReadonlyArray<number>, kMax: number): Float64Array {
  if (new Set(marked).size !== marked.length) throw new RangeError("marked states must be distinct");
  const state = uniformState(n);
  const out = new Float64Array(kMax + 1);
  out[0] = markedProbability(state, marked);
  for (let k = 1; k <= kMax; k++) {
    applyOracle(state, marked);
    applyDiffusion(state);
    out[k] = markedProbability(state, marked);
  }
  return out;
}
