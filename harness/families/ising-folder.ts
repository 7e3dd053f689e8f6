/** The `ising` family: a folder of coupling-list files (`--from DIR`). */
import { basename } from "node:path";
import { parseCouplingList } from "../formats/coupling-list.js";
import { readInstanceText } from "./cnf-folder.js";
import type { FolderFamily, GeneratedInstance } from "./types.js";

/**
 * The `ising` family; meta = { file, terms }. Flip symmetry is decided per file by the solvers; at the edge a
 * folder counts as not symmetric (the tighter size limits), since its files may differ.
 */
export const isingFolderFamily: FolderFamily = {
  name: "ising",
  kind: "ising",
  source: "folder",
  description: "a folder of coupling-list files (--from DIR)",
  params: ["from"],
  resolveParams: () => ({}),
  checkSize: () => null,
  flipSymmetric: () => false,
  // Coupling files: the largest measured size's mean term count, scaled as n^2 (the crossover may lie beyond it).
  costShape(_params, instances) {
    const largest = instances.reduce((m, r) => Math.max(m, r.n), 1);
    const rows = instances.filter((r) => r.n === largest);
    const terms = (rows.length ? rows.reduce((s, r) => s + Number(r.terms), 0) / rows.length : 0) || 1;
    return { kind: "ising", clausesPerVariable: 0, k: 0, termsAt: (n) => terms * (n / largest) ** 2, order: 2 };
  },
  fileExtensions: /\.(txt|ising|couplings)$/i,
  fileWords: ".txt/.ising/.couplings",
  load(file: string): GeneratedInstance {
    const ising = parseCouplingList(readInstanceText(file), file);
    return { problem: { kind: "ising", ising }, seed: "", meta: { file: basename(file), terms: ising.coefficients.length } };
  },
};
