/** Instances for tests, drawn with the tool's own generators (harness/families) so tests and studies agree. */
import { ksatFamily } from "../../harness/families/ksat.js";
import { skFamily } from "../../harness/families/sk.js";
import type { Problem } from "../../harness/model/problem.js";

/** Uniform random 3-SAT at the given density (instance 0 of the ksat family for this seed). */
export function random3Sat(n: number, seed: string, density = 4.26): Problem {
  return ksatFamily.generate(seed, { k: 3, density, planted: false, satisfiable: false, unique: false }, n, 0).problem;
}

/** Sherrington–Kirkpatrick with J ~ N(0, 1/n) (instance 0 of the sk family for this seed). */
export function sk(n: number, seed: string): Problem {
  return skFamily.generate(seed, { couplings: "gauss" }, n, 0).problem;
}
