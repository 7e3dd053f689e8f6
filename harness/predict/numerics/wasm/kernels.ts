/**
 * Loads the WebAssembly transverse-field kernels (kernel-source.ts, assembled at build time into
 * transverse-kernels.wasm) and instantiates them over a linear memory of the caller's size, one instance per thread.
 */
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { compiledFile } from "../../../compiled-file.js";

/** The kernels' exports (see kernel-source.ts for the arguments; offsets and sizes in bytes). */
export interface TransverseKernels {
  readonly memory: WebAssembly.Memory;
  lowLevels8(v: number, vp: number, diag: number, table: number, w: number, nb: number, sigma: number, gamma: number, sx: number): void;
  lowLevels16(v: number, vp: number, diag: number, table: number, w: number, nb: number, sigma: number, gamma: number, sx: number): void;
  lowAffine(
    v: number, vp: number, diag: number, table: number, w: number, nb: number,
    sigma: number, gamma: number, sx: number, scale: number, shift: number, cap: number,
  ): void;
  high(v: number, w: number, hb: number, lo: number, mirror: number, sx: number): number;
}

const WASM_PAGE = 65536;
let compiled: WebAssembly.Module | null = null;

/**
 * The compiled module (read once per thread): beside the compiled kernels.js, or its dist/ copy when this file runs
 * from source (the test runner).
 */
function kernelModule(): WebAssembly.Module {
  if (compiled !== null) return compiled;
  const url = compiledFile(import.meta.url, "./transverse-kernels.wasm");
  let bytes: Buffer;
  try {
    bytes = readFileSync(url);
  } catch {
    throw new Error(`transverse-field kernels: ${fileURLToPath(url)} is missing (run 'npm run build' first)`);
  }
  compiled = new WebAssembly.Module(Uint8Array.from(bytes));
  return compiled;
}

/** A fresh instance over a new memory of at least `bytes` bytes. */
export function instantiateKernels(bytes: number): TransverseKernels {
  const memory = new WebAssembly.Memory({ initial: Math.max(1, Math.ceil(bytes / WASM_PAGE)) });
  const instance = new WebAssembly.Instance(kernelModule(), { env: { memory } });
  const e = instance.exports as unknown as Omit<TransverseKernels, "memory">;
  return {
    memory,
    lowLevels8: e.lowLevels8,
    lowLevels16: e.lowLevels16,
    lowAffine: e.lowAffine,
    high: e.high,
  };
}
