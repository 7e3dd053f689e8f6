/**
 * The option table with the registries' names filled in (the choices of --family, --solvers and --predict, and the
 * per-kind default of --solvers): DESIGN.md §7. `--help`, validation (resolve.ts), the frozen spec and the manifest
 * are all derived from it. The declarations themselves live in option-table.ts.
 */
import { FAMILY_NAMES } from "../families/registry.js";
import { SOLVER_NAMES, defaultSolvers } from "../../solvers/registry.js";
import { PREDICTOR_NAMES } from "../predict/registry.js";
import { OPTION_TABLE, type CommandName, type OptionName, type OptionSpec } from "./option-table.js";

export { COMMAND_NAMES, COOLING_INTERNAL, COOLING_LAWS, type CommandName, type OptionName, type OptionSpec } from "./option-table.js";
// Choices of --family, --solvers and --predict come from the registries, never typed again here.
export { FAMILY_NAMES } from "../families/registry.js";
export { SOLVER_NAMES } from "../../solvers/registry.js";
export { PREDICTOR_NAMES } from "../predict/registry.js";

const REGISTRY_NAMES: Readonly<Record<NonNullable<OptionSpec["registry"]>, ReadonlyArray<string>>> = {
  families: FAMILY_NAMES,
  solvers: SOLVER_NAMES,
  predictors: PREDICTOR_NAMES,
};

/** One declaration with its registry's names as choices (and, for --solvers, the default per model kind). */
function withRegistry(o: OptionSpec): OptionSpec {
  if (o.registry === undefined) return o;
  const description =
    o.registry === "solvers" ? `${o.description}; default per family kind: k-SAT/CNF ${defaultSolvers("cnf").join(",")}, spin families ${defaultSolvers("ising").join(",")}` : o.description;
  return { ...o, choices: REGISTRY_NAMES[o.registry], description };
}

/** The option table. */
export const OPTIONS: ReadonlyArray<OptionSpec> = (OPTION_TABLE as ReadonlyArray<OptionSpec>).map(withRegistry);

/** The table, seen through the common declaration type. */
export const STUDY_OPTIONS: ReadonlyArray<OptionSpec> = OPTIONS;

/** The declaration of an option (an internal error for an undeclared name). */
export function optionSpec(name: OptionName | string): OptionSpec {
  const s = STUDY_OPTIONS.find((o) => o.name === name);
  if (!s) throw new Error(`no option ${name}`);
  return s;
}

/** The default an option has for a command (its command-specific default, else its general one). */
export function defaultFor(name: OptionName, command: CommandName): number | string | boolean | undefined {
  const s = optionSpec(name);
  return s.commandDefaults?.[command] ?? s.default;
}

/** The options a command takes, in table order. */
export function optionsOf(command: CommandName): OptionSpec[] {
  return STUDY_OPTIONS.filter((o) => o.commands.includes(command));
}

/**
 * The resolved value of every option a command takes, for the manifest: the given value (as typed), else the
 * default for that command, else null (not given, no default).
 */
export function resolvedOptions(argv: Readonly<Record<string, unknown>>, command: CommandName): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const o of optionsOf(command)) out[o.name] = argv[o.name] ?? o.commandDefaults?.[command] ?? o.default ?? null;
  return out;
}
