// Build step after tsc: assembles the WebAssembly text of harness/predict/numerics/wasm/kernel-source.ts (compiled
// to dist/) into dist/harness/predict/numerics/wasm/transverse-kernels.wasm with wabt (the WebAssembly Binary
// Toolkit's assembler, a devDependency), and validates it.
import { writeFileSync } from "node:fs";
import wabtInit from "wabt";

const here = new URL("../dist/harness/predict/numerics/wasm/", import.meta.url);
const { transverseKernelText } = await import(new URL("kernel-source.js", here).href);
const wabt = await wabtInit();
const parsed = wabt.parseWat("transverse-kernels.wat", transverseKernelText(), { simd: true });
parsed.validate();
const { buffer } = parsed.toBinary({});
parsed.destroy();
writeFileSync(new URL("transverse-kernels.wasm", here), buffer);
