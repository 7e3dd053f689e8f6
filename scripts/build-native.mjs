// Build step after tsc: compiles the in-place transverse-field product (harness/predict/numerics/native/
// transverse-product.c) into a Node-API addon, dist/harness/predict/numerics/native/transverse-product.node, with
// the machine's C compiler ($CC, else cc, gcc or clang) and the Node-API headers of the node-api-headers package.
//
// No compiler on the machine: a one-line notice, no addon, and the spectral numerics run on the WebAssembly kernels
// (slower, same results to rounding). A compiler that is there but fails is an error: the build stops.
import { execFileSync, spawnSync } from "node:child_process";
import { mkdirSync, rmSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";

const root = fileURLToPath(new URL("..", import.meta.url));
const source = join(root, "harness/predict/numerics/native/transverse-product.c");
const outDir = join(root, "dist/harness/predict/numerics/native");
const target = join(outDir, "transverse-product.node");
// $CC when set, else the first of cc, gcc, clang that runs (test/blocked-product.test.ts checks the same list).
const candidates = process.env.CC ? [process.env.CC] : ["cc", "gcc", "clang"];
const compiler = candidates.find((c) => spawnSync(c, ["--version"], { stdio: "ignore" }).status === 0);

if (compiler === undefined) {
  rmSync(target, { force: true });
  console.log(`build-native: no C compiler (tried ${candidates.join(", ")}); the spectral product will use the WebAssembly kernels`);
  process.exit(0);
}
const headers = join(dirname(createRequire(import.meta.url).resolve("node-api-headers/package.json")), "include");
mkdirSync(outDir, { recursive: true });
// -O3 for the vector loops; no -march: the kernels carry AVX-512, AVX2 and baseline clones chosen at load time, so
// the addon also runs on another node of a cluster than the one it was built on.
const args = ["-O3", "-std=gnu11", "-Wall", "-Wno-psabi", "-fPIC", "-shared", "-I", headers, source, "-o", target];
if (process.platform === "darwin") args.push("-undefined", "dynamic_lookup");
try {
  execFileSync(compiler, args, { stdio: "inherit" });
} catch {
  console.error(`build-native: ${compiler} failed on ${source}`);
  process.exit(1);
}
