/**
 * Shared-memory threads for one large transverse-field product: the output range is split between the calling
 * thread and helper worker threads, which read the same vectors in SharedArrayBuffers. A single large cell otherwise
 * leaves the other cores idle. Synchronous by design (Atomics.wait/notify, messages received with
 * receiveMessageOnPort), so the Lanczos code above it stays a plain loop.
 *
 * Every array the product reads or writes (vectors, cost levels or values, level table) must live in a
 * SharedArrayBuffer: allocate with {@link sharedFloat64} and friends. Arrays are registered with the helpers on first
 * use; their contents are read at each product, so a level table rewritten between solves is seen.
 */
import { MessageChannel, Worker } from "node:worker_threads";
import { applyOperator, applyOperatorRange, type TransverseFieldOperator } from "./transverse-field.js";
import { compiledFile } from "../../compiled-file.js";
import { blockedKernel, productPlan } from "./blocked-product.js";
import { combineRange, sweepRange, updateRange } from "./vector-ops.js";

/** How long a new helper thread may take to load before the team gives up. */
const START_TIMEOUT_MS = 30_000;
/** Value of a helper's done slot once it has loaded (sequences start at 1, so 0 never means anything else). */
export const READY = -2;
/** Value of a helper's done slot after it failed. */
export const FAILED = -1;

/**
 * URL of a compiled module beside this one: itself when running compiled, its dist/ copy when this file runs from
 * source (the test runner), since a worker thread loads JavaScript only.
 */
function compiledSibling(name: string): URL {
  return compiledFile(import.meta.url, `./${name}`);
}

/** Smallest working dimension worth splitting (below it the hand-off costs more than it saves). */
export const TEAM_MIN_DIM = 2 ** 16;

/** Control block layout (Int32): [0] sequence, [1] stop, [2–7] the command, done sequence per helper from index 8. */
const SEQ = 0;
const STOP = 1;
const DONE = 8;
/** Int32 slots of the command: ids and shape. */
const ID_V = 2;
const ID_PREV = 3;
const ID_W = 4;
const ID_DIAG = 5;
const ID_TABLE = 6;
/** Bit 0: mirror; bits 1–3: what to do (PHASE_*). */
const FLAGS = 7;
/** The single fused pass over a share of the output range (small spaces). */
export const PHASE_FUSED = 0;
/** Pass A (blocked-product.ts) over a share of the blocks. */
export const PHASE_BLOCKS = 1;
/** Pass B over a share of the groups, returning its part of wᵀv. */
export const PHASE_GROUPS = 2;
/** The recurrence's update w −= a·u with ‖w‖² (and the locked vector's component) over a share (vector-ops.ts). */
export const PHASE_UPDATE = 3;
/** y0 += c0·x (and y1 += c1·x) over a share. */
export const PHASE_COMBINE = 4;
/** y0 = Σ_j c0_j·x_j (and y1) over a share, the vectors named in the team's list (vector-ops.ts, sweepRange). */
export const PHASE_SWEEP = 5;
/**
 * Float64 slots: sigma, gamma, field, scale, shift, cap, dim (the vector phases use sigma and gamma for their
 * coefficients), then one partial result per helper from 8, and a second one per helper after those.
 */
const P_SIGMA = 0;
const P_GAMMA = 1;
const P_FIELD = 2;
const P_SCALE = 3;
const P_SHIFT = 4;
const P_CAP = 5;
const P_DIM = 6;
const P_ALPHA = 8;

/** A Float64Array in a SharedArrayBuffer. */
export function sharedFloat64(length: number): Float64Array {
  return new Float64Array(new SharedArrayBuffer(8 * length));
}
/** A Uint8Array in a SharedArrayBuffer. */
export function sharedUint8(length: number): Uint8Array {
  return new Uint8Array(new SharedArrayBuffer(length));
}
/** A Uint16Array in a SharedArrayBuffer. */
export function sharedUint16(length: number): Uint16Array {
  return new Uint16Array(new SharedArrayBuffer(2 * length));
}

/** An Int32Array in a SharedArrayBuffer. */
export function sharedInt32(length: number): Int32Array {
  return new Int32Array(new SharedArrayBuffer(4 * length));
}

type Shared = Float64Array | Uint8Array | Uint16Array | Int32Array;

/** Start of thread `index`'s share of `count` items (index = threads gives the end), a multiple of `unit`. */
export function teamShare(count: number, unit: number, index: number, threads: number): number {
  return Math.floor((count / unit) * index / threads) * unit;
}

/** Helper threads applying their share of each product. Call {@link close} when done. */
export class ProductTeam {
  private readonly workers: Worker[] = [];
  private readonly ctrl: Int32Array;
  private readonly params: Float64Array;
  private readonly ports: import("node:worker_threads").MessagePort[] = [];
  private readonly ids = new WeakMap<SharedArrayBuffer, number>();
  private nextId = 0;
  private seq = 0;
  /** Threads in all, the caller included. */
  readonly threads: number;

