/**
 * Fault-tolerant cost model: puts predicted query counts and measured classical times on one time axis, after
 * Babbush, McClean, Newman, Gidney, Boixo and Neven, "Focus beyond quadratic speedups for error-corrected
 * quantum advantage", PRX Quantum 2, 010103 (2021), arXiv:2011.04149.
 *
 * Quantum time = queries × Toffolis per query × Toffoli time / factories. The Toffoli time is the dominant cost in
 * a surface-code machine: non-Clifford gates are made by magic-state factories, and Clifford gates (CNOT, H, S,
 * X, Z, measurements) are counted as free.
 *
 * Toffolis per query are derived below per problem kind, counting every compute as a Toffoli ladder and every
 * uncompute as its mirror image (so uncomputation doubles the count). Measurement-based uncomputation of temporary
 * AND gates (Gidney, "Halving the cost of quantum addition", Quantum 2, 74 (2018), arXiv:1709.06648) would remove
 * the uncompute Toffolis of the AND ladders (k-SAT clause bits, diffusion), about halving the k-SAT figure; the
 * energy register of the Ising oracle still has to be subtracted back. Override with `oracleToffolisOverride` to
 * use another count.
 */
import { groverKnown } from "./grover.js";

/** Parameters of the cost model; all overridable on the command line and written to the manifest. */
export interface CostModelOptions {
  /**
   * Seconds per Toffoli with one factory. Default 170e-6: one Toffoli every ≈ 170 µs with one factory (surface code,
   * code cycle 1 µs, distance ≈ 30), as stated in Babbush et al. 2021 (arXiv:2011.04149); it is the output period
   * of the CCZ factory of Gidney & Fowler (arXiv:1812.01238), one CCZ state per 5.5·d cycles, at d ≈ 31.
   * CLI: `--toffoli-us`.
   */
  toffoliSeconds: number;
  /** Factories working in parallel; Toffoli throughput scales with them. Default 1. CLI: `--factories`. */
  factories: number;
  /** Classical parallelism S: classical time is divided by S. Default 1. CLI: `--classical-parallelism`. */
  classicalParallelism: number;
  /** Reversible Toffolis of one Schöning step, replacing {@link walkStepToffolis}'s derivation. CLI: `--walk-step-toffolis`. */
  walkStepToffolis?: number;
  /** Reversible Toffolis of one Metropolis update, replacing {@link annealStepToffolis}'s derivation. CLI: `--anneal-step-toffolis`. */
  annealStepToffolis?: number;
  /** Toffolis of one query (oracle and diffusion together), replacing {@link toffolisPerQuery}'s derivation. CLI: `--oracle-toffolis`. */
  oracleToffolisOverride?: number;
  /**
   * Bits of precision b of each Ising coefficient, relative to the largest |J|: the energy resolution is
   * max|J|·2^−b. Default 8 (common practice for a fixed-point energy register; not from a cited source).
   */
  couplingBits?: number;
}

/** Defaults of {@link CostModelOptions}. */
export const COST_MODEL_DEFAULTS: CostModelOptions = Object.freeze({
  toffoliSeconds: 170e-6,
  factories: 1,
  classicalParallelism: 1,
  couplingBits: 8,
});

/** Size parameters of an instance that the Toffoli counts depend on. */
export interface CostShape {
  /** Number of binary variables n. */
  n: number;
  /** k-SAT: number of clauses m. */
  clauses?: number;
  /** k-SAT: clause width k (for mixed widths, the mean width). */
  k?: number;
  /** Ising: number of terms T (products of spins with a coefficient). */
  terms?: number;
  /** Ising: largest term order p (2 for SK and MaxCut). Parities are Clifford, so p does not change the count. */
  order?: number;
  /**
   * k-SAT: true when the oracle must compare the number of violated clauses with a threshold (minimum finding on
   * unsatisfiable formulas) instead of testing "all clauses satisfied". Default false.
   */
  comparison?: boolean;
}

