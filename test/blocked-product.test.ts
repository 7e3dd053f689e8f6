/**
 * The blocked transverse-field product (harness/predict/numerics/blocked-product.ts, WebAssembly kernels of
 * wasm/kernel-source.ts) against the definition: w = σ·(d ∘ v − field·Σ_i X_i v) − γ·v', with X_i the flip of bit i
 * and, in the flip-symmetric sector, the mirror z → dim − 1 − z as the top qubit's flip. Every diagonal kind
 * (one-byte and two-byte levels with a table, affine with a cap), with and without the mirror, over plans that cut
 * the space in many different ways (block, run and group sizes), and the two-thread product team.
 */
import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { applyBlocked, BlockedKernel, blockedPlan } from "../harness/predict/numerics/blocked-product.js";
import { defaultProductKernels, nativeProduct, type ProductKernels } from "../harness/predict/numerics/native/kernels.js";
import { ProductTeam, sharedFloat64, sharedUint16, sharedUint8 } from "../harness/predict/numerics/product-team.js";
import { sweepRange } from "../harness/predict/numerics/vector-ops.js";
import { diagonalAt, type Diagonal, type TransverseFieldOperator } from "../harness/predict/numerics/transverse-field.js";
import { Rng } from "../harness/random.js";

type Kind = "levels8" | "levels16" | "affine";

/** An operator with random diagonal data of the given kind, in shared memory (usable by a team too). */
function randomOperator(bits: number, mirror: boolean, kind: Kind, seed: string): TransverseFieldOperator {
  const rng = new Rng(seed);
  const dim = 2 ** bits;
  let diagonal: Diagonal;
  if (kind === "affine") {
    const costs = sharedFloat64(dim);
    for (let z = 0; z < dim; z++) costs[z] = Math.floor(12 * rng.nextDouble());
    diagonal = { kind: "affine", costs, scale: 0.3, shift: -0.7, cap: 2.1 };
  } else {
    const count = kind === "levels8" ? 40 : 700;
    const levels = kind === "levels8" ? sharedUint8(dim) : sharedUint16(dim);
    for (let z = 0; z < dim; z++) levels[z] = Math.floor(count * rng.nextDouble());
    const table = sharedFloat64(count);
    for (let l = 0; l < count; l++) table[l] = rng.nextDouble() - 0.5;
    diagonal = { kind: "levels", levels, table };
  }
  return { dim, bits, mirror, field: 0.37, diagonal };
}

/** The definition, one flip at a time. */
function definition(op: TransverseFieldOperator, v: Float64Array, sigma: number, prev: Float64Array, gamma: number): Float64Array {
  const w = new Float64Array(op.dim);
  for (let z = 0; z < op.dim; z++) {
    let s = 0;
    for (let i = 0; i < op.bits; i++) s += v[z ^ (2 ** i)];
    if (op.mirror) s += v[op.dim - 1 - z];
    w[z] = sigma * (diagonalAt(op.diagonal, z) * v[z] - op.field * s) - gamma * prev[z];
  }
  return w;
}

function randomVector(dim: number, rng: Rng): Float64Array {
  const v = sharedFloat64(dim);
  for (let z = 0; z < dim; z++) v[z] = rng.nextDouble() - 0.5;
  return v;
}

/** Largest difference from the definition and the error of the returned wᵀv. */
function compare(op: TransverseFieldOperator, v: Float64Array, prev: Float64Array, w: Float64Array, alpha: number): [number, number] {
  const ref = definition(op, v, 1.3, prev, 0.4);
  let err = 0;
  let dot = 0;
  for (let z = 0; z < op.dim; z++) {
    err = Math.max(err, Math.abs(w[z] - ref[z]));
    dot += ref[z] * v[z];
  }
  return [err, Math.abs(alpha - dot) / Math.max(1, Math.abs(dot))];
}

const built = nativeProduct() !== null;

