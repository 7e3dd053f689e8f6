/**
 * Helper thread of product-team.ts: waits for a product, applies its share of the output range, reports its part of
 * wᵀv. Arrays arrive once each as messages, received synchronously.
 */
import { type MessagePort, receiveMessageOnPort, workerData } from "node:worker_threads";
import { applyOperatorRange, type TransverseFieldOperator } from "./transverse-field.js";
import { blockedKernel, productPlan } from "./blocked-product.js";
import { FAILED, PHASE_BLOCKS, PHASE_COMBINE, PHASE_FUSED, PHASE_SWEEP, PHASE_UPDATE, READY, teamShare } from "./product-team.js";
import { combineRange, sweepRange, updateRange } from "./vector-ops.js";

const data = workerData as { ctrl: SharedArrayBuffer; params: SharedArrayBuffer; port: MessagePort; index: number; threads: number };
const ctrl = new Int32Array(data.ctrl);
const params = new Float64Array(data.params);
const arrays: Array<Float64Array | Uint8Array | Uint16Array | Int32Array> = [];
const DONE = 8;
const P_ALPHA = 8;

function receive(): void {
  for (;;) {
    const m = receiveMessageOnPort(data.port);
    if (m === undefined) return;
    const { id, buffer, kind, offset, length } = m.message as { id: number; buffer: SharedArrayBuffer; kind: string; offset: number; length: number };
    arrays[id] =
      kind === "f64" ? new Float64Array(buffer, offset, length)
      : kind === "u8" ? new Uint8Array(buffer, offset, length)
      : kind === "i32" ? new Int32Array(buffer, offset, length)
      : new Uint16Array(buffer, offset, length);
  }
}

const partial = new Float64Array(2);

/** A vector pass of the recurrence (vector-ops.ts) over this helper's share; partial results into params. */
function vectorPhase(phase: number, dim: number): void {
  const from = teamShare(dim, 8, data.index, data.threads);
  const to = teamShare(dim, 8, data.index + 1, data.threads);
  // Slots: [2] the first operand (for the sweep: the list of vector ids), [3] y0 or u, [4] the optional third.
  const b = arrays[ctrl[3]] as Float64Array;
  const c = ctrl[4] >= 0 ? (arrays[ctrl[4]] as Float64Array) : null;
  partial[0] = 0;
  partial[1] = 0;
  if (phase === PHASE_SWEEP) sweepShare(b, c, from, to);
  else if (phase === PHASE_UPDATE) updateRange(arrays[ctrl[2]] as Float64Array, b, params[0], c, from, to, partial);
  else combineRange(arrays[ctrl[2]] as Float64Array, b, params[0], c, params[1], from, to);
  params[P_ALPHA + data.index] = partial[0];
  params[P_ALPHA + data.threads + data.index] = partial[1];
}

/** The Ritz sweep's share: ctrl[2] names the list of vector ids, ctrl[5] their coefficients (c0 then c1), params[0] how many. */
function sweepShare(y0: Float64Array, y1: Float64Array | null, from: number, to: number): void {
  const count = params[0];
  const ids = arrays[ctrl[2]] as Int32Array;
  const coefficients = arrays[ctrl[5]] as Float64Array;
  const xs: Float64Array[] = [];
  for (let j = 0; j < count; j++) xs.push(arrays[ids[j]] as Float64Array);
  const c1 = y1 !== null ? coefficients.subarray(count, 2 * count) : null;
  sweepRange(xs, count, coefficients.subarray(0, count), y0, c1, y1, from, to);
}

let seen = 0;
Atomics.store(ctrl, DONE + data.index, READY);
Atomics.notify(ctrl, DONE + data.index);
try {
  for (;;) {
    Atomics.wait(ctrl, 0, seen);
    const seq = Atomics.load(ctrl, 0);
    if (seq === seen) continue;
    seen = seq;
    if (Atomics.load(ctrl, 1) === 1) break;
    receive();
    const dim = params[6];
    const flags = ctrl[7];
    const phase = flags >> 1;
    if (phase === PHASE_UPDATE || phase === PHASE_COMBINE || phase === PHASE_SWEEP) {
      vectorPhase(phase, dim);
      Atomics.store(ctrl, DONE + data.index, seq);
      Atomics.notify(ctrl, DONE + data.index);
      continue;
    }
    const tableId = ctrl[6];
    const op: TransverseFieldOperator = {
      dim,
      bits: Math.round(Math.log2(dim)),
      mirror: (flags & 1) === 1,
      field: params[2],
      diagonal:
        tableId >= 0
          ? { kind: "levels", levels: arrays[ctrl[5]] as Uint8Array, table: arrays[tableId] as Float64Array }
          : { kind: "affine", costs: arrays[ctrl[5]] as Float64Array, scale: params[3], shift: params[4], cap: params[5] },
    };
    const v = arrays[ctrl[2]] as Float64Array;
    const vprev = arrays[ctrl[3]] as Float64Array;
    const w = arrays[ctrl[4]] as Float64Array;
    const sigma = params[0];
    const gamma = params[1];
    const { index, threads } = data;
    let part = 0;
    if (phase === PHASE_FUSED) {
      part = applyOperatorRange(op, v, sigma, vprev, gamma, w, teamShare(dim, 8, index, threads), teamShare(dim, 8, index + 1, threads));
    } else {
      const plan = productPlan(op);
      if (plan === null) throw new Error("product team: no blocked plan for this operator");
      const kernel = blockedKernel();
      if (phase === PHASE_BLOCKS) {
        kernel.passA(op, plan, v, sigma, vprev, gamma, w, teamShare(plan.blocks, 1, index, threads), teamShare(plan.blocks, 1, index + 1, threads));
      } else {
        part = kernel.passB(op, plan, v, sigma, w, teamShare(plan.groups, 1, index, threads), teamShare(plan.groups, 1, index + 1, threads));
      }
    }
    params[P_ALPHA + data.index] = part;
    Atomics.store(ctrl, DONE + data.index, seq);
    Atomics.notify(ctrl, DONE + data.index);
  }
} catch (e) {
  Atomics.store(ctrl, DONE + data.index, FAILED);
  Atomics.notify(ctrl, DONE + data.index);
  throw e;
}