/** A Toffoli count with the written derivation behind it (goes to the manifest and the `cost` table). */
export interface ToffoliCount {
  toffolis: number;
  derivation: string;
}

/**
 * Toffolis of the diffusion step, the reflection about the uniform state: H on all n qubits, a phase on |0…0⟩,
 * H again. The n-fold controlled phase is a ladder of n−2 Toffolis computing the AND of n−1 bits, one Toffoli onto
 * a |−⟩ target, and the mirrored ladder to uncompute: 2(n−2) + 1 = 2n − 3 (n ≥ 2; Nielsen & Chuang, section 4.3,
 * multiply-controlled operations with work qubits).
 */
export function diffusionToffolis(n: number): number {
  checkPositiveInteger("n", n);
  return n < 2 ? 0 : 2 * n - 3;
}

/**
 * Toffolis of one query: one Grover iteration = oracle + diffusion ({@link diffusionToffolis}).
 *
 * k-SAT search oracle ("all m clauses satisfied"), clause width k:
 *  1. each clause is an OR of k literals = NOT of the AND of the negated literals (X gates are free): a ladder of
 *     k−1 Toffolis puts it on a work bit (Nielsen & Chuang, section 4.3) → m(k−1);
 *  2. the AND of the m clause bits: m−2 Toffolis compute it but for the last pair, and 1 Toffoli applies the phase
 *     by targeting a |−⟩ qubit → m−1;
 *  3. uncompute steps 1 and 2 (mirror ladders) → m(k−1) + (m−2).
 *  Total 2m(k−1) + 2m − 3 = 2mk − 3 ≈ 2mk.
 *
 * k-SAT comparison oracle (`comparison`: violated clauses < threshold, for minimum finding): clause bits as above,
 * m(k−1); add each clause bit into a counter of c = ⌈log₂(m+1)⌉ bits, ≈ c Toffolis per increment (ripple-carry
 * increment) → m·c; compare with the threshold, c Toffolis (a subtraction's carry chain), the last one applying
 * the phase; uncompute all but the phase. Total 2(m(k−1) + m·c) + 2c − 1.
 *
 * Ising energy oracle (energy below a threshold — the search oracle with the known optimum as threshold, or the
 * comparison oracle of minimum finding), T terms of any order p:
 *  1. each term's spin product is a parity (p−1 CNOTs, free); its contribution ±J_t is added to an energy register
 *     of w bits as a controlled addition of a classical constant (the constant's bits copied from the parity bit by
 *     CNOTs, then a w-bit addition of w−1 Toffolis, Gidney arXiv:1709.06648), ≈ w Toffolis → T·w;
 *  2. comparison with the threshold (the carry chain of a w-bit subtraction), w Toffolis, the last one applying the phase;
 *  3. uncompute step 1 and the comparison's carries → T·w + w − 1.
 *  Total 2w(T+1) − 1, with w = ⌈log₂(Σ|J|/resolution)⌉ + 1 (one sign bit). The coefficients are held to b bits
 *  relative to the largest |J| (resolution = max|J|·2^−b, b = `couplingBits`, default 8), so Σ|J|/resolution ≤
 *  T·2^b and w = ⌈log₂ T⌉ + b + 1.
 *
 * @param kind - "ksat" (needs clauses and k) or "ising" (needs terms).
 * @param shape - instance size; see {@link CostShape}.
 * @param options - the cost model; `oracleToffolisOverride` replaces the whole count.
 */
