/**
 * The transverse-field product w = σ·(H v) − γ·v' for large working spaces, in two passes, on the native kernels of
 * native/transverse-product.c when they were built (in place; only v is copied, into padded rows) and otherwise on
 * the WebAssembly kernels of wasm/kernel-source.ts, over cache-sized scratch copies as described here:
 *
 *   pass A, per block of 2^L contiguous amplitudes: the diagonal, the recurrence term and every flip of the bits
 *           [0, L), on copies of v, v' and the block's diagonal data; w written back;
 *   pass B, per group q of 2^H runs of 2^r contiguous amplitudes that differ only in the bits [L, bits)
 *           (H = bits − L, the run's bits [r, L) fixed to q): the flips of the high bits, added to copies of v and w;
 *           in the flip-symmetric sector the group is paired with the group of the complemented bits ~q, whose
 *           amplitudes are the mirror partners in reverse order (the kernel reads them reversed); then wᵀv.
 *
 * Memory traffic: pass A reads v, v' and the diagonal and writes w; pass B reads v and w and writes w: 49 bytes per
 * amplitude with one-byte levels, about twice the 25-byte floor (the WebAssembly kernels' copies in and out come on
 * top, in the cache). A single fused pass instead reads v once more for
 * every bit whose partner lies beyond the cache (six or seven bits at n = 28 on a 32 MiB cache). Blocks and groups
 * are independent, so threads split them (product-team.ts): all of pass A, then all of pass B.
 *
 * Sizes: L = 18 (a block's v, v', w: 6 MiB, in the last-level cache), pass B scratch 2^19 amplitudes of v and of w
 * (8 MiB); runs are then 2^(19 − H − mirror) amplitudes: 2 KiB at 28 bits in the sector. Plans exist from 19 bits.
 */
import { defaultProductKernels, nativeProduct, type NativeProduct, type ProductKernels } from "./native/kernels.js";
import type { LevelDiagonal, TransverseFieldOperator } from "./transverse-field.js";
import { instantiateKernels, type TransverseKernels } from "./wasm/kernels.js";

/** Bits of a pass-A block. */
export const LOW_BITS = 18;
/** Bits of a pass-A sub-block whose v, v', w stay in the inner cache (3 × 256 KiB); bits from here up to the
 * block's are added by the slab-ordered high kernel on the block's scratch. */
export const SUB_BITS = 15;
/** Bits of pass B's scratch (both halves in the symmetric sector). */
export const SCRATCH_BITS = 19;

/** How one working space is cut (see the module comment). */
export interface BlockedPlan {
  readonly bits: number;
  readonly mirror: boolean;
  /** L: bits inside a pass-A block. */
  readonly lowBits: number;
  /** H = bits − L: bits applied by pass B. */
  readonly highBits: number;
  /** r: bits of one contiguous run of pass B. */
  readonly runBits: number;
  /** Pass-A blocks: 2^H. */
  readonly blocks: number;
  /** Pass-B groups: 2^(L − r), half of them in the symmetric sector (each paired with its complement). */
  readonly groups: number;
}

/**
 * The plan for a working space of 2^bits amplitudes, or null when it is too small for two passes (the caller then
 * uses the single fused pass). `lowLimit` and `scratchLimit` default to the cache-sized {@link LOW_BITS} and
 * {@link SCRATCH_BITS}; tests pass small ones to exercise every part of the plan on small spaces.
 */
export function blockedPlan(bits: number, mirror: boolean, lowLimit = LOW_BITS, scratchLimit = SCRATCH_BITS): BlockedPlan | null {
  const lowBits = Math.min(lowLimit, bits - 1);
  const highBits = bits - lowBits;
  const runBits = Math.min(lowBits - 1, scratchLimit - highBits - (mirror ? 1 : 0));
  // Groups of eight amplitudes (the kernels' unit) need runs and blocks of at least 2^3.
  if (highBits < 1 || runBits < 3) return null;
  return {
    bits,
    mirror,
    lowBits,
    highBits,
    runBits,
    blocks: 2 ** highBits,
    groups: 2 ** (lowBits - runBits - (mirror ? 1 : 0)),
  };
}

/**
 * Smallest working space given to the blocked product: below 2^10 amplitudes the scalar fused pass of
 * transverse-field.ts is used. (Measured single-thread, levels diagonal, the machine shared: the blocked product was
 * 1.9–5× faster from 2^12 to 2^26 amplitudes.)
 */
