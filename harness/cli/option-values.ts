/**
 * Reading one numeric option against its declaration (type, range, default). Kept apart from resolve.ts, which
 * loads the registries to check a whole study, so that `solve` can read `--workers` without them.
 */
import { InputError } from "../errors.js";
import { OPTION_TABLE, type OptionSpec } from "./option-table.js";

type Argv = Readonly<Record<string, unknown>>;

/** Reads a numeric option with its declared range; null when it is not given and has no default. */
export function numberOption(argv: Argv, name: string): number | null {
  const raw = argv[name];
  const decl = (OPTION_TABLE as ReadonlyArray<OptionSpec>).find((o) => o.name === name);
  if (!decl) throw new Error(`no option ${name}`);
  if (raw === undefined || raw === null || raw === "") return decl.default === undefined ? null : Number(decl.default);
  const value = typeof raw === "number" ? raw : Number(String(raw).trim());
  if (!Number.isFinite(value)) throw new InputError(`--${name}: '${String(raw)}' is not a number`);
  if (decl.type === "integer" && !Number.isInteger(value)) throw new InputError(`--${name}: '${String(raw)}' is not a whole number`);
  if (decl.min !== undefined && value < decl.min) throw new InputError(`--${name}: ${value} is below the minimum ${decl.min}`);
  if (decl.max !== undefined && value > decl.max) throw new InputError(`--${name}: ${value} is above the maximum ${decl.max}`);
  return value;
}
