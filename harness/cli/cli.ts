#!/usr/bin/env node
/**
 * The command line's entry. A plain `solve FILE` (plain-solve.ts) goes straight to its command, which loads only
 * the exact solvers (issue 16: the whole-process time of `solve` against clasp); every other command line goes
 * through the yargs tree (command-tree.ts), loaded on demand. Failures end here as one line and an exit code.
 */
import { EXIT, InputError } from "../errors.js";
import { writeFailure } from "../engine/fs-guard.js";
import { plainSolveArgs } from "./plain-solve.js";

async function main(): Promise<number> {
  // The arguments after `node SCRIPT` (what yargs' hideBin gives outside Electron).
  const args = process.argv.slice(2);
  // A product-kernel choice in the environment is checked here, once, not first inside a pool worker mid-study.
  if (process.env.SPEEDBOUND_PRODUCT) (await import("../predict/numerics/native/kernels.js")).defaultProductKernels();
  const plain = plainSolveArgs(args);
  if (plain !== null) return (await import("./commands/solve.js")).solve(plain);
  return (await import("./command-tree.js")).runCommandTree(args);
}

main().then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    if (e instanceof InputError) {
      process.stderr.write(`speedbound: ${e.message}\n`);
      process.exitCode = (e as InputError & { exitCode?: number }).exitCode ?? EXIT.badInput;
      return;
    }
    // A write that failed where no guard stood (read-only folder, full disk): still one line, never a stack.
    const failed = writeFailure(e, "speedbound");
    if (failed) {
      process.stderr.write(`speedbound: ${failed.message}\n`);
      process.exitCode = (failed as InputError & { exitCode?: number }).exitCode ?? EXIT.badInput;
      return;
    }
    process.stderr.write(`speedbound: internal error: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
    process.exitCode = 70;
  },
);