export const BLOCKED_MIN_BITS = 10;

/** The plan {@link applyOperator} and the product team use for `op`, or null for the fused pass. */
export function productPlan(op: TransverseFieldOperator): BlockedPlan | null {
  return op.bits >= BLOCKED_MIN_BITS ? blockedPlan(op.bits, op.mirror) : null;
}

/**
 * Columns of a group that pass B of the native kernels takes across all 2^H rows of its scratch before moving on:
 * 2^16 amplitudes a tile (512 KiB, in the inner cache while every high flip reads it), at least 64 a row.
 * (One thread, tiles of 64 to 2048 columns at n = 24, 26, 28 measured within the machine's noise of each other.)
 */
export function nativeTile(plan: BlockedPlan): number {
  return Math.max(64, 2 ** (16 - plan.highBits));
}

/**
 * One thread's kernels: the in-place native passes (native/transverse-product.c) when they are built, else the
 * WebAssembly kernels with their scratch layout (reused while the plan's shape and table size fit).
 */
export class BlockedKernel {
  private readonly native: NativeProduct | null;
  private kernels: TransverseKernels | null = null;
  private capacity = 0;
  private f64 = new Float64Array(0);
  private u8 = new Uint8Array(0);
  private u16 = new Uint16Array(0);
  /** Byte offsets: level table, then the scratch (pass A: v, v', w, diagonal; pass B: v halves, w halves). */
  private tableAt = 0;
  private scratchAt = 0;

  /** @param use - the kernels to run (default: {@link defaultProductKernels}). */
  constructor(readonly use: ProductKernels = defaultProductKernels()) {
    this.native = use === "native" ? nativeProduct() : null;
    if (use === "native" && this.native === null) throw new Error("the native product kernels were not built");
  }

  /** Sizes the memory for `plan` with a table of `tableLength` doubles. */
  private prepare(plan: BlockedPlan, tableLength: number): TransverseKernels {
    const block = 2 ** plan.lowBits;
    const pair = 2 ** (plan.runBits + plan.highBits + (plan.mirror ? 1 : 0));
    const tableBytes = Math.ceil((8 * tableLength) / 64) * 64;
    const need = tableBytes + Math.max(4 * 8 * block, 2 * 8 * pair);
    if (this.kernels === null || need > this.capacity) {
      this.kernels = instantiateKernels(need);
      this.capacity = this.kernels.memory.buffer.byteLength;
      const buffer = this.kernels.memory.buffer;
      this.f64 = new Float64Array(buffer);
      this.u8 = new Uint8Array(buffer);
      this.u16 = new Uint16Array(buffer);
    }
    this.tableAt = 0;
    this.scratchAt = tableBytes;
    return this.kernels;
  }

  /**
   * Pass A over blocks [from, to): w = σ·d·v + sx·Σ_{bits < L} flips − γ·v' on those blocks (v' may be v when γ = 0).
   */
  passA(
    op: TransverseFieldOperator,
    plan: BlockedPlan,
    v: Float64Array,
    sigma: number,
    vprev: Float64Array,
    gamma: number,
    w: Float64Array,
    from: number,
    to: number,
  ): void {
    const d = op.diagonal;
    if (this.native !== null) {
      const sx = -sigma * op.field;
      if (d.kind === "levels") {
        const kind = d.levels instanceof Uint16Array ? 1 : 0;
        this.native.passA(v, vprev, kind, d.levels, d.table, w, sigma, gamma, sx, 0, 0, 0, plan.lowBits, from, to);
      } else {
        this.native.passA(v, vprev, 2, d.costs, null, w, sigma, gamma, sx, d.scale, d.shift, d.cap, plan.lowBits, from, to);
      }
      return;
    }
    const k = this.prepare(plan, d.kind === "levels" ? d.table.length : 0);
    const block = 2 ** plan.lowBits;
    const nb = 8 * block;
    const vAt = this.scratchAt;
    const vpAt = vAt + nb;
    const wAt = vpAt + nb;
    const diagAt = wAt + nb;
    const sx = -sigma * op.field;
    const f64 = this.f64;
    if (d.kind === "levels") f64.set(d.table, this.tableAt / 8);
    const wide = d.kind === "levels" && d.levels instanceof Uint16Array;
    const subBits = Math.min(plan.lowBits, SUB_BITS);
    const sb = 8 * 2 ** subBits;
    const diagBytes = d.kind === "affine" ? 8 : wide ? 2 : 1;
    for (let b = from; b < to; b++) {
      const start = b * block;
      const end = start + block;
      f64.set(v.subarray(start, end), vAt / 8);
      if (vprev !== v) f64.set(vprev.subarray(start, end), vpAt / 8);
      const vp = vprev !== v ? vpAt : vAt;
      if (d.kind === "levels") {
        if (wide) this.u16.set((d.levels as Uint16Array).subarray(start, end), diagAt / 2);
        else this.u8.set((d as LevelDiagonal).levels.subarray(start, end) as Uint8Array, diagAt);
      } else {
        f64.set(d.costs.subarray(start, end), diagAt / 8);
      }
      for (let o = 0; o < nb; o += sb) {
        const q = diagAt + (o / 8) * diagBytes;
        if (d.kind === "affine") k.lowAffine(vAt + o, vp + o, q, this.tableAt, wAt + o, sb, sigma, gamma, sx, d.scale, d.shift, d.cap);
        else if (wide) k.lowLevels16(vAt + o, vp + o, q, this.tableAt, wAt + o, sb, sigma, gamma, sx);
        else k.lowLevels8(vAt + o, vp + o, q, this.tableAt, wAt + o, sb, sigma, gamma, sx);
      }
      if (sb < nb) k.high(vAt, wAt, nb, sb, 0, sx);
      w.set(f64.subarray(wAt / 8, wAt / 8 + block), start);
    }
  }

