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
  // The folder's mean clauses per variable and mean literals per clause (never an assumed k).
  costShape(_params, instances) {
    const clauses = instances.reduce((s, r) => s + Number(r.clauses), 0);
    const literals = instances.reduce((s, r) => s + Number(r.literals), 0);
    const density = instances.length ? instances.reduce((s, r) => s + Number(r.clauses) / r.n, 0) / instances.length : 0;
    return {
      kind: "ksat",
      clausesPerVariable: density,
      // Folders journalled before `literals` was recorded have no clause length: 3 then, as before.
      k: clauses > 0 && Number.isFinite(literals) && literals > 0 ? literals / clauses : 3,
      termsAt: () => 0,
      order: 0,
    };
  },
  fileExtensions: /\.cnf$/i,
  fileWords: ".cnf",
  load(file: string): GeneratedInstance {
    const cnf = parseDimacs(readInstanceText(file), file);
    return { problem: { kind: "cnf", cnf }, seed: "", meta: { file: basename(file), clauses: cnf.offsets.length - 1, literals: cnf.literals.length } };
  },
};