export function toffolisPerQuery(
  kind: "ksat" | "ising",
  shape: CostShape,
  options: CostModelOptions = COST_MODEL_DEFAULTS,
): ToffoliCount {
  checkPositiveInteger("n", shape.n);
  if (options.oracleToffolisOverride !== undefined) {
    checkNonNegative("oracleToffolisOverride", options.oracleToffolisOverride);
    return {
      toffolis: options.oracleToffolisOverride,
      derivation: `given: ${options.oracleToffolisOverride} Toffolis per query (oracle and diffusion, --oracle-toffolis)`,
    };
  }
  const n = shape.n;
  const diffusion = diffusionToffolis(n);
  if (kind === "ksat") {
    const m = requireCount("clauses", shape.clauses);
    const k = requirePositive("k", shape.k);
    const clauseBits = m * (k - 1);
    if (shape.comparison) {
      const c = Math.ceil(Math.log2(m + 1));
      const oracle = 2 * (clauseBits + m * c) + 2 * c - 1;
      return {
        toffolis: oracle + diffusion,
        derivation:
          `k-SAT comparison oracle: clauses m(k-1) = ${fmt(clauseBits)}, counter m*c = ${m}*${c} = ${fmt(m * c)} ` +
          `(c = ceil(log2(m+1)) = ${c}), compare c = ${c}; compute and uncompute 2(m(k-1) + m*c) + 2c - 1 = ${fmt(oracle)}; ` +
          `diffusion 2n - 3 = ${diffusion}; total ${fmt(oracle + diffusion)}`,
      };
    }
    const oracle = Math.max(0, 2 * clauseBits + 2 * m - 3);
    return {
      toffolis: oracle + diffusion,
      derivation:
        `k-SAT oracle: clauses m(k-1) = ${m}*${fmt(k - 1)} = ${fmt(clauseBits)}, AND of clause bits with phase m - 1 = ${m - 1}, ` +
        `uncompute mirror; 2m(k-1) + 2m - 3 = ${fmt(oracle)}; diffusion 2n - 3 = ${diffusion}; total ${fmt(oracle + diffusion)}`,
    };
  }
  const T = requireCount("terms", shape.terms);
  const b = options.couplingBits ?? (COST_MODEL_DEFAULTS.couplingBits as number);
  checkNonNegative("couplingBits", b);
  const w = energyRegisterBits(T, b);
  const oracle = 2 * w * (T + 1) - 1;
  return {
    toffolis: oracle + diffusion,
    derivation:
      `Ising energy oracle: register w = ceil(log2 T) + b + 1 = ${w} bits (T = ${T} terms, b = ${b} bits a coefficient, ` +
      `1 sign bit); T*w adder Toffolis + w compare, compute and uncompute: 2w(T+1) - 1 = ${fmt(oracle)}; ` +
      `diffusion 2n - 3 = ${diffusion}; total ${fmt(oracle + diffusion)}`,
  };
}

/**
 * Reversible Toffolis of one step of Schöning's walk (choose a violated clause at random, flip one of its k
 * variables at random), with the random choices supplied as input registers:
 *  1. evaluate the m clauses' violation bits, m(k−1) (as in the oracle);
 *  2. index the r-th violated clause: a running count of violated bits, m additions into a ⌈log₂(m+1)⌉-bit
 *     counter → m·c, c = ⌈log₂(m+1)⌉;
 *  3. load the chosen clause's k literals by table lookup over m entries, ≈ m Toffolis (unary iteration, Babbush
 *     et al., "Encoding electronic spectra…", PRX 8, 041015 (2018), arXiv:1805.03662);
 *  4. flip the chosen variable: controlled NOT on one of n variables by index, ≈ n Toffolis (unary iteration);
 *  5. uncompute steps 1–3 (mirror) → m(k−1) + m·c + m.
 *  Total 2(m(k−1) + m·c + m) + n.
 *
 * @param shape - needs n, clauses, k.
 * @param options - `walkStepToffolis` replaces the derivation.
 */
export function walkStepToffolis(shape: CostShape, options: CostModelOptions = COST_MODEL_DEFAULTS): ToffoliCount {
  if (options.walkStepToffolis !== undefined) {
    checkNonNegative("walkStepToffolis", options.walkStepToffolis);
    return { toffolis: options.walkStepToffolis, derivation: `given: ${options.walkStepToffolis} Toffolis per walk step (--walk-step-toffolis)` };
  }
  const n = checkPositiveInteger("n", shape.n);
  const m = requireCount("clauses", shape.clauses);
  const k = requirePositive("k", shape.k);
  const c = Math.ceil(Math.log2(m + 1));
  const half = m * (k - 1) + m * c + m;
  const total = 2 * half + n;
  return {
    toffolis: total,
    derivation:
      `Schoening step: clauses m(k-1) = ${fmt(m * (k - 1))}, violated-clause index m*c = ${fmt(m * c)} (c = ${c}), ` +
      `clause lookup m = ${m}, uncompute mirror, variable flip by index n = ${n}: 2(m(k-1) + m*c + m) + n = ${fmt(total)}`,
  };
}