describe("blocked transverse-field product against the definition", () => {
  // [bits, mirror, block bits limit, scratch bits limit]: runs of 2^3 (the kernels' group) up to long runs.
  const shapes: [number, boolean, number, number][] = [
    [9, false, 5, 7],
    [9, true, 5, 8],
    [10, true, 5, 9],
    [10, false, 4, 9], // blocks of 16 amplitudes: the native pass A's loop for blocks below four groups
    [11, false, 6, 9],
    [12, true, 7, 10],
    [12, true, 6, 10],
    [13, false, 9, 12],
    [14, true, 12, 14],
    [17, false, 16, 19],
    [17, true, 18, 19], // the default-sized block (capped at bits − 1)
  ];
  for (const use of ["wasm", "native"] as ProductKernels[]) {
    for (const kind of ["levels8", "levels16", "affine"] as const) {
      for (const [bits, mirror, low, scratch] of shapes) {
        const plan = blockedPlan(bits, mirror, low, scratch);
        it.skipIf(use === "native" && !built)(`${use} kernels, ${kind}, ${bits} bits${mirror ? " (sector)" : ""}, plan ${JSON.stringify(plan)}`, () => {
          expect(plan).not.toBeNull();
          const kernel = new BlockedKernel(use);
          const op = randomOperator(bits, mirror, kind, `${kind}-${bits}-${low}`);
          const rng = new Rng(`vectors-${bits}`);
          const v = randomVector(op.dim, rng);
          const prev = randomVector(op.dim, rng);
          const w = sharedFloat64(op.dim);
          const [err, alphaErr] = compare(op, v, prev, w, applyBlocked(op, plan!, v, 1.3, prev, 0.4, w, kernel));
          expect(err).toBeLessThan(1e-12);
          expect(alphaErr).toBeLessThan(1e-12);
          // γ = 0 with v' = v (the residual check's call): no copy of v' is made, the result is H v.
          applyBlocked(op, plan!, v, 1.3, v, 0, w, kernel);
          const ref0 = definition(op, v, 1.3, v, 0);
          let e0 = 0;
          for (let z = 0; z < op.dim; z++) e0 = Math.max(e0, Math.abs(w[z] - ref0[z]));
          expect(e0).toBeLessThan(1e-12);
        });
      }
    }
  }

  it("the native kernels are built wherever a C compiler is (the install's build step compiles them)", () => {
    // The build script's list: $CC when set, else cc, gcc, clang.
    const candidates = process.env.CC ? [process.env.CC] : ["cc", "gcc", "clang"];
    const compiler = candidates.some((c) => spawnSync(c, ["--version"], { stdio: "ignore" }).status === 0);
    expect(built).toBe(compiler);
  });

  it.skipIf(!built)("the native addon refuses arrays of the wrong type, unknown kinds and ranges beyond the vectors", () => {
    const addon = nativeProduct()!;
    const v = new Float64Array(1024);
    const w = new Float64Array(1024);
    const levels = new Uint8Array(1024);
    const table = new Float64Array(4);
    const passA = (data: Uint8Array | Uint16Array | Float64Array, kind: number, to: number, vec: Float64Array | Uint8Array = v) =>
      addon.passA(vec as Float64Array, v, kind, data, table, w, 1, 0, -0.1, 0, 0, 0, 9, 0, to);
    expect(() => passA(levels, 0, 2)).not.toThrow(); // two blocks of 2^9 fill the 1024 amplitudes
    expect(() => passA(levels, 0, 3)).toThrow("passA sizes do not fit the plan"); // a third block lies beyond
    expect(() => passA(levels, 1, 2)).toThrow("passA expects Float64Arrays"); // one-byte levels declared as two-byte
    expect(() => passA(levels, 0, 2, new Uint8Array(8192))).toThrow("passA expects Float64Arrays");
    expect(() => passA(levels, 3, 2)).toThrow("kind must be 0, 1 or 2");
    expect(() => addon.passB(v, w, -0.1, 10, 7, 3, 3, 0, 64, 0, 17)).toThrow("passB sizes do not fit the plan"); // 2^(7−3) groups
    expect(() => addon.passB(v, w, -0.1, 11, 7, 3, 4, 0, 64, 0, 16)).toThrow("passB sizes do not fit the plan"); // 2^11 > 1024
  });

  it("SPEEDBOUND_PRODUCT picks the kernels and refuses other values", () => {
    const saved = process.env.SPEEDBOUND_PRODUCT;
    try {
      process.env.SPEEDBOUND_PRODUCT = "wasm";
      expect(defaultProductKernels()).toBe("wasm");
      process.env.SPEEDBOUND_PRODUCT = "native";
      if (built) expect(defaultProductKernels()).toBe("native");
      else expect(() => defaultProductKernels()).toThrow(/was not built/);
      process.env.SPEEDBOUND_PRODUCT = "gpu";
      expect(() => defaultProductKernels()).toThrow("SPEEDBOUND_PRODUCT must be 'native' or 'wasm', not 'gpu'");
    } finally {
      if (saved === undefined) delete process.env.SPEEDBOUND_PRODUCT;
      else process.env.SPEEDBOUND_PRODUCT = saved;
    }
  });

  it("applyBlocked runs on the thread's default kernels (native when built)", () => {
    const plan = blockedPlan(12, false, 7, 10)!;
    const op = randomOperator(12, false, "levels8", "default-kernels");
    const rng = new Rng("default-kernels");
    const v = randomVector(op.dim, rng);
    const prev = randomVector(op.dim, rng);
    const w = sharedFloat64(op.dim);
    const [err] = compare(op, v, prev, w, applyBlocked(op, plan, v, 1.3, prev, 0.4, w));
    expect(err).toBeLessThan(1e-12);
    expect(new BlockedKernel().use).toBe(built ? "native" : "wasm");
  });

  it("no plan when runs would be shorter than the kernels' group of eight", () => {
    expect(blockedPlan(12, true, 6, 8)).toBeNull(); // r = min(5, 8 − 6 − 1) = 1
    expect(blockedPlan(3, false)).toBeNull();
  });

  it("a two-thread team equals the definition on the sector and the full space (2^17 amplitudes)", () => {
    const team = new ProductTeam(2);
    try {
      for (const [mirror, kind] of [[true, "levels8"], [false, "affine"]] as const) {
        const op = randomOperator(17, mirror, kind, `team-${kind}`);
        const rng = new Rng("team-vectors");
        const v = randomVector(op.dim, rng);
        const prev = randomVector(op.dim, rng);
        const w = sharedFloat64(op.dim);
        const [err, alphaErr] = compare(op, v, prev, w, team.apply(op, v, 1.3, prev, 0.4, w));
        expect(err).toBeLessThan(1e-12);
        expect(alphaErr).toBeLessThan(1e-12);
      }
    } finally {
      team.close();
    }
  });

  it("the team's Ritz sweep (two threads) equals Σ_j c_j·x_j summed vector by vector, bit for bit", () => {
    // Outside reference: the linear combination written out directly (one vector at a time, in increasing j), which
    // is also what the regenerated tail of a Lanczos pass adds: so results do not depend on how many were stored.
    const dim = 2 ** 17 + 24; // a tail shorter than a tile, and shares not a multiple of the tile
    const rng = new Rng("sweep-vectors");
    const xs = Array.from({ length: 11 }, () => randomVector(dim, rng)); // two groups of four and a remainder of three
    const c0 = Float64Array.from({ length: 11 }, () => rng.nextDouble() - 0.5);
    const c1 = Float64Array.from({ length: 11 }, () => rng.nextDouble() - 0.5);
    const team = new ProductTeam(2);
    try {
      for (const count of [11, 4, 1]) {
        const y0 = sharedFloat64(dim).fill(7); // overwritten, not added to
        const y1 = sharedFloat64(dim).fill(7);
        team.sweep(xs, count, c0, y0, c1, y1);
        const one0 = new Float64Array(dim);
        const one1 = new Float64Array(dim);
        sweepRange(xs, count, c0, one0, c1, one1, 0, dim);
        const only0 = sharedFloat64(dim);
        team.sweep(xs, count, c0, only0, null, null);
        let differ = 0;
        for (let z = 0; z < dim; z++) {
          let r0 = 0;
          let r1 = 0;
          for (let j = 0; j < count; j++) {
            r0 += c0[j] * xs[j][z];
            r1 += c1[j] * xs[j][z];
          }
          if (y0[z] !== r0 || y1[z] !== r1 || only0[z] !== r0 || one0[z] !== r0 || one1[z] !== r1) differ++;
        }
        expect(differ).toBe(0);
      }
    } finally {
      team.close();
    }
  });
});
