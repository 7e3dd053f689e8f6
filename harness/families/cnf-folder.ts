/** The `cnf` family: a folder of DIMACS CNF files (`--from DIR`), e.g. SATLIB benchmark sets. */
import { readFileSync } from "node:fs";
import { basename } from "node:path";
import { InputError } from "../errors.js";
import { parseDimacs } from "../formats/dimacs.js";
import type { FolderFamily, GeneratedInstance } from "./types.js";

/** Reads a file as text, or an InputError naming it. */
export function readInstanceText(file: string): string {
  try {
    return readFileSync(file, "utf8");
  } catch (e) {
    throw new InputError(`${file}: cannot read (${(e as NodeJS.ErrnoException).code ?? String(e)})`);
  }
}

/** The `cnf` family; meta = { file, clauses }. */
export const cnfFolderFamily: FolderFamily = {
  name: "cnf",
  kind: "cnf",
  source: "folder",
  description: "a folder of DIMACS CNF files (--from DIR)",
  params: ["from"],
  resolveParams: () => ({}),
  checkSize: () => null,
  flipSymmetric: () => false,
  fileExtensions: /\.cnf$/i,
  fileWords: ".cnf",
  load(file: string): GeneratedInstance {
    const cnf = parseDimacs(readInstanceText(file), file);
    return { problem: { kind: "cnf", cnf }, seed: "", meta: { file: basename(file), clauses: cnf.offsets.length - 1 } };
  },
};
