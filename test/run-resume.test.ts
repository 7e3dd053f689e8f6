// Never lose finished work: a run killed with SIGKILL at seeded points and started again ends with the same
// tables as an uninterrupted run (timing columns aside); a torn last journal line is dropped with a warning.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { appendFileSync, existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Rng } from "../harness/random.js";
import { cli, cliAsync, withoutTiming } from "./helpers/cli.js";

const STUDY = ["--family", "ksat", "--n", "10:16:2", "--instances", "4", "--seed", "resume-1", "--solvers", "exhaustive,walk,anneal", "--trials", "60", "--sweeps", "10,40", "--workers", "2"];
const TABLES = ["instances.csv", "runs.csv", "predictions.csv"];
let root = "";

function journalLines(dir: string): number {
  const path = join(dir, "journal.jsonl");
  return existsSync(path) ? readFileSync(path, "utf8").split("\n").filter((l) => l !== "").length : 0;
}

// The run kills itself (SIGKILL) right after its journal reaches `lines` records (SPEEDBOUND_TEST_KILL_AT,
// engine/run.ts). Polling the journal from here and killing from outside raced the study: the last kill point
// leaves 8 cells (20–55 ms of work), and a test process descheduled that long let the study finish first.
async function killAfter(dir: string, lines: number): Promise<void> {
  const child = cliAsync(["run", ...STUDY, "--out", dir], { SPEEDBOUND_TEST_KILL_AT: String(lines) });
  const signal = await new Promise<NodeJS.Signals | null>((resolve) => child.on("exit", (_code, sig) => resolve(sig)));
  expect(signal, `run killed at ${lines} records`).toBe("SIGKILL");
  expect(journalLines(dir)).toBe(lines);
}

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "speedbound-resume-"));
  const r = cli(["run", ...STUDY, "--out", join(root, "whole")]);
  expect(r.code, r.stderr).toBe(0);
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("resume after SIGKILL", () => {
  it("ends with the same tables as an uninterrupted run, whatever the kill points", async () => {
    const total = journalLines(join(root, "whole"));
    expect(total).toBe(4 * 4 * 4); // 4 sizes × 4 instances × (truth + walk + 2 anneal run lengths)
    const rng = new Rng("kill-points"); // seeded choice of kill points
    const dir = join(root, "killed");
    const points = [1 + rng.below(total / 3), Math.floor(total / 3) + rng.below(total / 3), Math.floor((2 * total) / 3) + rng.below(total / 4)];
    for (const p of points) await killAfter(dir, p);
    expect(journalLines(dir)).toBeLessThan(total);
    const r = cli(["run", ...STUDY, "--out", dir]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/resumed from the journal/);
    expect(journalLines(dir)).toBe(total); // nothing run twice
    for (const t of TABLES) expect(withoutTiming(dir, t), t).toEqual(withoutTiming(join(root, "whole"), t));
  });

  it("drops a torn last journal line with a warning and redoes that cell", () => {
    const dir = join(root, "torn");
    expect(cli(["run", ...STUDY, "--out", dir]).code).toBe(0);
    const journal = readFileSync(join(dir, "journal.jsonl"), "utf8").split("\n").filter((l) => l);
    // Cut the last record in half, as a kill in the middle of a write would.
    const kept = journal.slice(0, -1).join("\n") + "\n" + journal[journal.length - 1].slice(0, 40);
    rmSync(join(dir, "journal.jsonl"));
    appendFileSync(join(dir, "journal.jsonl"), kept);
    const r = cli(["run", ...STUDY, "--out", dir]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/torn/);
    expect(journalLines(dir)).toBe(journal.length);
    for (const t of TABLES) expect(withoutTiming(dir, t), t).toEqual(withoutTiming(join(root, "whole"), t));
  });

  for (const [signal, code] of [["SIGTERM", 143], ["SIGINT", 130]] as const) {
    it(`${signal}: stops handing out cells, writes tables and manifest, exits ${code}`, async () => {
      const dir = join(root, signal);
      const child = cliAsync(["run", ...STUDY, "--out", dir]);
      const exited = new Promise<number | null>((resolve) => child.on("exit", (c) => resolve(c)));
      const deadline = Date.now() + 60_000;
      while (journalLines(dir) < 5 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 5));
      child.kill(signal);
      expect(await exited).toBe(code);
      expect(journalLines(dir)).toBeLessThan(64);
      expect(existsSync(join(dir, "runs.csv"))).toBe(true);
      const manifest = JSON.parse(readFileSync(join(dir, "manifest.json"), "utf8"));
      expect(manifest.summary.interrupted).toBe(signal);
    });
  }

  it("refuses to mix a different study into a folder that holds one", () => {
    const r = cli(["run", ...STUDY.map((a) => (a === "resume-1" ? "resume-2" : a)), "--out", join(root, "whole")]);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split("\n")).toHaveLength(1);
    expect(r.stderr).toMatch(/holds a different study/);
  });
});