/**
 * Reversible Toffolis of one Metropolis update at a spin i visited in sweep order (so i is classical):
 *  1. energy change ΔE_i = 2·(local field)·s_i: the d terms containing i are added into a w-bit register, d·w
 *     (d = T·p/n on average, w as in {@link toffolisPerQuery});
 *  2. acceptance: compare ΔE with the threshold −ln(u)/β for a b-bit uniform u held in a register, read from a
 *     table of 2^b entries by lookup (≈ 2^b Toffolis, arXiv:1805.03662) and compared, w Toffolis;
 *  3. flip s_i controlled on the acceptance bit (CNOT, free);
 *  4. uncompute steps 1 and 2 (mirror).
 *  Total 2(d·w + w + 2^b).
 *
 * @param shape - needs n, terms, order (default 2).
 * @param options - `annealStepToffolis` replaces the derivation; `couplingBits` sets b.
 */
export function annealStepToffolis(shape: CostShape, options: CostModelOptions = COST_MODEL_DEFAULTS): ToffoliCount {
  if (options.annealStepToffolis !== undefined) {
    checkNonNegative("annealStepToffolis", options.annealStepToffolis);
    return { toffolis: options.annealStepToffolis, derivation: `given: ${options.annealStepToffolis} Toffolis per Metropolis update (--anneal-step-toffolis)` };
  }
  const n = checkPositiveInteger("n", shape.n);
  const T = requireCount("terms", shape.terms);
  const p = shape.order ?? 2;
  const b = options.couplingBits ?? (COST_MODEL_DEFAULTS.couplingBits as number);
  const w = energyRegisterBits(T, b);
  const d = Math.ceil((T * p) / n);
  const total = 2 * (d * w + w + 2 ** b);
  return {
    toffolis: total,
    derivation:
      `Metropolis update: local field d*w = ${d}*${w} (d = ceil(T*p/n) terms at a spin), threshold lookup 2^b = ${2 ** b}, ` +
      `compare w = ${w}, uncompute mirror: 2(d*w + w + 2^b) = ${fmt(total)}`,
  };
}

/**
 * Predicted quantum wall time in seconds: queries × Toffolis per query × Toffoli time / factories.
 * @param queries - oracle queries (or reversible trial steps).
 * @param toffolisPerQuery - Toffolis of one query (or of one step).
 */
export function quantumSeconds(queries: number, toffolisPerQuery: number, options: CostModelOptions = COST_MODEL_DEFAULTS): number {
  checkOptions(options);
  return (queries * toffolisPerQuery * options.toffoliSeconds) / options.factories;
}

/**
 * Classical time in seconds on S-fold parallel hardware: measured wall time (or work × measured time per step)
 * divided by S = `classicalParallelism` (perfect parallel speed-up assumed, as in Babbush et al.).
 */
export function classicalSeconds(wallSeconds: number, options: CostModelOptions = COST_MODEL_DEFAULTS): number {
  checkOptions(options);
  return wallSeconds / options.classicalParallelism;
}

/**
 * Break-even run time T* of a polynomial speedup of degree d (Babbush et al. 2021): a classical algorithm making
 * N^d calls of a primitive taking t_C on S processors against a quantum one making N calls of a primitive taking
 * t_Q = primitiveToffolis × Toffoli time / factories. Equal times N·t_Q = N^d·t_C/S give
 * T* = t_Q·(S·t_Q/t_C)^{1/(d−1)}; for a quadratic speedup (d = 2) T* = S·t_Q²/t_C. Beyond T* the quantum
 * algorithm is faster.
 *
 * @param primitiveToffolis - Toffolis of one quantum primitive (one query).
 * @param classicalStepSeconds - t_C, seconds of one classical primitive.
 * @param degree - d > 1, default 2 (Grover-type).
 */