  /** Pass B over groups [from, to): the high flips (and the mirror) added to w; returns their part of wᵀv. */
  passB(op: TransverseFieldOperator, plan: BlockedPlan, v: Float64Array, sigma: number, w: Float64Array, from: number, to: number): number {
    if (this.native !== null) {
      const { bits, lowBits, runBits, highBits, mirror } = plan;
      return this.native.passB(v, w, -sigma * op.field, bits, lowBits, runBits, highBits, mirror ? 1 : 0, nativeTile(plan), from, to);
    }
    const k = this.prepare(plan, op.diagonal.kind === "levels" ? op.diagonal.table.length : 0);
    const run = 2 ** plan.runBits;
    const runs = 2 ** plan.highBits;
    const stride = 2 ** plan.lowBits;
    const half = run * runs;
    const halves = plan.mirror ? 2 : 1;
    const complement = 2 ** (plan.lowBits - plan.runBits) - 1;
    const vAt = this.scratchAt / 8;
    const wAt = vAt + halves * half;
    const f64 = this.f64;
    const sx = -sigma * op.field;
    let alpha = 0;
    for (let q = from; q < to; q++) {
      for (let h = 0; h < halves; h++) {
        const first = (h === 0 ? q : q ^ complement) * run;
        for (let y = 0; y < runs; y++) {
          const start = first + y * stride;
          const at = h * half + y * run;
          f64.set(v.subarray(start, start + run), vAt + at);
          f64.set(w.subarray(start, start + run), wAt + at);
        }
      }
      alpha += k.high(8 * vAt, 8 * wAt, 8 * half, 8 * run, plan.mirror ? 1 : 0, sx);
      for (let h = 0; h < halves; h++) {
        const first = (h === 0 ? q : q ^ complement) * run;
        for (let y = 0; y < runs; y++) {
          const at = wAt + h * half + y * run;
          w.set(f64.subarray(at, at + run), first + y * stride);
        }
      }
    }
    return alpha;
  }
}

/** This thread's kernel (each worker thread has its own module instance, hence its own). */
let threadKernel: BlockedKernel | null = null;

/** The calling thread's {@link BlockedKernel}. */
export function blockedKernel(): BlockedKernel {
  if (threadKernel === null) threadKernel = new BlockedKernel();
  return threadKernel;
}

/** The whole product (pass A over every block, then pass B) on `kernel` (the calling thread's by default); returns wᵀv. */
export function applyBlocked(
  op: TransverseFieldOperator,
  plan: BlockedPlan,
  v: Float64Array,
  sigma: number,
  vprev: Float64Array,
  gamma: number,
  w: Float64Array,
  kernel: BlockedKernel = blockedKernel(),
): number {
  kernel.passA(op, plan, v, sigma, vprev, gamma, w, 0, plan.blocks);
  return kernel.passB(op, plan, v, sigma, w, 0, plan.groups);
}
