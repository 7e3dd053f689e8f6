/**
 * The light way into `solve FILE`: issue 16 compares the whole-process time of `solve FILE --json` with clasp's,
 * and for a counted 100-variable formula the start-up (yargs and the full option table with its registries)
 * cost more than the count. A command line whose meaning is plain — `solve`, one file, and options that `solve`
 * takes in the option table (option-table.ts), each once, as `--flag`, `--name VALUE` or `--name=VALUE` — is read
 * here, into the same values yargs would give the command (every non-boolean option as a string; numbers are
 * checked by the command itself). Anything else (`--help`, `--version`, `--no-…`, `--flag=…`, an unknown or repeated
 * option, a missing or second positional, a value that begins with '-', a file name yargs would read as a number)
 * returns null, and the yargs command tree (command-tree.ts) handles it with its own answers and one-line errors.
 */
import { declaredOptionsOf, type OptionSpec } from "./option-table.js";

/** The parsed arguments of a plain `solve` command line, or null when it is not one. */
export function plainSolveArgs(args: ReadonlyArray<string>): Record<string, unknown> | null {
  if (args[0] !== "solve") return null;
  const byName = new Map<string, OptionSpec>();
  for (const o of declaredOptionsOf("solve")) for (const name of [o.name, ...(o.aliases ?? [])]) byName.set(name, o);
  const parsed: Record<string, unknown> = {};
  let file: string | null = null;
  for (let i = 1; i < args.length; i++) {
    const arg = args[i];
    if (!arg.startsWith("-")) {
      // yargs reads a numeric-looking positional as a number (so '1e3' became '1000'): leave such names to it.
      if (file !== null || arg.trim() === "" || Number.isFinite(Number(arg)) || /^0x/i.test(arg)) return null;
      file = arg;
      continue;
    }
    const m = /^--([a-z][a-z0-9-]*)(?:=(.*))?$/.exec(arg);
    const option = m ? byName.get(m[1]) : undefined;
    if (!m || !option || option.name in parsed) return null;
    if (option.type === "boolean") {
      // `--json=false` and `--json false` are yargs' to read.
      if (m[2] !== undefined || args[i + 1] === "true" || args[i + 1] === "false") return null;
      parsed[option.name] = true;
      continue;
    }
    const value = m[2] ?? args[++i];
    if (value === undefined || value === "" || value.startsWith("-")) return null;
    parsed[option.name] = value;
  }
  if (file === null) return null;
  return { ...parsed, file };
}