  constructor(threads: number) {
    this.threads = Math.max(1, Math.floor(threads));
    this.ctrl = new Int32Array(new SharedArrayBuffer(4 * (DONE + this.threads)));
    this.params = new Float64Array(new SharedArrayBuffer(8 * (P_ALPHA + 2 * this.threads)));
    // Each helper has its own channel, so each receives every registration.
    for (let h = 1; h < this.threads; h++) {
      const ch = new MessageChannel();
      this.ports.push(ch.port1);
      const worker = new Worker(compiledSibling("product-worker.js"), {
        workerData: { ctrl: this.ctrl.buffer, params: this.params.buffer, port: ch.port2, index: h, threads: this.threads },
        transferList: [ch.port2],
      });
      worker.unref();
      this.workers.push(worker);
    }
    // A helper that cannot start (a missing compiled file, a failed import) would otherwise leave apply() waiting
    // for ever: each helper announces itself once, and the team refuses to go on without all of them.
    for (let h = 1; h < this.threads; h++) {
      const deadline = Date.now() + START_TIMEOUT_MS;
      while (Atomics.load(this.ctrl, DONE + h) !== READY) {
        const left = deadline - Date.now();
        if (left <= 0) {
          this.close();
          throw new Error(`product team: helper thread ${h} did not start within ${START_TIMEOUT_MS / 1000} s`);
        }
        Atomics.wait(this.ctrl, DONE + h, 0, Math.min(left, 100));
      }
    }
  }

  private idOf(a: Shared): number {
    const buffer = a.buffer;
    if (!(buffer instanceof SharedArrayBuffer)) throw new Error("product team: an array of the product is not in a SharedArrayBuffer");
    let id = this.ids.get(buffer);
    if (id === undefined) {
      id = this.nextId++;
      this.ids.set(buffer, id);
      const kind = a instanceof Float64Array ? "f64" : a instanceof Uint8Array ? "u8" : a instanceof Int32Array ? "i32" : "u16";
      for (const p of this.ports) p.postMessage({ id, buffer, kind, offset: a.byteOffset, length: a.length });
    }
    return id;
  }

  /** w = σ·(H v) − γ·vprev over all amplitudes, split between the threads; returns wᵀv. */
  apply(op: TransverseFieldOperator, v: Float64Array, sigma: number, vprev: Float64Array, gamma: number, w: Float64Array): number {
    const dim = op.dim;
    const plan = productPlan(op);
    if (this.threads === 1 || dim < TEAM_MIN_DIM) return applyOperator(op, v, sigma, vprev, gamma, w);
    const { ctrl, params } = this;
    const d = op.diagonal;
    ctrl[ID_V] = this.idOf(v);
    ctrl[ID_PREV] = this.idOf(vprev);
    ctrl[ID_W] = this.idOf(w);
    if (d.kind === "levels") {
      ctrl[ID_DIAG] = this.idOf(d.levels);
      ctrl[ID_TABLE] = this.idOf(d.table);
    } else {
      ctrl[ID_DIAG] = this.idOf(d.costs);
      ctrl[ID_TABLE] = -1;
      params[P_SCALE] = d.scale;
      params[P_SHIFT] = d.shift;
      params[P_CAP] = d.cap;
    }
    params[P_SIGMA] = sigma;
    params[P_GAMMA] = gamma;
    params[P_FIELD] = op.field;
    params[P_DIM] = dim;
    if (plan === null) {
      return this.round(op.mirror, PHASE_FUSED, (from, to) => applyOperatorRange(op, v, sigma, vprev, gamma, w, from, to), dim, 8);
    }
    // Pass B reads w across every block, so all of pass A ends before any of it starts.
    const kernel = blockedKernel();
    this.round(op.mirror, PHASE_BLOCKS, (from, to) => (kernel.passA(op, plan, v, sigma, vprev, gamma, w, from, to), 0), plan.blocks, 1);
    return this.round(op.mirror, PHASE_GROUPS, (from, to) => kernel.passB(op, plan, v, sigma, w, from, to), plan.groups, 1);
  }

  /**
   * w = w − a·u over all amplitudes; out[0] = ‖w‖² and out[1] = lockedᵀw after the update (0 without `locked`).
   * Parts are added in thread order, so the result does not depend on timing.
   */
  update(w: Float64Array, u: Float64Array, a: number, locked: Float64Array | null, out: Float64Array): void {
    out[0] = 0;
    out[1] = 0;
    const dim = w.length;
    if (this.threads === 1 || dim < TEAM_MIN_DIM) {
      updateRange(w, u, a, locked, 0, dim, out);
      return;
    }
    this.ctrl[ID_V] = this.idOf(w);
    this.ctrl[ID_PREV] = this.idOf(u);
    this.ctrl[ID_W] = locked === null ? -1 : this.idOf(locked);
    this.params[P_SIGMA] = a;
    this.params[P_DIM] = dim;
    out[0] = this.round(false, PHASE_UPDATE, (from, to) => (updateRange(w, u, a, locked, from, to, out), out[0]), dim, 8);
    out[1] += this.second;
  }

