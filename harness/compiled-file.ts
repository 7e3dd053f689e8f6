/**
 * Where a build output lies for the module that needs it. Worker threads, the WebAssembly kernels and the native
 * addon load only what `npm run build` made under dist/; a module that runs compiled finds it beside itself, one that
 * runs from source (the test runner) at the same place under dist/.
 */

/** The project's root: this file is harness/compiled-file.ts, or dist/harness/compiled-file.js once compiled. */
const SOURCE_ROOT = new URL("..", import.meta.url);

/** URL of the build output `name` (a path relative to the module at `moduleUrl`, e.g. "./worker.js"). */
export function compiledFile(moduleUrl: string, name: string): URL {
  const beside = new URL(name, moduleUrl);
  if (!moduleUrl.endsWith(".ts")) return beside;
  return new URL(`dist/${beside.href.slice(SOURCE_ROOT.href.length)}`, SOURCE_ROOT);
}
