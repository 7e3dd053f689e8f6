/**
 * The counting done while generating filtered k-SAT instances (--satisfiable / --unique, decided by the model counter
 * above n = 30) answers to the study's limits (issue 16): the generation check installed around generation
 * (harness/families/draw-stop.ts) is polled inside the count, not only between draws, so a count that cannot
 * finish within a cell limit ends the cell as a censored row instead of running on.
 * Deterministic: the checks below stop on their Nth call, not on the clock; the counter polls at every decision,
 * and the unplanted n = 150 formula counted here needs several thousand (fixed by the formula; common practice
 * for a stop test). The end-to-end case uses a cell limit
 * far below the count's time (n = 200: about 36 000 decisions, seconds) and asserts only the row it leaves.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { ksatFamily } from "../harness/families/ksat.js";
import { GENERATION_STOPPED, withDrawStop } from "../harness/families/draw-stop.js";
import { countModels } from "../solvers/count-cnf.js";
import type { Cnf } from "../harness/model/cnf.js";
import { cli, readCsv } from "./helpers/cli.js";

const PARAMS = { k: 3, density: 4.26, planted: false, satisfiable: true, unique: false };
const N = 150;

/** A generation check that answers false for its first `quiet` calls and true afterwards, counting its calls. */
function checkAfter(quiet: number): { check: () => boolean; calls: () => number } {
  let calls = 0;
  return { check: () => ++calls > quiet, calls: () => calls };
}

describe("generation counting answers to the stop check", () => {
  it("the counter deciding --satisfiable polls the installed check while it counts", () => {
    const never = checkAfter(Infinity);
    const inst = withDrawStop(never.check, () => ksatFamily.generate("stop-test", PARAMS, N, 0));
    // Draw 0 was accepted; the check was asked once before counting it and again from inside the count.
    expect(inst.meta.rejected_draws).toBe(0);
    expect(never.calls()).toBeGreaterThan(1);
  });

  it("a check raised during the count stops the generation with the generation-stopped error", () => {
    const raised = checkAfter(1); // quiet for the check before the count, raised at the counter's first poll
    expect(() => withDrawStop(raised.check, () => ksatFamily.generate("stop-test", PARAMS, N, 0))).toThrow(
      new RegExp(`^${GENERATION_STOPPED} after 0 rejected draws`),
    );
    expect(raised.calls()).toBe(2);
  });

  it("countModels: a raised stopCheck ends the count incomplete; a quiet one changes nothing", () => {
    const cnf = ksatFamily.generate("stop-test", { ...PARAMS, satisfiable: false }, N, 0).problem as { kind: "cnf"; cnf: Cnf };
    const free = countModels(cnf.cnf, null);
    expect(free.complete).toBe(true);
    expect(free.nodes).toBeGreaterThan(1000); // a count long enough to be cut short
    const quiet = countModels(cnf.cnf, null, { stopCheck: () => false });
    expect(quiet.count).toBe(free.count);
    expect(quiet.nodes).toBe(free.nodes);
    const stopped = countModels(cnf.cnf, null, { stopCheck: () => true });
    expect(stopped.complete).toBe(false);
    expect(stopped.nodes).toBeLessThan(free.nodes);
  });
});

describe("a cell limit stops generation counting end to end", () => {
  let root = "";
  beforeAll(() => {
    root = mkdtempSync(join(tmpdir(), "speedbound-genstop-"));
  });
  afterAll(() => rmSync(root, { recursive: true, force: true }));

  it("run --satisfiable at n = 200 with a 100 ms cell limit leaves a censored truth row from the generation", () => {
    const dir = join(root, "genstop");
    const r = cli(["run", "--family", "ksat", "--n", "200", "--satisfiable", "--instances", "1", "--seed", "stop-test", "--solvers", "walk", "--predict", "grover",
      "--cell-limit", "100ms", "--workers", "1", "--out", dir]);
    expect(r.code).toBe(0);
    const { header, rows } = readCsv(join(dir, "runs.csv"));
    const col = (name: string): number => header.indexOf(name);
    const truth = rows.filter((row) => row[col("solver")] !== "walk");
    expect(truth).toHaveLength(1);
    expect(truth[0][col("status")]).toBe("censored");
    expect(truth[0][col("message")]).toMatch(new RegExp(`^${GENERATION_STOPPED}`));
    // No exact method ran: the row says so instead of naming enumeration.
    expect(truth[0][col("solver")]).toBe("none");
    const instances = readCsv(join(dir, "instances.csv"));
    expect(instances.rows[0][instances.header.indexOf("truth_method")]).toBe("none");
    const walk = rows.filter((row) => row[col("solver")] === "walk");
    expect(walk.every((row) => row[col("status")] === "censored")).toBe(true);
  });
});