export function breakEvenSeconds(
  primitiveToffolis: number,
  classicalStepSeconds: number,
  options: CostModelOptions = COST_MODEL_DEFAULTS,
  degree = 2,
): number {
  checkOptions(options);
  if (!(classicalStepSeconds > 0)) throw new RangeError(`classical step time must be > 0, got ${classicalStepSeconds}`);
  if (!(degree > 1)) throw new RangeError(`degree must be > 1, got ${degree}`);
  const tQ = (primitiveToffolis * options.toffoliSeconds) / options.factories;
  return tQ * ((options.classicalParallelism * tQ) / classicalStepSeconds) ** (1 / (degree - 1));
}

/** The worked example of the `speedbound cost` table. */
export interface CostExample {
  /** Variables n. Default 100. */
  n: number;
  /** Clause width k. Default 3. */
  k: number;
  /** Clause density α = m/n; m = round(α·n). Default 4.267 (near the random 3-SAT threshold). */
  density: number;
  /** Number of solutions assumed for the Grover count. Default 1. */
  optima: number;
  /** Seconds of one classical primitive for the break-even row. Default 33e-9 (the cited paper's example). */
  classicalStepSeconds: number;
}

/** Default worked example: random 3-SAT, n = 100, density 4.267, one solution, 33 ns classical step. */
export const COST_EXAMPLE_DEFAULTS: CostExample = Object.freeze({
  n: 100,
  k: 3,
  density: 4.267,
  optima: 1,
  classicalStepSeconds: 33e-9,
});

/**
 * Rows of the `speedbound cost` table: the model's assumptions (with their source) and a worked example — Toffolis
 * per query of random k-SAT, the time of one query, Grover's expected queries and time for the example size,
 * and the break-even time of a quadratic speedup with that query as the primitive.
 */
