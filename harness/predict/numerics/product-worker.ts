/**
 * Helper thread of product-team.ts: waits for a product, applies its share of the output range, reports its part of
 * wᵀv. Arrays arrive once each as messages, received synchronously.
 */
import { type MessagePort, receiveMessageOnPort, workerData } from "node:worker_threads";
import { applyOperatorRange, type TransverseFieldOperator } from "./transverse-field.js";

const data = workerData as { ctrl: SharedArrayBuffer; params: SharedArrayBuffer; port: MessagePort; index: number; threads: number };
const ctrl = new Int32Array(data.ctrl);
const params = new Float64Array(data.params);
const arrays: Array<Float64Array | Uint8Array | Uint16Array> = [];
const DONE = 8;
const P_ALPHA = 8;

function receive(): void {
  for (;;) {
    const m = receiveMessageOnPort(data.port);
    if (m === undefined) return;
    const { id, buffer, kind, offset, length } = m.message as { id: number; buffer: SharedArrayBuffer; kind: string; offset: number; length: number };
    arrays[id] = kind === "f64" ? new Float64Array(buffer, offset, length) : kind === "u8" ? new Uint8Array(buffer, offset, length) : new Uint16Array(buffer, offset, length);
  }
}

let seen = 0;
try {
  for (;;) {
    Atomics.wait(ctrl, 0, seen);
    const seq = Atomics.load(ctrl, 0);
    if (seq === seen) continue;
    seen = seq;
    if (Atomics.load(ctrl, 1) === 1) break;
    receive();
    const dim = params[6];
    const tableId = ctrl[6];
    const op: TransverseFieldOperator = {
      dim,
      bits: Math.round(Math.log2(dim)),
      mirror: ctrl[7] === 1,
      field: params[2],
      diagonal:
        tableId >= 0
          ? { kind: "levels", levels: arrays[ctrl[5]] as Uint8Array, table: arrays[tableId] as Float64Array }
          : { kind: "affine", costs: arrays[ctrl[5]] as Float64Array, scale: params[3], shift: params[4], cap: params[5] },
    };
    const share = dim / data.threads;
    const from = share * data.index;
    params[P_ALPHA + data.index] = applyOperatorRange(
      op, arrays[ctrl[2]] as Float64Array, params[0], arrays[ctrl[3]] as Float64Array, params[1], arrays[ctrl[4]] as Float64Array, from, from + share,
    );
    Atomics.store(ctrl, DONE + data.index, seq);
    Atomics.notify(ctrl, DONE + data.index);
  }
} catch (e) {
  Atomics.store(ctrl, DONE + data.index, -1);
  Atomics.notify(ctrl, DONE + data.index);
  throw e;
}
