/**
 * Debian's `clasp` (Potassco answer-set and SAT solver, installed by .ci/run) as an outside reference: model
 * enumeration of DIMACS CNF (`--models 0`) and optimal-model enumeration of weighted CNF (`--opt-mode=optN`).
 * Tests skip with a message when the binary is missing, unless SB_REQUIRE_CLASP=1 (set by .ci/run), which turns
 * a missing binary into a failure.
 */
import { spawnSync } from "node:child_process";
import type { Cnf } from "../../harness/model/cnf.js";
import { writeDimacs } from "../../harness/formats/dimacs.js";

/** True when `clasp --version` runs. */
export const HAVE_CLASP = spawnSync("clasp", ["--version"], { encoding: "utf8" }).status === 0;
if (!HAVE_CLASP && process.env.SB_REQUIRE_CLASP === "1") throw new Error("clasp is required (SB_REQUIRE_CLASP=1) but not installed");

function runClasp(args: ReadonlyArray<string>, input: string): string {
  const r = spawnSync("clasp", [...args], { input, encoding: "utf8", maxBuffer: 1 << 24 });
  if (r.error) throw r.error;
  return r.stdout;
}

/** Reads one "c NAME : VALUE" statistics line of clasp's output. */
function statistic(out: string, name: string): string | null {
  const m = new RegExp(`^c\\s+${name}\\s*:\\s*(\\S+)`, "m").exec(out);
  return m ? m[1] : null;
}

/** Number of models of a CNF by clasp's enumeration (`clasp --models 0 -q`); 0n when it reports UNSATISFIABLE. */
export function claspModelCount(cnf: Cnf): bigint {
  const out = runClasp(["--models", "0", "-q"], writeDimacs(cnf));
  if (/^s UNSATISFIABLE/m.test(out)) return 0n;
  const models = statistic(out, "Models");
  if (models === null || !/^s SATISFIABLE/m.test(out)) throw new Error(`clasp: unexpected output\n${out}`);
  return BigInt(models.replace(/\+$/, ""));
}

/**
 * Minimum number of violated clauses and the number of optimal assignments, by clasp on the formula as weighted
 * CNF (every clause soft, weight 1) with `--opt-mode=optN --models 0`. The count is clasp's "Optimal" figure: its
 * "Models" figure also counts the improving, non-optimal models met on the way. clasp 3.3.5 leaves the "Optimal"
 * line out in some runs (seen with a single optimal model); the count is then null, and tests choose instances
 * where it is printed rather than guess.
 */
export function claspMaxsat(cnf: Cnf): { optimum: number; optimal: bigint | null } {
  const m = cnf.offsets.length - 1;
  const lines = [`p wcnf ${cnf.variables} ${m} ${m + 1}`];
  for (let c = 0; c < m; c++) lines.push(`1 ${Array.from(cnf.literals.subarray(cnf.offsets[c], cnf.offsets[c + 1])).join(" ")} 0`);
  const out = runClasp(["--opt-mode=optN", "--models", "0", "-q"], lines.join("\n") + "\n");
  if (!/^s OPTIMUM FOUND/m.test(out)) throw new Error(`clasp: no optimum reported\n${out}`);
  const optimum = Number(statistic(out, "Optimization"));
  const optimal = statistic(out, "Optimal");
  if (!Number.isInteger(optimum)) throw new Error(`clasp: unexpected output\n${out}`);
  return { optimum, optimal: optimal === null ? null : BigInt(optimal) };
}
