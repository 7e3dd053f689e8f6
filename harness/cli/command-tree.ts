/**
 * The command tree: yargs over the option table of options.ts. It turns argv into typed specs, calls the
 * commands, and prints help; cli.ts (the entry) reaches it for every command line but a plain `solve FILE`.
 */
import yargs, { type Argv, type Options } from "yargs";
import { EXIT, InputError } from "../errors.js";
import { COMMAND_NAMES, OPTIONS, optionsOf, type CommandName, type OptionSpec } from "./options.js";
import * as commands from "./commands/index.js";
import { checkCommandLine, parseFailureLine } from "./argv-guard.js";

function yargsType(o: OptionSpec): Options["type"] {
  if (o.type === "boolean") return "boolean";
  return "string"; // numbers are validated by resolve.ts, so '--instances ten' gets our message, not NaN
}

function describe(o: OptionSpec): string {
  const bits = [o.description];
  if (o.unit) bits.push(`[${o.unit}]`);
  if (o.choices && o.type !== "list") bits.push(`(${o.choices.join(" | ")})`);
  if (o.choices && o.type === "list") bits.push(`(comma list of: ${o.choices.join(", ")})`);
  if (o.min !== undefined || o.max !== undefined) bits.push(`range ${o.min ?? "-∞"}..${o.max ?? "∞"}`);
  return bits.join(" ");
}

/**
 * Adds every option the table declares for `command`, with its default for that command shown (not applied:
 * resolve.ts applies defaults, since it must tell "not given" from "given the default value"). Old spellings
 * are declared as hidden options and copied onto the new name before the command runs.
 */
function withOptions(y: Argv, command: CommandName): Argv {
  for (const o of optionsOf(command)) {
    const shown = o.commandDefaults?.[command] ?? o.default;
    y = y.option(o.name, {
      type: yargsType(o),
      describe: describe(o),
      defaultDescription: shown === undefined ? undefined : String(shown),
      hidden: o.hidden === true,
      group: `${o.group[0].toUpperCase()}${o.group.slice(1)} options:`,
      requiresArg: o.type !== "boolean",
    });
    for (const alias of o.aliases ?? []) y = y.option(alias, { type: yargsType(o), hidden: true, requiresArg: o.type !== "boolean" });
  }
  return y.middleware((argv) => {
    for (const o of optionsOf(command)) {
      for (const alias of o.aliases ?? []) if (argv[o.name] === undefined && argv[alias] !== undefined) argv[o.name] = argv[alias];
    }
  });
}

/**
 * Parses `args` (the command line after the script) with the yargs tree and runs the command; its exit code.
 * Failures are thrown (an InputError for bad input) for the entry (cli.ts) to report.
 */
export async function runCommandTree(args: ReadonlyArray<string>): Promise<number> {
  checkCommandLine(args, COMMAND_NAMES, OPTIONS);
  let code: number = EXIT.ok;
  const set = (c: number): void => {
    code = c;
  };
  await yargs([...args])
    .scriptName("speedbound")
    .usage("$0 <command> [options]\n\nMeasured classical scaling against predicted quantum costs on the same seeded instances.")
    .command("run", "generate instances, compute ground truth, time solvers, predict quantum costs, write tables", (y) => withOptions(y, "run"), async (a) => set(await commands.run(a, args)))
    .command("demo", "a small SK spin-glass study (n = 14..26: exhaustive, anneal) into results/demo, with a summary", (y) => y, async () => set(await commands.demo()))
    .command(
      "solve <file>",
      "exact optimum and degeneracy of one DIMACS CNF or coupling-list file",
      (y) => withOptions(y.positional("file", { type: "string", describe: "instance file" }), "solve"),
      async (a) => set(await commands.solve(a)),
    )
    .command(
      "instance",
      "print one generated instance (DIMACS CNF for ksat, coupling list for spin families) to stdout",
      (y) => withOptions(y, "instance"),
      async (a) => set(await commands.instance(a)),
    )
    .command(
      "report <dir>",
      "rebuild every table, fit and plot of an output folder from its journal",
      (y) => withOptions(y.positional("dir", { type: "string" }), "report"),
      async (a) => set(await commands.report(a, args)),
    )
    .command(
      "spectral <file>",
      "spectral-method numerics (ground state of the filtered Hamiltonian) for one instance file",
      (y) => withOptions(y.positional("file", { type: "string" }), "spectral"),
      async (a) => set(await commands.spectral(a)),
    )
    .command(
      "adiabatic <file>",
      "minimum gap of the adiabatic path H(s) = (1 − s)·Σ(1 − X_i)/2 + s·C for one instance file",
      (y) => withOptions(y.positional("file", { type: "string" }), "adiabatic"),
      async (a) => set(await commands.adiabatic(a)),
    )
    .command(
      "merge <out> <dirs..>",
      "join the shard folders of one study into OUT and write its tables",
      (y) => y.positional("out", { type: "string", describe: "merged output folder" }).positional("dirs", { type: "string", array: true, describe: "shard folders" }),
      async (a) => set(await commands.merge(a, args)),
    )
    .command(
      "compare <old> <new>",
      "night-to-night check of two runs of one study; exit code 1 on a regression",
      (y) =>
        withOptions(
          y.positional("old", { type: "string", describe: "earlier output folder" }).positional("new", { type: "string", describe: "later output folder" }),
          "compare",
        ),
      async (a) => set(await commands.compare(a)),
    )
    .command(
      "slurm",
      "write sbatch scripts that run a study as a Slurm job array of --shards slices plus a merge job",
      (y) =>
        withOptions(y, "slurm").demandOption("shards"),
      async (a) => set(await commands.slurm(a, args)),
    )
    .command("cost", "print the fault-tolerant cost model's assumptions and a worked example", (y) => withOptions(y, "cost"), async (a) => set(await commands.cost(a)))
    .demandCommand(1, "give a command (see --help)")
    .strict()
    .recommendCommands()
    .fail((msg, err) => {
      if (err && err.name !== "YError") throw err;
      throw new InputError(parseFailureLine(err?.message ?? msg ?? ""));
    })
    .help()
    .wrap(Math.min(120, process.stdout.columns ?? 100))
    .parseAsync();
  return code;
}