  /** y0 += c0·x and, with y1, y1 += c1·x over all amplitudes. */
  combine(x: Float64Array, y0: Float64Array, c0: number, y1: Float64Array | null, c1: number): void {
    const dim = x.length;
    if (this.threads === 1 || dim < TEAM_MIN_DIM) {
      combineRange(x, y0, c0, y1, c1, 0, dim);
      return;
    }
    this.ctrl[ID_V] = this.idOf(x);
    this.ctrl[ID_PREV] = this.idOf(y0);
    this.ctrl[ID_W] = y1 === null ? -1 : this.idOf(y1);
    this.params[P_SIGMA] = c0;
    this.params[P_GAMMA] = c1;
    this.params[P_DIM] = dim;
    this.round(false, PHASE_COMBINE, (from, to) => (combineRange(x, y0, c0, y1, c1, from, to), 0), dim, 8);
  }

  /** The vectors of a sweep by id, and their coefficients (c0 then c1), grown as needed (see {@link sweep}). */
  private listIds = sharedInt32(0);
  private listCoefficients = sharedFloat64(0);

  /**
   * y0 = Σ_j c0[j]·xs[j] and, with y1, y1 = Σ_j c1[j]·xs[j] over the first `count` vectors and all amplitudes
   * (y0, y1 overwritten): the Ritz vectors from stored Lanczos vectors, each thread sweeping its share of the
   * amplitudes. The result does not depend on the number of threads (sweepRange sums each amplitude in one order).
   */
  sweep(xs: readonly Float64Array[], count: number, c0: Float64Array, y0: Float64Array, c1: Float64Array | null, y1: Float64Array | null): void {
    const dim = y0.length;
    if (this.threads === 1 || dim < TEAM_MIN_DIM) {
      sweepRange(xs, count, c0, y0, c1, y1, 0, dim);
      return;
    }
    if (this.listIds.length < count) {
      this.listIds = sharedInt32(2 * count);
      this.listCoefficients = sharedFloat64(4 * count);
    }
    const ids = this.listIds;
    const coefficients = this.listCoefficients;
    for (let j = 0; j < count; j++) {
      ids[j] = this.idOf(xs[j]);
      coefficients[j] = c0[j];
      coefficients[count + j] = c1 !== null ? c1[j] : 0;
    }
    this.ctrl[ID_V] = this.idOf(ids);
    this.ctrl[ID_PREV] = this.idOf(y0);
    this.ctrl[ID_W] = y1 === null ? -1 : this.idOf(y1);
    this.ctrl[ID_DIAG] = this.idOf(coefficients);
    this.params[P_SIGMA] = count;
    this.params[P_DIM] = dim;
    this.round(false, PHASE_SWEEP, (from, to) => (sweepRange(xs, count, c0, y0, c1, y1, from, to), 0), dim, 8);
  }

  /** Sum of the helpers' second partial results in the last round, plus the caller's (see {@link update}). */
  private second = 0;

  /**
   * One command to every thread: the caller does share 0 of `count` items (in units of `unit`) with `own`, the
   * helpers the others; returns the sum of the parts in thread order. For the update phase, the caller's second
   * part is in the `out` array it filled and the helpers' are added to {@link second}.
   */
  private round(mirror: boolean, phase: number, own: (from: number, to: number) => number, count: number, unit: number): number {
    const { ctrl, params } = this;
    ctrl[FLAGS] = (mirror ? 1 : 0) | (phase << 1);
    const seq = ++this.seq;
    Atomics.store(ctrl, SEQ, seq);
    Atomics.notify(ctrl, SEQ);
    let total = own(0, teamShare(count, unit, 1, this.threads));
    let second = 0;
    for (let h = 1; h < this.threads; h++) {
      for (;;) {
        const done = Atomics.load(ctrl, DONE + h);
        if (done === seq) break;
        if (done === FAILED) throw new Error("product team: a helper thread failed");
        Atomics.wait(ctrl, DONE + h, done, 60_000);
      }
      total += params[P_ALPHA + h];
      second += params[P_ALPHA + this.threads + h];
    }
    this.second = second;
    return total;
  }

  /** Stops the helpers. */
  close(): void {
    Atomics.store(this.ctrl, STOP, 1);
    Atomics.add(this.ctrl, SEQ, 1);
    Atomics.notify(this.ctrl, SEQ);
    for (const p of this.ports) p.close();
    for (const w of this.workers) void w.terminate();
  }
}
