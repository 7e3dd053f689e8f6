/** Paths shared by tests: the repository root and the shared benchmark data beside it. */
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { resolve } from "node:path";

/** Repository root. */
export const REPO_ROOT = resolve(fileURLToPath(new URL("../..", import.meta.url)));
/** SATLIB data (shared/datasets/satlib beside the checkout; CI has it there too). */
export const SATLIB_DIR = resolve(REPO_ROOT, "../shared/datasets/satlib");
/** True when the SATLIB folder is present; tests that need it skip with a message otherwise. */
export const HAVE_SATLIB = existsSync(SATLIB_DIR);
/** The compiled CLI entry (built by `npm test`'s pretest step). */
export const CLI = resolve(REPO_ROOT, "dist/harness/cli/cli.js");
