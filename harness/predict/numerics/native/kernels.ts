/**
 * Loads the in-place transverse-field product (transverse-product.c, built at install time into
 * transverse-product.node by scripts/build-native.mjs), one load per thread. The blocked product uses it when it is
 * there, and the WebAssembly kernels otherwise or when SPEEDBOUND_PRODUCT=wasm asks for them (benches and tests
 * compare the two).
 */
import { existsSync } from "node:fs";
import { createRequire } from "node:module";
import { fileURLToPath } from "node:url";
import { compiledFile } from "../../../compiled-file.js";
import { InputError } from "../../../errors.js";

/** The addon's two passes (see transverse-product.c; sizes are powers of two, ranges in blocks or groups). */
export interface NativeProduct {
  /**
   * Pass A over blocks [from, to) of 2^low amplitudes; kind 0/1/2 = one-byte levels, two-byte levels, affine. The
   * table must have an entry for every level in `data` (sector-cost.ts builds both; the addon does not scan them).
   */
  passA(
    v: Float64Array, vprev: Float64Array, kind: number, data: Uint8Array | Uint16Array | Float64Array,
    table: Float64Array | null, w: Float64Array, sigma: number, gamma: number, sx: number,
    scale: number, shift: number, cap: number, low: number, from: number, to: number,
  ): void;
  /** Pass B over groups [from, to); returns their part of wᵀv. */
  passB(
    v: Float64Array, w: Float64Array, sx: number, bits: number, low: number, run: number, high: number,
    mirror: number, tile: number, from: number, to: number,
  ): number;
}

/** Which kernels the product runs on. */
export type ProductKernels = "native" | "wasm";

let loaded: NativeProduct | null | undefined;

/** The addon's path (beside the compiled kernels.js). */
function addonPath(): string {
  return fileURLToPath(compiledFile(import.meta.url, "./transverse-product.node"));
}

/** The addon, or null when it was not built on this machine (no C compiler at install time). */
export function nativeProduct(): NativeProduct | null {
  if (loaded !== undefined) return loaded;
  const path = addonPath();
  loaded = existsSync(path) ? (createRequire(import.meta.url)(path) as NativeProduct) : null;
  return loaded;
}

/**
 * The kernels a new product uses on this thread: SPEEDBOUND_PRODUCT (native or wasm) if set, else native when built.
 * A value it cannot honour is the user's input, so an {@link InputError} (the CLI checks it before any command).
 */
export function defaultProductKernels(): ProductKernels {
  const asked = process.env.SPEEDBOUND_PRODUCT;
  if (asked === "wasm") return "wasm";
  if (asked === "native") {
    if (nativeProduct() === null) {
      throw new InputError(`SPEEDBOUND_PRODUCT=native, but ${addonPath()} was not built (no C compiler at install?)`);
    }
    return "native";
  }
  if (asked !== undefined && asked !== "") throw new InputError(`SPEEDBOUND_PRODUCT must be 'native' or 'wasm', not '${asked}'`);
  return nativeProduct() !== null ? "native" : "wasm";
}
