/**
 * Checks on the raw command line that yargs does not make: a repeated option (yargs would join the values with
 * commas, so `--out A --out B` wrote into a folder named "A,B"), an unknown command (yargs only suggests one),
 * and yargs' own parse errors turned into our one-line messages.
 */
import { InputError } from "../errors.js";

/** `cellLimit` → `cell-limit`, `no-planted` → `planted`: the names yargs treats as one option. */
function canonicalName(raw: string): string {
  const kebab = raw.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`);
  return kebab.startsWith("no-") ? kebab.slice(3) : kebab;
}

/** Edit distance, for "did you mean" on an unknown command. */
function distance(a: string, b: string): number {
  const d = Array.from({ length: a.length + 1 }, (_, i) => [i, ...new Array<number>(b.length).fill(0)]);
  for (let j = 1; j <= b.length; j++) d[0][j] = j;
  for (let i = 1; i <= a.length; i++) {
    for (let j = 1; j <= b.length; j++) d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
  }
  return d[a.length][b.length];
}

/**
 * Refuses, with one line, an unknown command (naming the commands) and any option given more than once (every
 * option but the repeatable ones (`--external`) takes one value; lists are comma-separated in that one value).
 */
export function checkCommandLine(
  args: ReadonlyArray<string>,
  commands: ReadonlyArray<string>,
  options: ReadonlyArray<{ readonly name: string; readonly aliases?: ReadonlyArray<string>; readonly repeatable?: boolean }> = [],
): void {
  const repeatable = new Set(options.filter((o) => o.repeatable === true).map((o) => o.name));
  // An older spelling and its new name are one option (`--b-scan X --spectral-b-scan Y` is a repeat too).
  const nameOf = new Map<string, string>();
  for (const o of options) for (const alias of o.aliases ?? []) nameOf.set(canonicalName(alias), o.name);
  const first = args[0];
  if (first !== undefined && !first.startsWith("-") && !commands.includes(first)) {
    const near = commands.filter((c) => distance(c, first) <= 2);
    const hint = near.length > 0 ? ` (did you mean ${near.join(" or ")}?)` : "";
    throw new InputError(`unknown command '${first}'${hint}; commands: ${commands.join(", ")}`);
  }
  const seen = new Map<string, string>();
  for (const arg of args) {
    if (arg === "--") break;
    // `--name`, `--name=value`, or a one-letter `-n` (never a negative number such as `-1`).
    const m = /^--([^=]+)(?:=(.*))?$/.exec(arg) ?? /^-([A-Za-z])(?:=(.*))?$/.exec(arg);
    if (!m) continue;
    const name = nameOf.get(canonicalName(m[1])) ?? canonicalName(m[1]);
    if (seen.has(name) && !repeatable.has(name)) throw new InputError(`--${name}: given more than once; give it once (lists go comma-separated in one value)`);
    seen.set(name, arg);
  }
}

/** yargs' parse-failure text (first line) as our one-line message. */
export function parseFailureLine(text: string): string {
  const line = text.split("\n")[0];
  const missingValue = /^Not enough arguments following: (\S+)/.exec(line);
  if (missingValue) return `--${missingValue[1]}: needs a value`;
  const missingOption = /^Missing required argument: (\S+)/.exec(line);
  if (missingOption) return `--${missingOption[1]}: required for this command`;
  const unknown = /^Unknown arguments?: (.+)$/.exec(line);
  if (unknown) return `unknown option ${unknown[1].split(", ").map((a) => (a.startsWith("-") ? a : `--${a}`)).join(", ")} (see --help)`;
  return line;
}

/**
 * A note when `--n FROM:TO:STEP` does not reach TO (e.g. `10:11:3` runs one size, 10): the sizes that run are
 * said out loud, or null when the range is taken as written.
 */
export function sizeRangeNote(given: unknown, sizes: ReadonlyArray<number>): string | null {
  if (given === undefined || sizes.length === 0) return null;
  const parts = String(given).split(":").map(Number);
  if (parts.length < 2) return null;
  const to = parts[1];
  const last = sizes[sizes.length - 1];
  if (last === to) return null;
  return `--n ${String(given)} runs ${sizes.length === 1 ? "one size" : `${sizes.length} sizes`} (${sizes.join(", ")}): the step does not reach ${to}`;
}
