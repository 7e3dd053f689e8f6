/**
 * The instance families by name, and loading of instances from files (families `cnf` and `ising`).
 */
import { readFileSync } from "node:fs";
import { basename } from "node:path";
import { InputError } from "../errors.js";
import { parseDimacs } from "../formats/dimacs.js";
import { parseCouplingList } from "../formats/coupling-list.js";
import { ksatFamily } from "./ksat.js";
import { maxcutFamily } from "./maxcut.js";
import { pspinFamily } from "./pspin.js";
import { skFamily } from "./sk.js";
import type { Family, FamilyParams, GeneratedInstance } from "./types.js";

const GENERATED: ReadonlyMap<string, Family> = new Map([ksatFamily, skFamily, pspinFamily, maxcutFamily].map((f) => [f.name, f]));

/** Families read from a folder instead of generated. */
export const FOLDER_FAMILIES: ReadonlySet<string> = new Set(["cnf", "ising"]);

/** The generator for a family name, or an InputError naming the option. */
export function generatorFor(name: string): Family {
  const f = GENERATED.get(name);
  if (!f) throw new InputError(`--family: unknown family '${name}' (generated: ${[...GENERATED.keys()].join(", ")}; from files: cnf, ising)`);
  return f;
}

/** Reads one instance file: DIMACS CNF or our coupling list, by the family it belongs to. */
export function loadInstanceFile(family: string, file: string): GeneratedInstance {
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (e) {
    throw new InputError(`${file}: cannot read (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
  }
  if (family === "cnf") {
    const cnf = parseDimacs(text, file);
    return { problem: { kind: "cnf", cnf }, seed: "", meta: { file: basename(file), clauses: cnf.offsets.length - 1 } };
  }
  const ising = parseCouplingList(text, file);
  return { problem: { kind: "ising", ising }, seed: "", meta: { file: basename(file), terms: ising.coefficients.length } };
}

/** Everything that identifies one instance of a study. */
export interface InstanceContext {
  readonly family: string;
  readonly params: FamilyParams;
  readonly masterSeed: string;
  readonly n: number;
  readonly index: number;
  /** Source file for folder families, else "". */
  readonly file: string;
}

/** Generates or loads the instance a context names. */
export function materialise(ctx: InstanceContext): GeneratedInstance {
  if (FOLDER_FAMILIES.has(ctx.family)) return loadInstanceFile(ctx.family, ctx.file);
  return generatorFor(ctx.family).generate(ctx.masterSeed, ctx.params, ctx.n, ctx.index);
}
