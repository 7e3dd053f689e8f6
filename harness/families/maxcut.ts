/**
 * MaxCut on random d-regular graphs, as the Ising energy E(s) = Σ_{edges (i,j)} s_i s_j (coefficient J = −1 per
 * edge, so every cut edge lowers E by 2): cut = (edges − E)/2.
 *
 * Graphs are uniform over the simple d-regular graphs on n labelled vertices, drawn with the configuration
 * (pairing) model and rejection: n·d half-edges are paired uniformly at random, and a pairing that makes a loop or
 * a repeated edge is thrown away whole and drawn again (Bollobás, "A probabilistic proof of an asymptotic formula
 * for the number of labelled regular graphs", Eur. J. Combin. 1, 311 (1980): every simple graph arises from the
 * same number (d!)^n of pairings, so the accepted graph is uniform). A pairing is abandoned at its first bad pair,
 * which rejects exactly the same pairings, only sooner. The acceptance probability tends to exp(−(d²−1)/4), so the
 * method suits small degrees; when d > (n−1)/2 we draw the complement graph (degree n−1−d, uniform by the same
 * method) and complement it, a bijection between simple d- and (n−1−d)-regular graphs that keeps uniformity
 * (so K_n and near-complete graphs are cheap). Degrees with min(d, n−1−d) ≳ 8 exceed the rejection limit.
 */
import { InputError } from "../errors.js";
import type { Ising } from "../model/ising.js";
import { Rng, deriveSeed } from "../random.js";
import { canonicalParams } from "./params.js";
import type { GeneratedFamily, FamilyParams, GeneratedInstance } from "./types.js";

/** Rejected pairings after which an instance is refused (acceptance ≈ exp(−(d²−1)/4): ~8·10^−7 at d = 8). */
export const MAXCUT_MAX_REJECTIONS = 1_000_000;

/** Cut value of a configuration of energy `energy` on a graph with `edges` edges: (edges − energy)/2. */
export function cutValue(edges: number, energy: number): number {
  return (edges - energy) / 2;
}

/**
 * The `maxcut` family. Parameters: `degree` (integer d ≥ 1, default 3; d < n and n·d even). Edges (i < j) come in
 * lexicographic order, each a term {i, j} with J = −1; meta = { degree, edges, rejected_draws }.
 */
export const maxcutFamily: GeneratedFamily = {
  name: "maxcut",
  kind: "ising",
  source: "generated",
  description: "MaxCut on random d-regular graphs (energy Σ_edges s_i s_j; cut = (edges − E)/2)",
  params: ["degree"],
  resolveParams: (read) => ({ degree: read.number("degree") }),
  checkSize(n, params) {
    const d = Number(params.degree);
    return n <= d || (n * d) % 2 === 1 ? `--n: no simple ${d}-regular graph on ${n} vertices (need n > d and n·d even)` : null;
  },
  flipSymmetric: () => true,
  costShape: (params) => ({ kind: "ising", clausesPerVariable: 0, k: 0, termsAt: (n) => (n * Number(params.degree)) / 2, order: 2 }),
  // The optimum energy Σ_edges s_i s_j as the largest cut, (edges − E)/2.
  describe: (meta, optimum): Record<string, number> => (optimum === null ? {} : { max_cut: cutValue(Number(meta.edges), optimum) }),
  generate(masterSeed: string, params: FamilyParams, n: number, index: number): GeneratedInstance {
    const d = Number(params.degree ?? 3);
    if (!Number.isInteger(d) || d < 1) throw new InputError(`--degree: ${String(params.degree)} must be a positive integer`);
    if (!Number.isInteger(n) || d >= n) {
      throw new InputError(`maxcut: a ${d}-regular simple graph needs more than ${d} vertices (n = ${n})`);
    }
    if ((n * d) % 2 !== 0) throw new InputError(`maxcut: n·degree = ${n}·${d} is odd; a d-regular graph needs n·d even`);
    const seed = deriveSeed(masterSeed, "maxcut", canonicalParams(params), n, index);
    const rng = new Rng(seed);
    const complement = n - 1 - d < d;
    const drawn = drawRegular(rng, n, complement ? n - 1 - d : d);
    const edges = complement ? complementOf(drawn.edges, n) : drawn.edges;
    const rejected = drawn.rejected;
    const m = edges.length / 2;
    const termOffsets = new Int32Array(m + 1);
    for (let t = 0; t <= m; t++) termOffsets[t] = 2 * t;
    const ising: Ising = {
      spins: n,
      termOffsets,
      termSpins: edges,
      coefficients: new Float64Array(m).fill(-1),
      constant: 0,
    };
    return { problem: { kind: "ising", ising }, seed, meta: { degree: d, edges: m, rejected_draws: rejected } };
  },
};

/** Edges (i < j, lexicographic) of the complement of a simple graph given the same way. */
function complementOf(edges: Int32Array, n: number): Int32Array {
  const adjacent = new Uint8Array(n * n);
  for (let k = 0; k < edges.length; k += 2) adjacent[edges[k] * n + edges[k + 1]] = 1;
  const out = new Int32Array(n * (n - 1) - edges.length);
  let at = 0;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      if (adjacent[i * n + j] === 0) {
        out[at++] = i;
        out[at++] = j;
      }
    }
  }
  return out;
}

/** Uniform simple d-regular graph by the pairing model; edges as (i < j) pairs in lexicographic order. */
function drawRegular(rng: Rng, n: number, d: number): { edges: Int32Array; rejected: number } {
  const points = n * d;
  const stubs = new Int32Array(points);
  const nbr = new Int32Array(points); // nbr[v·d + k]: k-th neighbour of v so far
  const deg = new Int32Array(n);
  const edges = new Int32Array(points);
  for (let rejected = 0; rejected <= MAXCUT_MAX_REJECTIONS; rejected++) {
    for (let k = 0; k < points; k++) stubs[k] = k;
    deg.fill(0);
    let ok = true;
    // Pair the last unpaired half-edge with a uniform one among the others still unpaired: a uniform pairing.
    for (let top = points - 1; top > 0 && ok; top -= 2) {
      const r = rng.below(top);
      const mate = stubs[r];
      stubs[r] = stubs[top - 1];
      stubs[top - 1] = mate;
      const u = Math.floor(stubs[top] / d);
      const v = Math.floor(mate / d);
      if (u === v) ok = false;
      for (let k = 0; k < deg[u] && ok; k++) if (nbr[u * d + k] === v) ok = false;
      if (ok) {
        nbr[u * d + deg[u]++] = v;
        nbr[v * d + deg[v]++] = u;
      }
    }
    if (!ok) continue;
    let at = 0;
    for (let u = 0; u < n; u++) {
      const row = Array.from(nbr.subarray(u * d, u * d + d)).filter((v) => v > u).sort((x, y) => x - y);
      for (const v of row) {
        edges[at++] = u;
        edges[at++] = v;
      }
    }
    return { edges, rejected };
  }
  throw new InputError(
    `maxcut: the pairing model rejected ${MAXCUT_MAX_REJECTIONS} draws for degree ${d} (n = ${n}); use a smaller degree`,
  );
}
