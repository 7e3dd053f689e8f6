/**
 * The family registry: every instance family by name, generated or read from files. Adding a family is one
 * file exporting a {@link Family} and one line in {@link FAMILIES}; the option table, validation at the edge,
 * the study, the worker and the tables ask this registry and never test a family's name.
 */
import { InputError } from "../errors.js";
import { cnfFolderFamily } from "./cnf-folder.js";
import { isingFolderFamily } from "./ising-folder.js";
import { ksatFamily } from "./ksat.js";
import { maxcutFamily } from "./maxcut.js";
import { pspinFamily } from "./pspin.js";
import { skFamily } from "./sk.js";
import type { Family, FamilyParams, FolderFamily, GeneratedFamily, GeneratedInstance } from "./types.js";

/** Every registered family, in the order `--help` lists them. */
export const FAMILIES: ReadonlyArray<Family> = [ksatFamily, skFamily, pspinFamily, maxcutFamily, cnfFolderFamily, isingFolderFamily];

/** Names of every registered family. */
export const FAMILY_NAMES: ReadonlyArray<string> = FAMILIES.map((f) => f.name);

/** The family of that name, or an InputError naming the option. */
export function familyNamed(name: string): Family {
  const f = FAMILIES.find((x) => x.name === name);
  if (!f) throw new InputError(`--family: unknown family '${name}' (choose from ${FAMILY_NAMES.join(", ")})`);
  return f;
}

/** The generated family of that name, or an InputError naming the option. */
export function generatorFor(name: string): GeneratedFamily {
  const f = familyNamed(name);
  if (f.source !== "generated") {
    throw new InputError(`--family: '${name}' is not a generated family (${FAMILIES.filter((x) => x.source === "generated").map((x) => x.name).join(", ")})`);
  }
  return f;
}

/** The folder family of that name (an InputError for a generated one). */
export function folderFamily(name: string): FolderFamily {
  const f = familyNamed(name);
  if (f.source !== "folder") throw new InputError(`--family: '${name}' is generated, not read from files`);
  return f;
}

/** Reads one instance file of a folder family. */
export function loadInstanceFile(family: string, file: string): GeneratedInstance {
  return folderFamily(family).load(file);
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
  const f = familyNamed(ctx.family);
  return f.source === "folder" ? f.load(ctx.file) : f.generate(ctx.masterSeed, ctx.params, ctx.n, ctx.index);
}