export function describeCostModel(
  options: CostModelOptions = COST_MODEL_DEFAULTS,
  example: CostExample = COST_EXAMPLE_DEFAULTS,
): Array<{ quantity: string; value: string; source: string }> {
  checkOptions(options);
  const paper = "Babbush et al., PRX Quantum 2, 010103 (2021), arXiv:2011.04149";
  const isDefault = (key: keyof CostModelOptions): boolean => options[key] === COST_MODEL_DEFAULTS[key];
  const m = Math.round(example.density * example.n);
  const perQuery = toffolisPerQuery("ksat", { n: example.n, clauses: m, k: example.k }, options);
  const queryS = quantumSeconds(1, perQuery.toffolis, options);
  const grover = groverKnown(example.n, example.optima);
  const groverS = grover.queries === null ? null : quantumSeconds(grover.queries, perQuery.toffolis, options);
  const walk = walkStepToffolis({ n: example.n, clauses: m, k: example.k }, options);
  const tStar = breakEvenSeconds(perQuery.toffolis, example.classicalStepSeconds, options);
  const rows = [
    {
      quantity: "Toffoli time (one factory)",
      value: `${fmt(options.toffoliSeconds * 1e6)} us`,
      source: isDefault("toffoliSeconds")
        ? `${paper}: one Toffoli every ~170 us with one factory (code cycle 1 us, distance ~30)`
        : "--toffoli-us",
    },
    { quantity: "factories", value: String(options.factories), source: isDefault("factories") ? "default (as in the cited paper)" : "--factories" },
    {
      quantity: "classical parallelism S",
      value: String(options.classicalParallelism),
      source: isDefault("classicalParallelism") ? "default" : "--classical-parallelism",
    },
    { quantity: "quantum time", value: "queries x Toffolis per query x Toffoli time / factories", source: paper },
    { quantity: "classical time", value: "measured wall time (or work x time per step) / S", source: paper },
    { quantity: "break-even time (quadratic)", value: "T* = S t_Q^2 / t_C", source: paper },
    { quantity: "k-SAT Toffolis per query", value: "2mk - 3 + (2n - 3)", source: "clause ladders, AND with phase, mirror uncompute; diffusion (see cost-model.ts)" },
    { quantity: "Ising Toffolis per query", value: "2w(T+1) - 1 + (2n - 3), w = ceil(log2 T) + b + 1", source: `controlled constant additions (Gidney arXiv:1709.06648), b = ${options.couplingBits ?? COST_MODEL_DEFAULTS.couplingBits}` },
    { quantity: "Schoening step Toffolis", value: "2(m(k-1) + m*ceil(log2(m+1)) + m) + n", source: options.walkStepToffolis === undefined ? "derived (cost-model.ts)" : "--walk-step-toffolis" },
    { quantity: "Metropolis update Toffolis", value: "2(d*w + w + 2^b)", source: options.annealStepToffolis === undefined ? "derived (cost-model.ts)" : "--anneal-step-toffolis" },
    {
      quantity: `example: random ${example.k}-SAT n = ${example.n}, density ${example.density}`,
      value: `m = ${m} clauses`,
      source: "m = round(density x n)",
    },
    { quantity: "example: Toffolis per query", value: fmt(perQuery.toffolis), source: perQuery.derivation },
    { quantity: "example: time per query", value: `${fmt(queryS)} s`, source: "Toffolis per query x Toffoli time / factories" },
    {
      quantity: `example: Grover expected queries (M = ${example.optima})`,
      value: grover.queries === null ? "n/a" : fmt(grover.queries),
      source: "(k* + 1)/sin^2((2k*+1)theta), BBHT arXiv:quant-ph/9605034",
    },
    {
      quantity: "example: Grover expected time",
      value: groverS === null ? "n/a" : `${fmt(groverS)} s (${fmt(groverS / 31_557_600)} years)`,
      source: "queries x time per query",
    },
    { quantity: "example: Schoening step Toffolis", value: fmt(walk.toffolis), source: walk.derivation },
    {
      quantity: `example: break-even vs a ${fmt(example.classicalStepSeconds * 1e9)} ns classical step`,
      value: `${fmt(tStar)} s (${fmt(tStar / 3600)} h)`,
      source: "T* = S t_Q^2 / t_C with t_Q = time per query",
    },
  ];
  return rows;
}

/** Energy register width w = ⌈log₂ T⌉ + b + 1 for T terms held to b bits each (plus a sign bit). */
export function energyRegisterBits(terms: number, couplingBits: number): number {
  return Math.ceil(Math.log2(Math.max(terms, 1))) + couplingBits + 1;
}

function fmt(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (Math.abs(x) >= 1e6) return x.toExponential(3);
  if (Number.isInteger(x)) return String(x);
  return Number(x.toPrecision(4)).toString();
}

function checkOptions(o: CostModelOptions): void {
  if (!(o.toffoliSeconds > 0)) throw new RangeError(`toffoliSeconds must be > 0, got ${o.toffoliSeconds}`);
  if (!(o.factories > 0)) throw new RangeError(`factories must be > 0, got ${o.factories}`);
  if (!(o.classicalParallelism > 0)) throw new RangeError(`classicalParallelism must be > 0, got ${o.classicalParallelism}`);
}

function checkPositiveInteger(name: string, v: number): number {
  if (!Number.isInteger(v) || v < 1) throw new RangeError(`${name} must be a positive integer, got ${v}`);
  return v;
}

function checkNonNegative(name: string, v: number): void {
  if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be a finite number ≥ 0, got ${v}`);
}

function requireCount(name: string, v: number | undefined): number {
  if (v === undefined || !Number.isInteger(v) || v < 1) throw new RangeError(`${name} must be a positive integer, got ${v}`);
  return v;
}

function requirePositive(name: string, v: number | undefined): number {
  if (v === undefined || !(v >= 1) || !Number.isFinite(v)) throw new RangeError(`${name} must be a number ≥ 1, got ${v}`);
  return v;
}
